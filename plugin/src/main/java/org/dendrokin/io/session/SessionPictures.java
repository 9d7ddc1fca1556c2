package org.dendrokin.io.session;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Path2D;
import java.awt.image.BufferedImage;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.analysis.AnalysisResult;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.motion.MotionTrace;
import org.dendrokin.core.preprocess.Preprocessing;
import org.dendrokin.core.preprocess.Robust;
import org.dendrokin.core.spread.SpreadAnalysis;
import org.dendrokin.io.fit.FitPictures;
import org.dendrokin.io.plot.Heatmap;
import org.dendrokin.io.plot.LinePlot;
import org.dendrokin.io.plot.Picture;
import org.dendrokin.io.plot.Pictures;
import org.dendrokin.io.text.Numbers;

/** The pictures of an analysis, written as PNG next to the report. */
public final class SessionPictures {
    private static final int W = 640;
    private static final int H = 420;

    private SessionPictures() {
    }

    /**
     * Writes every picture that the data allow and returns them in report order: the path, the kymographs, the
     * bleaching fit, the model-free spread measures, then the preferred model beside the measurement.
     *
     * @param outDir        where to write (must exist)
     * @param a             the analysis
     * @param rawSaturation the movie's largest grey value (samples there are saturated), or NaN for float movies
     */
    public static List<Picture> writeAll(Path outDir, AnalysisResult a, double rawSaturation) {
        List<Picture> out = new ArrayList<>();
        Preprocessing.Result pre = a.preprocessing();
        Kymograph signal = a.signal();
        Pictures.savePng(pathPicture(a), outDir.resolve("path.png"));
        out.add(new Picture("path.png", "The path on the movie",
                "Mean of the baseline frames (grey), the analysed path (orange line; its band is "
                        + fmt(a.movie().pathWidthUm()) + " um wide), its first vertex (open circle; distance 0) "
                        + "and the stimulus (filled circle), if known."));
        Heatmap signalMap = Heatmap.of(signal, "Signal along the dendrite (" + signal.signalUnit() + ")");
        Pictures.savePng(signalMap.render(signal), outDir.resolve("kymograph.png"));
        out.add(new Picture("kymograph.png", "Kymograph", "The analysed signal (" + signal.signalUnit()
                + ") along the path (across) over time (down). " + signalMap.scaleSentence(signal)));
        Kymograph raw = a.extraction().kymograph();
        Kymograph rawLabelled = raw.withValues(raw.values(), "grey value");
        Heatmap rawMap = Heatmap.of(rawLabelled, "Raw intensity along the dendrite").withSaturation(rawSaturation);
        Pictures.savePng(rawMap.render(rawLabelled), outDir.resolve("kymograph-raw.png"));
        out.add(new Picture("kymograph-raw.png", "Raw kymograph",
                "The movie's intensity averaged over the band, before background subtraction and bleach correction. "
                        + rawMap.scaleSentence(rawLabelled)));
        MotionTrace motion = a.motion().trace();
        if (motion != null) {
            double[] t = new double[motion.frameCount()];
            for (int f = 0; f < t.length; f++) {
                t[f] = f * a.movie().frameIntervalS();
            }
            LinePlot p = new LinePlot("Motion of the specimen", "time (s)", "shift (um)")
                    .line("x (across the image)", t, motion.dxUm()).line("y (down the image)", t, motion.dyUm());
            Pictures.savePng(p.render(W, H), outDir.resolve("motion.png"));
            out.add(new Picture("motion.png", "Motion", String.format(Locale.ROOT, "The shift of every frame "
                    + "against the mean of the baseline frames, measured by phase correlation (largest %s um, RMS %s "
                    + "um; a quarter of the band width, %s um, is where a warning starts). %s", fmt(motion.maxShiftUm()),
                    fmt(motion.rmsShiftUm()), fmt(motion.warningThresholdUm()), a.motion().corrected()
                            ? "The path was moved with these shifts frame by frame when the kymograph was taken."
                            : "The kymograph was taken along the path as drawn (motion measured, not corrected).")));
        }
        if (pre.bleach().applied() || hasFinite(pre.bleach().trace())) {
            LinePlot bleach = new LinePlot("Photobleaching", "time (s)", "normalised intensity")
                    .points("quiet samples", pre.bleach().traceTimesS(), pre.bleach().trace());
            if (hasFinite(pre.bleach().fitted())) {
                bleach.line("exponential fit", pre.bleach().traceTimesS(), pre.bleach().fitted());
            }
            Pictures.savePng(bleach.render(W, H), outDir.resolve("bleaching.png"));
            out.add(new Picture("bleaching.png", "Photobleaching", "Mean intensity of the samples outside the "
                    + "response, each position divided by its baseline median, with the fitted exponential."));
        }
        SpreadAnalysis.Result spread = a.spread();
        if (spread != null) {
            out.addAll(spreadPictures(outDir, signal, spread));
        }
        a.bestFit().ifPresent(best -> {
            // with several stimuli the models were fitted to the frames up to the second one
            Kymograph fitted = best.fitted().length == signal.positionCount() * signal.frameCount() ? signal
                    : signal.frames(0, best.fitted().length / signal.positionCount());
            out.addAll(FitPictures.write(outDir, "fit-" + best.model(), best.model() + " fit", fitted, spread,
                    FitPictures.simulated(fitted, best), a.stimulus().timeS(), a.stimulus().positionUm(),
                    Robust.median(a.fits().noiseSd())));
        });
        return out;
    }

