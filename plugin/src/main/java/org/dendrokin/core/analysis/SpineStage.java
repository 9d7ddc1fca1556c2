package org.dendrokin.core.analysis;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.motion.MotionTrace;
import org.dendrokin.core.preprocess.BleachCorrection;
import org.dendrokin.core.preprocess.Preprocessing;
import org.dendrokin.core.preprocess.Robust;
import org.dendrokin.core.spines.SpineAnalysis;
import org.dendrokin.core.spines.SpineInputs;

/**
 * The spines of a session, after its analysis: the heads are measured in the same movie, with the same background,
 * bleaching correction and baseline frames as the shaft, and fitted against the shaft's dF/F0 kymograph
 * ({@link SpineAnalysis}), driven by the session's fitted model of the shaft where it describes the kymograph
 * ({@link #shaftModel}). Heads are found in the mean of the baseline frames of the structural channel when there is
 * one (its image does not change with the signal), otherwise of the signal channel.
 */
public final class SpineStage {
    private SpineStage() {
    }

    /**
     * @param request  the session's analysis request (the movie and the path)
     * @param a        the session's analysis
     * @param spines   what was asked of the spines
     * @param progress progress and cancellation
     */
    public static SpineOutcome run(AnalysisRequest request, AnalysisResult a, SpineRequest spines,
            Progress progress) {
        List<String> warnings = new ArrayList<>();
        Preprocessing.Result pre = a.preprocessing();
        float[] reference = request.structural() != null
                ? SessionAnalysis.meanFrame(request.structural(), pre.baselineFirst(), pre.baselineLast())
                : a.referenceImage();
        double[] background = a.background().perFrame();
        double[] along = a.background().alongPath();
        if (along != null) {
            // Heads lie beside the path, where the background along it is not known point by point: its median.
            double extra = Robust.median(Arrays.stream(along).filter(Double::isFinite).toArray());
            for (int f = 0; f < background.length; f++) {
                background[f] += Double.isFinite(extra) ? extra : 0;
            }
        }
        double[] bleach = bleachCurve(pre.bleach(), a.signal().timesS());
        if (a.motion().corrected() && largestShiftUm(a.motion().trace()) > spines.settings().headRadiusUm() / 2) {
            warnings.add(String.format(Locale.ROOT, "The specimen moved by up to %.2g um and the path was moved with "
                    + "it, but the spine heads were measured where they are in the reference image; a head that moves "
                    + "by more than half its radius (%.2g um) loses part of its light.",
                    largestShiftUm(a.motion().trace()), spines.settings().headRadiusUm() / 2));
        }
        Preprocessing.Stimulus s = a.stimulus();
        Kymograph shaft = pre.deltaF().kymograph();
        FitResult model = spines.fittedShaft() ? shaftModel(a, shaft, warnings) : null;
        SpineInputs in = new SpineInputs(reference, request.signal(), request.path(), request.pixelSizeUm(),
                request.pathWidthUm(), shaft, background, bleach, pre.baselineFirst(),
                pre.baselineLast(), s.known() ? s.timeS() : Double.NaN, s.known() ? s.positionUm() : Double.NaN,
                spines.given(), model == null ? null : new Kymograph(shaft.distancesUm(), shaft.timesS(),
                        model.fitted(), shaft.signalUnit()), model == null ? "" : model.model());
        SpineAnalysis.Result result = SpineAnalysis.run(in, spines.settings(), progress);
        warnings.addAll(result.warnings());
        return new SpineOutcome(spines, result, warnings);
    }

    /**
     * The session's best fit when its prediction can drive the neck fits: it converged, its residuals do not show
     * that its model misses the data, and it was fitted to the shaft's dF/F0 itself (no calibration or
     * normalisation in between). Null otherwise, with a sentence saying why when there was a fit.
     */
    static FitResult shaftModel(AnalysisResult a, Kymograph shaft, List<String> warnings) {
        KymographFits.Outcome fits = a.fits();
        FitResult best = fits == null ? null : fits.best().orElse(null);
        if (best == null || best.fitted() == null) {
            return null;
        }
        Kymograph fitted = a.calibrated().signal();
        boolean same = fitted.signalUnit().equals(shaft.signalUnit())
                && fitted.frameCount() == shaft.frameCount() && fitted.positionCount() == shaft.positionCount()
                && Arrays.equals(fitted.values(), shaft.values()) && best.fitted().length == fitted.values().length;
        if (!same) {
            warnings.add("The neck fits were driven by the shaft's measured dF/F0: the fitted model describes the "
                    + "calibrated or normalised signal, not the dF/F0 the heads are compared with.");
            return null;
        }
        if (fits.isMisfit(best.model())) {
            warnings.add("The neck fits were driven by the shaft's measured dF/F0, since the " + best.model()
                    + " model does not describe the kymograph; its noise makes the neck time constants' intervals "
                    + "narrower than they should be (see the guide's chapter on spines).");
            return null;
        }
        return best;
    }

    /**
     * The curve the shaft's frames were divided by, as {@link BleachCorrection} made it: exp(-(t - t_0) / tau), or
     * f exp(-(t - t_0) / tau1) + (1 - f) exp(-(t - t_0) / tau2) when it corrected two phases; null when it did not
     * correct.
     */
    private static double[] bleachCurve(BleachCorrection.Result b, double[] timesS) {
        if (!b.applied() || b.timeConstant() == null) {
            return null;
        }
        double[] out = new double[timesS.length];
        double slow = b.timeConstant().value();
        for (int f = 0; f < timesS.length; f++) {
            double u = timesS[f] - timesS[0];
            out[f] = b.fastPhase() == null ? Math.exp(-u / slow)
                    : b.fastPhase().fraction() * Math.exp(-u / b.fastPhase().timeConstant().value())
                            + (1 - b.fastPhase().fraction()) * Math.exp(-u / slow);
        }
        return out;
    }

    /** Largest measured shift of any frame, um. */
    private static double largestShiftUm(MotionTrace t) {
        double[] dx = t.dxUm();
        double[] dy = t.dyUm();
        double most = 0;
        for (int f = 0; f < dx.length; f++) {
            most = Math.max(most, Math.hypot(dx[f], dy[f]));
        }
        return most;
    }
}
