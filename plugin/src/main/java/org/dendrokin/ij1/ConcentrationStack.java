package org.dendrokin.ij1;

import ij.ImagePlus;
import ij.VirtualStack;
import ij.process.FloatProcessor;
import ij.process.ImageProcessor;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.Calibrator;
import org.dendrokin.core.calib.SaturationLimits;

/**
 * A movie converted to concentration (uM) plane by plane when ImageJ asks for a plane, so that a large or
 * virtual movie is never copied: each plane is read from the source, its background subtracted (or, for
 * the ratio method, the ratio of two background-subtracted channels taken), and calibrated with
 * {@link Calibrator#apply}, which leaves NaN where the signal is outside the calibration's trusted range.
 */
final class ConcentrationStack extends VirtualStack {
    private final ImagePlus source;
    private final Calibration calibration;
    private final SaturationLimits limits;
    private final int channel;
    private final double background;
    private final int denominatorChannel;
    private final double denominatorBackground;
    private final int timePoints;

    /**
     * @param source                the movie; not modified
     * @param calibration           the calibration to apply
     * @param limits                where samples are flagged and rejected
     * @param channel               1-based channel read (the numerator for the ratio method)
     * @param background            subtracted from that channel first, intensity units
     * @param denominatorChannel    1-based denominator channel for the ratio method, 0 for the other methods
     * @param denominatorBackground subtracted from the denominator channel, intensity units
     */
    ConcentrationStack(ImagePlus source, Calibration calibration, SaturationLimits limits, int channel,
            double background, int denominatorChannel, double denominatorBackground) {
        super(source.getWidth(), source.getHeight(), null, null);
        this.source = source;
        this.calibration = calibration;
        this.limits = limits;
        this.channel = channel;
        this.background = background;
        this.denominatorChannel = denominatorChannel;
        this.denominatorBackground = denominatorBackground;
        this.timePoints = timePoints(source);
        setBitDepth(32);
    }

    /** Time points of a movie: its frames, or its slices when it has a single frame. */
    static int timePoints(ImagePlus image) {
        return image.getNFrames() > 1 ? image.getNFrames() : image.getNSlices();
    }

    private ImageProcessor plane(int c, int t) {
        boolean framesAreTime = source.getNFrames() > 1;
        int index = source.getStackIndex(c, framesAreTime ? source.getSlice() : t, framesAreTime ? t : 1);
        return source.getStack().getProcessor(index);
    }

    /** The signal of time point {@code t} (1-based): background subtracted intensity or a ratio. */
    double[] signal(int t) {
        float[] num = (float[]) plane(channel, t).convertToFloatProcessor().getPixels();
        double[] s = new double[num.length];
        if (denominatorChannel > 0) {
            float[] den = (float[]) plane(denominatorChannel, t).convertToFloatProcessor().getPixels();
            for (int i = 0; i < s.length; i++) {
                double d = den[i] - denominatorBackground;
                s[i] = d > 0 ? (num[i] - background) / d : Double.NaN;
            }
        } else {
            for (int i = 0; i < s.length; i++) {
                s[i] = num[i] - background;
            }
        }
        return s;
    }

    /** The calibrated values of time point {@code t} (1-based) with their counts. */
    Calibrator.CalibratedValues calibrated(int t) {
        return Calibrator.apply(calibration, limits, signal(t));
    }

    @Override
    public ImageProcessor getProcessor(int n) {
        double[] v = calibrated(n).values();
        float[] f = new float[v.length];
        for (int i = 0; i < f.length; i++) {
            f[i] = (float) v[i];
        }
        return new FloatProcessor(getWidth(), getHeight(), f);
    }

    @Override
    public Object getPixels(int n) {
        return getProcessor(n).getPixels();
    }

    @Override
    public int getSize() {
        return timePoints;
    }

    @Override
    public String getSliceLabel(int n) {
        return "t" + n + " (uM)";
    }

    @Override
    public boolean isVirtual() {
        return true;
    }
}