    private static List<Picture> spreadPictures(Path outDir, Kymograph signal, SpreadAnalysis.Result spread) {
        List<Picture> out = new ArrayList<>();
        String unit = signal.signalUnit();
        if (spread.arrivalTimeS().length > 0) {
            double[] absD = Arrays.stream(spread.arrivalDistanceUm()).map(Math::abs).toArray();
            LinePlot p = new LinePlot("Front arrival", "time after the stimulus (s)",
                    "distance from the stimulus (um)").points("half-maximum arrival", spread.arrivalTimeS(), absD);
            if (spread.frontSpeed() != null) {
                double tMax = Arrays.stream(spread.arrivalTimeS()).max().orElse(1);
                double v = spread.frontSpeed().value();
                double a = spread.lines()[0];
                p.line(String.format(Locale.ROOT, "Theil-Sen line, %s um/s", fmt(v)), new double[] {0, tMax},
                        new double[] {a, a + v * tMax});
            }
            Pictures.savePng(p.render(W, H), outDir.resolve("front-arrival.png"));
            out.add(new Picture("front-arrival.png", "Front arrival", "Time at which each position first reached "
                    + "half of its own peak, against its distance from the stimulus; the slope is the front speed."));
        }
        if (spread.peakAmplitude().length > 0) {
            LinePlot p = new LinePlot("Peak amplitude", "distance from the stimulus (um)", "peak (" + unit + ")")
                    .points("peak at each position", spread.peakDistanceUm(), spread.peakAmplitude());
            if (spread.peakDecayLength() != null) {
                double lo = Arrays.stream(spread.peakDistanceUm()).min().orElse(0);
                double hi = Arrays.stream(spread.peakDistanceUm()).max().orElse(0);
                int n = 101;
                double[] x = new double[n];
                double[] y = new double[n];
                for (int i = 0; i < n; i++) {
                    x[i] = lo + (hi - lo) * i / (n - 1);
                    y[i] = spread.lines()[1] * Math.exp(-Math.abs(x[i]) / spread.peakDecayLength().value());
                }
                p.line(String.format(Locale.ROOT, "exp(-|d| / %s um)", fmt(spread.peakDecayLength().value())), x, y);
            }
            Pictures.savePng(p.render(W, H), outDir.resolve("peak-vs-distance.png"));
            out.add(new Picture("peak-vs-distance.png", "Peak against distance", "The largest signal reached at "
                    + "each responding position after the stimulus, with the exponential fall-off that gives the "
                    + "length constant."));
        }
        if (hasFinite(spread.integrated())) {
            LinePlot p = new LinePlot("Integrated signal", "time after the stimulus (s)", "integral (um x " + unit + ")")
                    .line("signal summed along the path", spread.timesS(), spread.integrated());
            if (hasFinite(spread.integratedFit())) {
                p.line("exponential decay fit", spread.timesS(), spread.integratedFit());
            }
            Pictures.savePng(p.render(W, H), outDir.resolve("integrated-signal.png"));
            out.add(new Picture("integrated-signal.png", "Integrated signal", "The signal summed along the path; its "
                    + "exponential decay after the peak gives the decay time."));
        }
        if (spread.apparentD() != null) {
            int from = -1;
            int to = -1;
            for (int i = 0; i < spread.variance().length; i++) {
                if (Double.isFinite(spread.variance()[i])) {
                    from = from < 0 ? i : from;
                    to = i;
                }
            }
            double[] t = Arrays.copyOfRange(spread.timesS(), from, to + 1);
            double[] var = Arrays.copyOfRange(spread.variance(), from, to + 1);
            double[] line = new double[t.length];
            for (int i = 0; i < line.length; i++) {
                line[i] = spread.lines()[2] + 2 * spread.apparentD().value() * t[i];
            }
            LinePlot p = new LinePlot("Spatial variance of the profile", "time after the stimulus (s)",
                    "variance (um^2)").points("variance of the fitted Gaussian", t, var)
                    .line(String.format(Locale.ROOT, "s0^2 + 2 D t, D = %s um^2/s", fmt(spread.apparentD().value())),
                            t, line);
            Pictures.savePng(p.render(W, H), outDir.resolve("spatial-variance.png"));
            out.add(new Picture("spatial-variance.png", "Spatial variance", "Variance of a Gaussian fitted to each "
                    + "frame's profile, over the frames used; under diffusion it grows by 2 D per second."));
        }
        return out;
    }

