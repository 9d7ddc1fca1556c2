package org.dendrokin.core.spines;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.QRDecomposition;
import org.apache.commons.math3.linear.RealVector;
import org.apache.commons.math3.linear.SingularMatrixException;
import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.FitData;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.ModelFit;

/**
 * Fits {@link NeckExchangeModel} to one head's time course with {@link ModelFit} (Levenberg-Marquardt from several
 * starts, intervals from s^2 (J^T J)^-1 and, for tau_neck, the profile likelihood). Starting points: tau_neck at
 * half, 2, 8 and 32 frame intervals (no longer than the movie), each with the base at the head's projection and
 * one prior sd to either side; for each, the amplitude, baseline and jump that fit best, by linear
 * least squares (Commons Math QR).
 *
 * <p>Weights. Photon noise makes a head's variance grow with its signal, so the fit is made twice: first with the
 * baseline noise sd everywhere, then with sd_f = sd_0 sqrt(1 + phi (y_f - baseline)), phi (clamped to [0, 3])
 * fitted by least squares to the squared standardised residuals of the first fit [common practice: a variance
 * that grows linearly with the mean, as for Poisson counts].
 */
final class NeckExchangeFit {
    private static final double[] START_FRAMES = {0.5, 2, 8, 32};
    private static final double[] START_OFFSETS = {0, -1, 1};

    private NeckExchangeFit() {
    }

    /**
     * @param timesS        frame times, s. Not modified.
     * @param head          the head's dF/F0 (NaN frames are left out). Not modified.
     * @param noiseSd       the head's noise standard deviation, dF/F0 (the weights; intervals use the residuals)
     * @param shaft         the shaft's signal along the path near the spine
     * @param projectionUm  the head's projection onto the path, um
     * @param offsetSdUm    sd of the prior on the neck base's offset from the projection, um
     * @param stimulusTimeS stimulus time, s
     * @param kHeadPerS     loss inside the head, 1/s
     * @param jump          fit a jump of the head's own signal at the stimulus
     * @param profiles      profile-likelihood interval for tau_neck
     * @param progress      checked for cancellation
     */
    static FitResult fit(double[] timesS, double[] head, double noiseSd, ShaftDriver shaft, double projectionUm,
            double offsetSdUm, double stimulusTimeS, double kHeadPerS, boolean jump, boolean profiles,
            Progress progress) {
        NeckExchangeModel model = new NeckExchangeModel(timesS, shaft, projectionUm, offsetSdUm, stimulusTimeS,
                kHeadPerS, jump);
        double[] values = Arrays.copyOf(head, model.size());
        double[] sigma = new double[model.size()];
        Arrays.fill(sigma, noiseSd);
        sigma[head.length] = offsetSdUm;
        sigma[head.length + 1] = NeckExchangeModel.LIGHT_SD;
        FitData data = new FitData(values, sigma);
        int n = timesS.length;
        double dt = (timesS[n - 1] - timesS[0]) / (n - 1);
        double duration = timesS[n - 1] - timesS[0];
        List<double[]> starts = new ArrayList<>();
        for (double offsetFraction : START_OFFSETS) {
            double offset = offsetFraction * offsetSdUm;
            for (double frames : START_FRAMES) {
                double tau = Math.min(frames * dt, duration);
                double[] linear = linearPart(model, tau, offset, head);
                if (linear != null) {
                    double[] start = new double[model.parameters().size()];
                    start[0] = tau;
                    start[1] = offset;
                    start[2] = linear[0];
                    start[3] = linear[1];
                    if (jump) {
                        start[start.length - 1] = linear[2];
                    }
                    starts.add(start);
                }
            }
        }
        if (starts.isEmpty()) {
            double[] start = new double[model.parameters().size()];
            start[0] = dt;
            start[2] = 1;
            starts.add(start);
        }
        ModelFit.Options options = ModelFit.Options.defaults().withProfiles(profiles);
        FitResult first = ModelFit.fit(model, data, starts, options.withProfiles(false), progress);
        if (!first.converged() || first.fitted() == null) {
            return first;
        }
        double[] fitted = first.fitted();
        double baseline = first.estimate(NeckExchangeModel.BASELINE).orElseThrow().value();
        double num = 0;
        double den = 0;
        for (int f = 0; f < head.length; f++) {
            if (Double.isFinite(head[f])) {
                double r = head[f] - fitted[f];
                double level = fitted[f] - baseline;
                num += (r * r / (noiseSd * noiseSd) - 1) * level;
                den += level * level;
            }
        }
        double phi = den > 0 ? Math.max(0, Math.min(3, num / den)) : 0;
        for (int f = 0; f < head.length; f++) {
            sigma[f] = noiseSd * Math.sqrt(Math.max(0.25, 1 + phi * (fitted[f] - baseline)));
        }
        List<double[]> again = new ArrayList<>();
        again.add(first.values());
        again.addAll(starts);
        return ModelFit.fit(model, new FitData(values, sigma, 1), again, options, progress);
    }

    /**
     * Amplitude, baseline (and jump) minimising the unweighted squared residuals for a fixed tau_neck and base
     * offset, or null when the columns are degenerate.
     */
    private static double[] linearPart(NeckExchangeModel model, double tauS, double offsetUm, double[] head) {
        int n = head.length;
        int p = model.hasJump() ? 3 : 2;
        double[] c = new double[n];
        double[] u = model.shaftAt(offsetUm);
        model.filter(tauS, u, c, null);
        List<double[]> rows = new ArrayList<>();
        List<Double> ys = new ArrayList<>();
        for (int f = 0; f < n; f++) {
            if (Double.isFinite(head[f])) {
                rows.add(model.hasJump() ? new double[] {c[f], 1, model.kick(tauS, f)} : new double[] {c[f], 1});
                ys.add(head[f]);
            }
        }
        if (rows.size() <= p) {
            return null;
        }
        try {
            QRDecomposition qr = new QRDecomposition(new Array2DRowRealMatrix(rows.toArray(new double[0][])), 1e-12);
            RealVector solution = qr.getSolver().solve(new ArrayRealVector(
                    ys.stream().mapToDouble(Double::doubleValue).toArray()));
            return solution.toArray();
        } catch (SingularMatrixException e) {
            return null;
        }
    }

    /**
     * A time course with missing frames filled by linear interpolation in time from the nearest finite frames
     * (held at the ends); null when fewer than {@code minFraction} of the frames (and at least one) have a value.
     */
    static double[] filled(double[] values, double minFraction) {
        int n = values.length;
        int finite = 0;
        for (double v : values) {
            finite += Double.isFinite(v) ? 1 : 0;
        }
        if (finite == 0 || finite < minFraction * n) {
            return null;
        }
        double[] out = values.clone();
        int last = -1;
        for (int f = 0; f < n; f++) {
            if (!Double.isFinite(out[f])) {
                continue;
            }
            if (last < 0) {
                for (int g = 0; g < f; g++) {
                    out[g] = out[f];
                }
            } else {
                for (int g = last + 1; g < f; g++) {
                    out[g] = out[last] + (out[f] - out[last]) * (g - last) / (double) (f - last);
                }
            }
            last = f;
        }
        for (int g = last + 1; g < n; g++) {
            out[g] = out[last];
        }
        return out;
    }
}
