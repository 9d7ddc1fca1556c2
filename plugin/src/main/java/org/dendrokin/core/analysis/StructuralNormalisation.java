package org.dendrokin.core.analysis;

import java.util.List;
import java.util.Locale;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.preprocess.Preprocessing;
import org.dendrokin.core.preprocess.Robust;

/**
 * The signal normalised by a structural channel ({@link Normalisation}): G is the signal channel after background
 * subtraction and bleaching correction, R the structural channel's kymograph (taken along the same, possibly
 * moving, path) minus its own background. G/R = G / R; dG/R = (G - G0) / R with G0 the median of G over the
 * baseline frames at each position. A sample whose R is not positive is NaN.
 */
final class StructuralNormalisation {
    private StructuralNormalisation() {
    }

    static CalibrationStage.Calibrated apply(AnalysisRequest request, MotionStage motion, Extraction signal,
                                             Preprocessing.Result pre, AnalysisResult.Background signalBackground,
                                             List<Warning> warnings, Progress progress) {
        Extraction structural = motion.extract(request.structural(), progress);
        BackgroundRequest how = request.background() instanceof BackgroundRequest.Fixed
                ? new BackgroundRequest.Estimated() : request.background();
        AnalysisResult.Background b = SessionAnalysis.background(how, request.structural(), signal, request,
                progress);
        double[] rBackground = b.perFrame();
        Kymograph g = pre.bleach().corrected();
        Kymograph r = SessionAnalysis.minusAlongPath(structural.kymograph(), b.alongPath());
        int nx = g.positionCount();
        int nt = g.frameCount();
        double[] gv = g.values();
        double[] rv = r.values();
        double[] out = new double[gv.length];
        double[] g0 = new double[nx];
        double[] base = new double[pre.baselineLast() - pre.baselineFirst() + 1];
        for (int p = 0; p < nx; p++) {
            for (int f = pre.baselineFirst(); f <= pre.baselineLast(); f++) {
                base[f - pre.baselineFirst()] = gv[f * nx + p];
            }
            g0[p] = Robust.median(base);
        }
        long dark = 0;
        for (int f = 0; f < nt; f++) {
            for (int p = 0; p < nx; p++) {
                int i = f * nx + p;
                double rr = rv[i] - rBackground[f];
                if (!(rr > 0)) {
                    out[i] = Double.NaN;
                    dark++;
                    continue;
                }
                double num = request.normalisation() == Normalisation.DG_OVER_R ? gv[i] - g0[p] : gv[i];
                out[i] = num / rr;
            }
        }
        if (dark > 0) {
            warnings.add(new Warning(Warning.Topic.CALIBRATION, String.format(Locale.ROOT, "At %d samples the "
                    + "structural channel was not above its background, so %s is undefined there (left empty).", dark,
                    request.normalisation().key())));
        }
        Kymograph normalised = g.withValues(out, request.normalisation().key());
        return new CalibrationStage.Calibrated(normalised, null, null,
                CalibrationStage.baselineNoise(normalised, pre.baselineFirst(), pre.baselineLast()), List.of());
    }
}
