package org.dendrokin.synth;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;

import org.dendrokin.io.AtomicFiles;

import com.google.gson.GsonBuilder;
import com.google.gson.JsonArray;
import com.google.gson.JsonObject;

import ij.ImagePlus;
import ij.ImageStack;
import ij.gui.PolygonRoi;
import ij.gui.Roi;
import ij.io.FileSaver;
import ij.io.RoiEncoder;
import ij.measure.Calibration;
import ij.process.ShortProcessor;

/**
 * Makes realistic synthetic imaging sessions with every true value known, independently of the analysis: the
 * signal comes from closed forms (Crank's Gaussian pulse, McKean's front) or this package's own PDE integration,
 * and the movie from a rendered scene (see {@link SessionSpec} for the effects and {@link Renderer} for how a
 * frame is made). Seeded: the same spec gives the same bytes.
 *
 * <pre>
 *   SessionGenerator.Written w = SessionGenerator.write(SessionSpec.realistic(7), dir);
 *   double trueD = w.truth().signal().dUm2PerS();
 * </pre>
 *
 * A session folder holds {@value #MOVIE} (16-bit TIFF written by ImageJ, calibrated in um and s; a hyperstack
 * when there are several channels or slices), {@value #ROI} (the drawn path, written by ImageJ's RoiEncoder),
 * {@value #SESSION} and {@value #TRUTH}.
 */
public final class SessionGenerator {
    public static final String MOVIE = "dendrite.tif";
    public static final String ROI = "dendrite.roi";
    public static final String SESSION = "session.json";
    public static final String TRUTH = "truth.json";

    private SessionGenerator() {
    }

    /**
     * A rendered session in memory. Planes are in ImageJ's hyperstack order, channel fastest, then slice, then
     * frame; each is row-major, width x height.
     *
     * @param spec     what was asked for
     * @param truth    every true value
     * @param roi      the drawn path as ImageJ will store it
     * @param expected noise-free expected counts of each plane
     * @param recorded recorded 16-bit counts (unsigned in a short)
     */
    public record Rendering(SessionSpec spec, Truth truth, PolygonRoi roi, float[][] expected, short[][] recorded) {
        public int channels() {
            return spec.channels().order().size();
        }

        public int slices() {
            return spec.imaging().zSlices();
        }

        public int frames() {
            return spec.imaging().frames();
        }

        public int width() {
            return spec.imaging().widthPx();
        }

        public int height() {
            return spec.imaging().heightPx();
        }

        /** Index of a plane; all arguments 0-based. */
        public int plane(int channel, int slice, int frame) {
            return channel + channels() * (slice + slices() * frame);
        }

        /** The recorded movie as an ImageJ hyperstack, calibrated in um and s. */
        public ImagePlus image() {
            ImageStack stack = new ImageStack(width(), height());
            for (int f = 0; f < frames(); f++) {
                for (int z = 0; z < slices(); z++) {
                    for (int c = 0; c < channels(); c++) {
                        stack.addSlice(String.format(Locale.ROOT, "t=%.3f s", f * spec.imaging().frameIntervalS()),
                                new ShortProcessor(width(), height(), recorded[plane(c, z, f)].clone(), null));
                    }
                }
            }
            ImagePlus imp = new ImagePlus("dendrite", stack);
            imp.setDimensions(channels(), slices(), frames());
            imp.setOpenAsHyperStack(true);
            Calibration cal = new Calibration();
            cal.pixelWidth = spec.imaging().pixelSizeUm();
            cal.pixelHeight = spec.imaging().pixelSizeUm();
            cal.pixelDepth = slices() > 1 ? spec.imaging().zStepUm() : 1;
            cal.setUnit("micron");
            cal.frameInterval = spec.imaging().frameIntervalS();
            cal.setTimeUnit("sec");
            imp.setCalibration(cal);
            return imp;
        }
    }

    /**
     * A session folder on disk.
     *
     * @param dir     the folder
     * @param truth   every true value (also in truth.json)
     */
    public record Written(Path dir, Truth truth) {
        public Path movie() {
            return dir.resolve(MOVIE);
        }

        public Path roi() {
            return dir.resolve(ROI);
        }
    }