    private static BufferedImage pathPicture(AnalysisResult a) {
        int w = a.movie().widthPx();
        int h = a.movie().heightPx();
        float[] img = a.referenceImage();
        double[] finite = new double[img.length];
        for (int i = 0; i < img.length; i++) {
            finite[i] = img[i];
        }
        double[] range = Heatmap.robustRange(finite);
        int scale = Math.max(1, Math.min(8, 720 / Math.max(w, h)));
        int margin = 30;
        BufferedImage out = new BufferedImage(w * scale, h * scale + margin, BufferedImage.TYPE_INT_RGB);
        for (int y = 0; y < h * scale; y++) {
            for (int x = 0; x < w * scale; x++) {
                double v = (img[(y / scale) * w + x / scale] - range[0]) / (range[1] - range[0]);
                int g = (int) Math.round(255 * Math.max(0, Math.min(1, v)));
                out.setRGB(x, y, (g << 16) | (g << 8) | g);
            }
        }
        Graphics2D g = out.createGraphics();
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        double[] xs = a.extraction().xPx();
        double[] ys = a.extraction().yPx();
        Path2D.Double line = new Path2D.Double();
        for (int i = 0; i < xs.length; i++) {
            if (i == 0) {
                line.moveTo(xs[i] * scale, ys[i] * scale);
            } else {
                line.lineTo(xs[i] * scale, ys[i] * scale);
            }
        }
        g.setColor(new Color(255, 150, 40));
        g.setStroke(new BasicStroke(2f));
        g.draw(line);
        if (xs.length > 0) {
            g.draw(new Ellipse2D.Double(xs[0] * scale - 6, ys[0] * scale - 6, 12, 12));
        }
        Preprocessing.Stimulus s = a.stimulus();
        if (s.known() && xs.length > 0) {
            double[] d = a.extraction().kymograph().distancesUm();
            int best = 0;
            for (int i = 1; i < d.length; i++) {
                if (Math.abs(d[i] - s.positionUm()) < Math.abs(d[best] - s.positionUm())) {
                    best = i;
                }
            }
            g.setColor(new Color(240, 60, 60));
            g.fill(new Ellipse2D.Double(xs[best] * scale - 5, ys[best] * scale - 5, 10, 10));
        }
        g.setColor(Color.WHITE);
        g.fillRect(0, h * scale, w * scale, margin);
        double px = a.movie().pixelSizeUm();
        double barUm = niceBar(w * px / 4);
        int barPx = (int) Math.round(barUm / px * scale);
        g.setColor(Color.BLACK);
        g.fillRect(10, h * scale + 12, barPx, 5);
        g.setFont(new Font(Font.SANS_SERIF, Font.PLAIN, 13));
        g.drawString(fmt(barUm) + " um", 18 + barPx, h * scale + 20);
        g.dispose();
        return out;
    }

    private static double niceBar(double target) {
        double mag = Math.pow(10, Math.floor(Math.log10(target)));
        for (double m : new double[] {5, 2, 1}) {
            if (m * mag <= target) {
                return m * mag;
            }
        }
        return mag;
    }

    private static boolean hasFinite(double[] values) {
        return Arrays.stream(values).anyMatch(Double::isFinite);
    }

    static String fmt(double v) {
        return Numbers.forPeople(v);
    }
}
