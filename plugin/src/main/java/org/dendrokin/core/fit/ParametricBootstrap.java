package org.dendrokin.core.fit;

import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import java.util.concurrent.atomic.AtomicLong;
import java.util.stream.IntStream;

import org.dendrokin.core.Progress;

/**
 * Parametric-bootstrap intervals (Efron and Tibshirani 1993, ch. 6 and 13): replicate r refits the model, from the
 * estimate, to y*_i = f_i(theta_hat) + s sigma_i z_i with z_i standard normal from a generator seeded with
 * seed + 7919 r (so the replicates do not depend on the number of cores), replicates in parallel; the 95% interval
 * is the 2.5th and 97.5th percentile (linear interpolation between order statistics) of the refitted values.
 */
final class ParametricBootstrap {
    /** Fewest converged replicates from which percentiles are given. */
    static final int MIN_REPLICATES = 20;

    private ParametricBootstrap() {
    }

    /**
     * @param minimiser  refits the model
     * @param data       the fit's data (its grid, sigmas and used points)
     * @param best       the estimate the replicates start from
     * @param fitted     the prediction at the estimate over the whole grid. Not modified.
     * @param s          sqrt(chi^2 / (n - p)), the noise scale relative to the sigmas
     * @param replicates number of replicates, at least 1
     * @param seed       seed of the random numbers
     * @param warnings   receives a sentence when fewer than 90% of the refits converge. Modified.
     * @param progress   one unit per replicate, counted on from {@code done}; checked for cancellation
     * @return one interval per parameter (natural units), all null if fewer than {@value #MIN_REPLICATES} converged
     */
    static Interval[] intervals(Minimiser minimiser, FitData data, Minimiser.Local best, double[] fitted, double s,
                                int replicates, long seed, List<String> warnings, Progress progress, long done,
                                long total) {
        int p = minimiser.parameterCount();
        double[][] values = new double[replicates][];
        AtomicLong finished = new AtomicLong(done);
        IntStream.range(0, replicates).parallel().forEach(r -> {
            if (progress.isCancelled()) {
                return;
            }
            Random random = new Random(seed + 7919L * r);
            double[] y = new double[data.size()];
            Arrays.fill(y, Double.NaN);
            for (int i = 0; i < data.usedCount(); i++) {
                int g = data.usedIndex(i);
                y[g] = fitted[g] + s * data.sigma(g) * random.nextGaussian();
            }
            Minimiser.Local local = minimiser.minimise(best.u, new boolean[p], data.withValues(y));
            if (local.failure == null) {
                values[r] = minimiser.natural(local.u);
            }
            progress.report("bootstrap", finished.incrementAndGet(), total);
        });
        progress.checkCancelled();
        List<double[]> ok = Arrays.stream(values).filter(v -> v != null).toList();
        Interval[] out = new Interval[p];
        if (ok.size() < 0.9 * replicates) {
            warnings.add(String.format(Locale.ROOT, "Only %d of %d bootstrap refits converged; the bootstrap "
                    + "intervals may be too narrow.", ok.size(), replicates));
        }
        if (ok.size() < MIN_REPLICATES) {
            return out;
        }
        for (int j = 0; j < p; j++) {
            final int c = j;
            double[] v = ok.stream().mapToDouble(x -> x[c]).sorted().toArray();
            out[j] = new Interval(quantile(v, 0.025), quantile(v, 0.975), Interval.BOOTSTRAP);
        }
        return out;
    }

    /** The q-quantile of sorted values, interpolating linearly between order statistics. */
    static double quantile(double[] sorted, double q) {
        double pos = q * (sorted.length - 1);
        int i = (int) Math.floor(pos);
        int k = Math.min(sorted.length - 1, i + 1);
        return sorted[i] + (pos - i) * (sorted[k] - sorted[i]);
    }
}