    /**
     * Writes one session folder of a named scenario (see {@link CoverageHarness#scenarios}), to look at in ImageJ
     * or to analyse by hand. Usage: {@code SessionGenerator SCENARIO SEED OUT_DIR}.
     */
    public static void main(String[] args) {
        if (args.length != 3) {
            System.err.println("usage: SessionGenerator SCENARIO SEED OUT_DIR; scenarios: "
                    + String.join(", ", CoverageHarness.scenarios().keySet()));
            System.exit(2);
        }
        CoverageHarness.Scenario scenario = CoverageHarness.scenarios().get(args[0]);
        if (scenario == null) {
            System.err.println("unknown scenario " + args[0]);
            System.exit(2);
        }
        Written w = write(scenario.specs().apply(Long.parseLong(args[1])), Path.of(args[2]));
        System.out.printf(Locale.ROOT, "Wrote %s: D %.4g um^2/s, k %.4g 1/s, stimulus at %.3g s, %.3g um along the "
                + "path%n", w.dir(), w.truth().signal().dUm2PerS(), w.truth().signal().kPerS(),
                w.truth().stimulus().timeS(), w.truth().stimulus().pathPositionUm());
    }

    /** Renders a session in memory. */
    public static Rendering render(SessionSpec spec) {
        Scene scene = new Scene(spec);
        Renderer renderer = new Renderer(scene);
        int channels = spec.channels().order().size();
        int slices = spec.imaging().zSlices();
        int frames = spec.imaging().frames();
        float[][] expected = new float[channels * slices * frames][];
        short[][] recorded = new short[expected.length][];
        SplittableRandom noise = scene.stream("noise");
        int p = 0;
        for (int f = 0; f < frames; f++) {
            for (int z = 0; z < slices; z++) {
                for (int c = 0; c < channels; c++) {
                    expected[p] = renderer.expected(f, c, z);
                    recorded[p] = renderer.record(expected[p], noise);
                    p++;
                }
            }
        }
        return new Rendering(spec, truth(scene), roi(scene), expected, recorded);
    }

    /** Renders a session and writes its folder (created if missing); returns the truth. */
    public static Written write(SessionSpec spec, Path dir) {
        Rendering r = render(spec);
        byte[] tiff = new FileSaver(r.image()).serialize();
        if (tiff == null) {
            throw new IllegalStateException("ImageJ could not encode the movie");
        }
        AtomicFiles.write(dir.resolve(MOVIE), o -> o.write(tiff));
        byte[] roi = RoiEncoder.saveAsByteArray(r.roi());
        AtomicFiles.write(dir.resolve(ROI), o -> o.write(roi));
        AtomicFiles.writeString(dir.resolve(SESSION), sessionJson(spec, r.truth()));
        r.truth().write(dir.resolve(TRUTH));
        return new Written(dir, r.truth());
    }

    // ---------------------------------------------------------------------------------------------------------

    /** The drawn path as an ImageJ line ROI: ImageJ stores line coordinates 0.5 below ours (see PathFiles). */
    private static PolygonRoi roi(Scene scene) {
        int n = scene.drawn.size();
        float[] x = new float[n];
        float[] y = new float[n];
        for (int i = 0; i < n; i++) {
            x[i] = (float) (scene.drawn.x(i) - 0.5);
            y[i] = (float) (scene.drawn.y(i) - 0.5);
        }
        int type = scene.spec.path().style() == SessionSpec.PathStyle.FREEHAND ? Roi.FREELINE : Roi.POLYLINE;
        PolygonRoi roi = new PolygonRoi(x, y, n, type);
        roi.setName("dendrite");
        return roi;
    }

