package org.dendrokin.ij1;

import java.awt.image.IndexColorModel;

import ij.ImagePlus;
import ij.measure.Calibration;
import ij.process.FloatProcessor;
import ij.process.LUT;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.plot.ColourScale;
import org.dendrokin.io.plot.Heatmap;

/**
 * A kymograph as an ImageJ image and back: a 32-bit image with one column a position along the path and
 * one row a frame; its calibration makes ImageJ's cursor read-out, measurements and axes show distance in
 * um across, time in s downwards and the signal unit for values. NaN samples (path outside the image,
 * calibration not finite) stay NaN, which ImageJ leaves out of its measurements.
 */
public final class KymographImage {
    /** Image property that marks an image as a Dendrokin kymograph. */
    public static final String PROPERTY = "dendrokin.kymograph";

    private KymographImage() {
    }

    /**
     * The kymograph as a calibrated 32-bit image with our sequential colour table and a robust range, titled
     * {@code name (unit)}.
     */
    public static ImagePlus toImage(Kymograph k, String title) {
        return toImage(k, title, ColourScale.SEQUENTIAL, displayRange(k.values()));
    }

    /**
     * A display range for the screen: the 0.5th to 99.8th percentile of the finite values (Commons Math's
     * estimate), so that a few bright pixels at the stimulus do not leave the rest of the kymograph dark.
     * The data are not changed; Image > Adjust > Brightness/Contrast shows them all.
     */
    static double[] displayRange(double[] values) {
        double[] finite = java.util.Arrays.stream(values).filter(Double::isFinite).toArray();
        if (finite.length == 0) {
            return new double[] {0, 1};
        }
        org.apache.commons.math3.stat.descriptive.rank.Percentile p =
                new org.apache.commons.math3.stat.descriptive.rank.Percentile();
        p.setData(finite);
        double lo = p.evaluate(0.5);
        double hi = p.evaluate(99.8);
        return hi > lo ? new double[] {lo, hi} : Heatmap.robustRange(values);
    }

    /** The kymograph as an image with the given colour table and display range {@code {lo, hi}}. */
    public static ImagePlus toImage(Kymograph k, String title, ColourScale scale, double[] range) {
        int w = k.positionCount();
        int h = k.frameCount();
        float[] pixels = new float[w * h];
        double[] v = k.values();
        for (int i = 0; i < pixels.length; i++) {
            pixels[i] = (float) v[i];
        }
        FloatProcessor fp = new FloatProcessor(w, h, pixels);
        fp.setLut(lut(scale));
        fp.setMinAndMax(range[0], range[1]);
        ImagePlus image = new ImagePlus(Titles.withUnit(title, k.signalUnit()), fp);
        image.setCalibration(calibration(k));
        image.setProp(PROPERTY, "distance (um) across, time (s) down, values in " + k.signalUnit());
        return image;
    }

    /** The ImageJ calibration of a kymograph image: x in um from the first vertex, y in s, value unit. */
    static Calibration calibration(Kymograph k) {
        Calibration cal = new Calibration();
        double dx = k.positionCount() > 1 ? k.distanceStepUm() : 1;
        double dt = k.frameCount() > 1 ? k.timeStepS() : 1;
        cal.pixelWidth = dx;
        cal.pixelHeight = dt;
        cal.setXUnit("um");
        cal.setYUnit("s");
        cal.xOrigin = -k.distanceUm(0) / dx;
        cal.yOrigin = -k.timeS(0) / dt;
        cal.setValueUnit(k.signalUnit());
        return cal;
    }

    /**
     * Reads a kymograph back from a single-plane image calibrated as {@link #toImage} makes it (or by the
     * user: x in a length unit, y in a time unit).
     *
     * @throws IllegalArgumentException if the image is a stack or its axes are not calibrated in length
     *                                  and time units
     */
    public static Kymograph fromImage(ImagePlus image) {
        if (image.getStackSize() != 1) {
            throw new IllegalArgumentException("the image " + image.getTitle() + " is a stack; a kymograph is a single"
                    + " image with distance across and time down");
        }
        Calibration cal = image.getCalibration();
        double umPerUnit = ImageSettings.metresPerUnit(cal.getXUnit()) / 1e-6;
        double sPerUnit = ImageSettings.secondsPerUnit(cal.getYUnit());
        if (!Double.isFinite(umPerUnit) || !Double.isFinite(sPerUnit)) {
            throw new IllegalArgumentException("the image " + image.getTitle() + " is not calibrated as a kymograph:"
                    + " its x axis must be in um and its y axis in s (Image > Properties), found "
                    + cal.getXUnit() + " and " + cal.getYUnit());
        }
        int w = image.getWidth();
        int h = image.getHeight();
        double[] distances = new double[w];
        for (int x = 0; x < w; x++) {
            distances[x] = (x - cal.xOrigin) * cal.pixelWidth * umPerUnit;
        }
        double[] times = new double[h];
        for (int y = 0; y < h; y++) {
            times[y] = (y - cal.yOrigin) * cal.pixelHeight * sPerUnit;
        }
        float[] pixels = (float[]) image.getProcessor().convertToFloatProcessor().getPixels();
        double[] values = new double[pixels.length];
        for (int i = 0; i < values.length; i++) {
            values[i] = pixels[i];
        }
        String unit = cal.getValueUnit();
        return new Kymograph(distances, times, values, unit == null || unit.equals("Gray Value") ? "" : unit);
    }

    /** Our colour scale as an ImageJ lookup table. */
    public static LUT lut(ColourScale scale) {
        byte[] r = new byte[256];
        byte[] g = new byte[256];
        byte[] b = new byte[256];
        for (int i = 0; i < 256; i++) {
            int rgb = scale.rgb(i / 255.0);
            r[i] = (byte) (rgb >> 16);
            g[i] = (byte) (rgb >> 8);
            b[i] = (byte) rgb;
        }
        return new LUT(new IndexColorModel(8, 256, r, g, b), 0, 255);
    }
}