    static String sessionJson(SessionSpec spec, Truth truth) {
        JsonObject o = new JsonObject();
        o.addProperty("description", "Synthetic session (seed " + spec.seed() + ", " + truth.signal().model()
                + "); true values in " + TRUTH);
        o.addProperty("movie", MOVIE);
        o.addProperty("path", ROI);
        o.addProperty("path_width_um", spec.path().widthUm());
        if (spec.session().giveStimulus()) {
            JsonObject s = new JsonObject();
            s.addProperty("time_s", truth.stimulus().timeS());
            s.addProperty("position_um", truth.stimulus().pathPositionUm());
            o.add("stimulus", s);
        }
        if (!spec.session().models().isEmpty()) {
            JsonArray models = new JsonArray();
            spec.session().models().forEach(models::add);
            o.add("models", models);
        }
        JsonObject calibration = new JsonObject();
        calibration.addProperty("method", "none");
        o.add("calibration", calibration);
        if (spec.session().channelKeys() && spec.channels().order().size() > 1) {
            o.addProperty("channel", spec.channels().signalChannel());
            if (spec.channels().structuralChannel() > 0) {
                o.addProperty("structural_channel", spec.channels().structuralChannel());
            }
        }
        if (spec.session().linePeriodKey() && spec.imaging().linePeriodS() > 0) {
            o.addProperty("line_period_s", spec.imaging().linePeriodS());
        }
        return new GsonBuilder().setPrettyPrinting().create().toJson(o) + "\n";
    }

    private static Truth truth(Scene scene) {
        SessionSpec spec = scene.spec;
        double px = scene.px;
        SessionSpec.Imaging im = spec.imaging();
        int slices = im.zSlices();
        List<String> roles = spec.channels().order().stream().map(r -> r.name().toLowerCase(Locale.ROOT)).toList();
        Truth.Movie movie = new Truth.Movie(MOVIE, im.widthPx(), im.heightPx(), im.frames(), roles.size(), slices,
                px, im.frameIntervalS(), im.linePeriodS(), roles, spec.channels().signalChannel(),
                spec.channels().structuralChannel(), slices % 2 == 1 ? (slices - 1) / 2 : -1);

        Truth.Signal signal;
        SessionSpec.Signal sig = spec.signal() instanceof SessionSpec.PulsePair pair ? pair.first() : spec.signal();
        if (sig instanceof SessionSpec.GaussianPulse p) {
            signal = new Truth.Signal(p.name(), p.dUm2PerS(), p.kPerS(), Double.NaN, p.amplitude(), p.sigma0Um(),
                    Double.NaN, Double.NaN, 1 / p.kPerS(), Math.sqrt(p.dUm2PerS() / p.kPerS()),
                    scene.headDecayPerS());
        } else if (sig instanceof SessionSpec.NagumoFront f) {
            signal = front(f.name(), f.dUm2PerS(), f.kPerS(), f.a(), f.amplitude());
        } else {
            SessionSpec.NagumoKick k = (SessionSpec.NagumoKick) spec.signal();
            signal = front(k.name(), k.dUm2PerS(), k.kPerS(), k.a(), k.amplitude());
        }

        double[] stim = scene.drawn.nearest(scene.stimulusPx[0], scene.stimulusPx[1]);
        int stimulatedId = -1;
        List<Truth.Spine> spines = new ArrayList<>();
        for (int i = 0; i < scene.spines.size(); i++) {
            Scene.SpineGeometry s = scene.spines.get(i);
            double peak = 0;
            for (double v : scene.headSeries[i]) {
                peak = Math.max(peak, v);
            }
            if (s.stimulated()) {
                stimulatedId = i;
            }
            spines.add(new Truth.Spine(i, s.axisUm(), scene.drawn.nearest(s.headX(), s.headY())[0] * px, s.side(),
                    s.headX(), s.headY(), s.headRadiusUm(), s.neckLengthUm(), s.brightness(), s.tauNeckS(),
                    s.stimulated(), peak));
        }
        Truth.Stimulus stimulus = new Truth.Stimulus(spec.signal().timeS(), scene.stimulusAxisUm, stim[0] * px,
                scene.stimulusPx[0], scene.stimulusPx[1], Math.abs(stim[1]) * px, stimulatedId);
        if (spec.signal() instanceof SessionSpec.NagumoFront) {
            stimulus = new Truth.Stimulus(spec.signal().timeS(), scene.drawnAxisRangeUm[0], 0, scene.drawn.x(0),
                    scene.drawn.y(0), 0, -1);
        }

        int n = scene.drawn.size();
        double[] x = scene.drawn.xs();
        double[] y = scene.drawn.ys();
        double[] rx = new double[n];
        double[] ry = new double[n];
        for (int i = 0; i < n; i++) {
            rx[i] = (float) (x[i] - 0.5);
            ry[i] = (float) (y[i] - 0.5);
        }
        double sumSq = 0;
        double maxOff = 0;
        int samples = 0;
        for (double s = 0; s <= scene.drawn.length(); s += 0.5) {
            double[] q = scene.drawn.point(s);
            double off = Math.abs(scene.axis.nearest(q[0], q[1])[1]) * px;
            sumSq += off * off;
            maxOff = Math.max(maxOff, off);
            samples++;
        }
        double axisSpan = scene.drawnAxisRangeUm[1] - scene.drawnAxisRangeUm[0];
        Truth.DrawnPath path = new Truth.DrawnPath(spec.path().style().name().toLowerCase(Locale.ROOT), ROI, x, y,
                rx, ry, scene.drawn.length() * px, scene.drawnAxisRangeUm[0], scene.drawnAxisRangeUm[1],
                scene.drawn.length() * px / axisSpan, Math.sqrt(sumSq / samples), maxOff, spec.path().widthUm());

        int axisSamples = (int) (scene.axis.length() / 2) + 1;
        double[] ax = new double[axisSamples];
        double[] ay = new double[axisSamples];
        double[] as = new double[axisSamples];
        for (int i = 0; i < axisSamples; i++) {
            double[] q = scene.axis.point(2.0 * i);
            ax[i] = q[0];
            ay[i] = q[1];
            as[i] = 2.0 * i * px;
        }
        Truth.Dendrite dendrite = new Truth.Dendrite(spec.dendrite().radiusUm(), spec.dendrite().radiusCv(),
                spec.loading().sd(), scene.tiltDeg, scene.minCurvatureRadiusUm(), ax, ay, as);

        double maxShift = 0;
        double sumShift = 0;
        for (int f = 0; f < im.frames(); f++) {
            double d = Math.hypot(scene.shiftXPx[f], scene.shiftYPx[f]) * px;
            maxShift = Math.max(maxShift, d);
            sumShift += d * d;
        }
        Truth.Motion motion = new Truth.Motion(scene.shiftXPx.clone(), scene.shiftYPx.clone(), maxShift,
                Math.sqrt(sumShift / im.frames()), spec.motion());

        Truth.Intruder intruder = null;
        if (scene.intruder != null) {
            double[] ix = new double[im.frames()];
            double[] iy = new double[im.frames()];
            double[] off = new double[im.frames()];
            for (int f = 0; f < im.frames(); f++) {
                double[] c = scene.intruder.centreAt(spec.intruder(), f * im.frameIntervalS(), px);
                ix[f] = c[0] + scene.shiftXPx[f];
                iy[f] = c[1] + scene.shiftYPx[f];
                off[f] = Math.abs(scene.drawn.nearest(ix[f], iy[f])[1]) * px;
            }
            double[] base = scene.drawn.nearest(scene.intruder.baseX(), scene.intruder.baseY());
            intruder = new Truth.Intruder(scene.intruder.axisUm(), base[0] * px, ix, iy, off, spec.intruder());
        }

        List<Truth.Stimulus> later = new ArrayList<>();
        if (spec.signal() instanceof SessionSpec.PulsePair pair) {
            double[] second = scene.drawn.nearest(scene.secondPx[0], scene.secondPx[1]);
            later.add(new Truth.Stimulus(pair.second().timeS(), scene.secondAxisUm, second[0] * px, scene.secondPx[0],
                    scene.secondPx[1], Math.abs(second[1]) * px, -1));
        }
        return new Truth("org.dendrokin.synth.SessionGenerator", spec.seed(), Truth.UNITS, movie, signal, stimulus,
                path, dendrite, spines, motion, spec.optics(), spec.camera(),
                new Truth.Bleaching(spec.bleaching(), spec.channels().structuralBleachS()), spec.background(),
                intruder, later);
    }

    private static Truth.Signal front(String name, double d, double k, double a, double amplitude) {
        return new Truth.Signal(name, d, k, a, amplitude, Double.NaN, Math.sqrt(2 * d * k) * (0.5 - a),
                Math.sqrt(2 * d / k), Double.NaN, Double.NaN, 0);
    }
}
