package org.dendrokin.core.spread;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;

import org.apache.commons.math3.stat.regression.SimpleRegression;
import org.dendrokin.core.preprocess.Robust;
import org.dendrokin.core.spread.SpreadAnalysis.Front;
import org.dendrokin.core.spread.SpreadAnalysis.FrontVerdict;
import org.dendrokin.core.units.Unit;

/**
 * Whether the arrival times of a spread show a front of constant speed and shape, and its speed on each side of
 * the stimulus (see {@link SpreadAnalysis} for the rules). Kept apart from the other spread measures because the
 * decision has several tests of its own.
 */
final class Fronts {
    /**
     * Ratio of the peak at the farthest quarter of the positions followed to that at the nearest quarter below
     * which the spread counts as dying out rather than as a front of constant shape, whose peak stays the same.
     */
    static final double DECREMENT_RATIO = 0.5;

    private Fronts() {
    }

    /**
     * Decides from the arrival times whether a front of constant speed passes: arrival must grow with distance,
     * spread over more than two frames, and not slow down with distance as passive diffusion does (arrival time
     * growing with the square of the distance: the speed over the farther half of the positions less than two
     * thirds of that over the nearer half, and a line in distance squared closer to the arrival times than a
     * line in distance).
     */
    static Front decide(double[] allDistances, double[] allArrivals, double[] allPeaks, int responding, double dx,
                               double dt, double observedS, List<String> warnings) {
        // An arrival time is NaN where the peak is not finite (a division by zero upstream, such as a ratio over a
        // channel at its background): such positions say nothing about a front, and would leave the robust lines
        // below with too few points or one distinct time.
        int[] finite = java.util.stream.IntStream.range(0, allArrivals.length)
                .filter(i -> Double.isFinite(allDistances[i]) && Double.isFinite(allArrivals[i])).toArray();
        double[] distance = Arrays.stream(finite).mapToDouble(i -> allDistances[i]).toArray();
        double[] arrival = Arrays.stream(finite).mapToDouble(i -> allArrivals[i]).toArray();
        double[] peaks = Arrays.stream(finite).mapToDouble(i -> allPeaks[i]).toArray();
        double[] absD = Arrays.stream(distance).map(Math::abs).toArray();
        double span = Arrays.stream(absD).max().orElse(0) - Arrays.stream(absD).min().orElse(0);
        if (responding >= 5 && distance.length < responding / 2) {
            String reason = String.format(Locale.ROOT, "%d of the %d responding positions had responded by the first "
                    + "frame after the stimulus, so the response arrived nearly everywhere at once and no front can be "
                    + "followed", responding - distance.length, responding);
            warnings.add("The front speed is not available: " + reason + ".");
            return Front.absent(FrontVerdict.SIMULTANEOUS, reason);
        }
        if (distance.length < 5 || span < 3 * dx) {
            String reason = "beyond the stimulated site the response was seen at too few positions to follow a front";
            warnings.add("The front speed is not available: " + reason + ".");
            return Front.absent(FrontVerdict.TOO_FEW_POSITIONS, reason);
        }
        double[] sortedT = arrival.clone();
        Arrays.sort(sortedT);
        double arrivalSpread = quantile(sortedT, 0.9) - quantile(sortedT, 0.1);
        if (arrivalSpread < 2 * dt) {
            String reason = String.format(Locale.ROOT, "the response arrived at nearly the same time at every position "
                    + "(80%% of the arrivals within %.3g s, about %.1f frames), so no front can be followed",
                    arrivalSpread, arrivalSpread / dt);
            warnings.add("The front speed is not available: " + reason + ".");
            return Front.absent(FrontVerdict.SIMULTANEOUS, reason);
        }
        TheilSen.Line line = TheilSen.fit(arrival, absD);
        if (!(line.slope() > 0) || !Double.isFinite(line.slope())) {
            String reason = "arrival times do not increase with distance from the stimulus (the response arrived "
                    + "everywhere at once, or the stimulus position is off)";
            warnings.add("The front speed is not available: " + reason + ".");
            return Front.absent(FrontVerdict.NO_INCREASE, reason);
        }
        double[] halves = halfSpeeds(absD, arrival);
        double vNear = halves[0];
        double vFar = halves[1];
        if (vNear > 0 && vFar > 0 && vNear / vFar > 1.5 && quadraticCloser(absD, arrival)) {
            String reason = String.format(Locale.ROOT, "the spread slows down with distance (about %.3g um/s over "
                    + "the nearer half of the positions and %.3g um/s over the farther half) and the arrival time grows "
                    + "with the square of the distance, as when a signal spreads by passive diffusion; no single speed "
                    + "describes it", vNear, vFar);
            warnings.add("The front speed is not available: " + reason + ".");
            return new Front(FrontVerdict.DIFFUSIVE, reason, vNear, vFar, null, null);
        }
        double[] drop = peakDrop(absD, arrival, peaks, observedS / 2);
        if (drop[1] < DECREMENT_RATIO * drop[0]) {
            String reason = String.format(Locale.ROOT, "the peak falls from %.3g near the stimulus to %.3g at the "
                    + "farthest positions followed, so the signal dies out as it spreads (as diffusion with decay "
                    + "does) instead of travelling as a front of constant shape", drop[0], drop[1]);
            warnings.add("The front speed is not available: " + reason + ".");
            return new Front(FrontVerdict.DECREMENTAL, reason, vNear, vFar, null, null);
        }
        if (vNear > 0 && vFar > 0 && vFar / vNear > 1.5) {
            warnings.add(String.format(Locale.ROOT, "The front speeds up with distance: about %.3g um/s over the nearer "
                    + "half of the positions and %.3g um/s over the farther half. One front speed does not describe "
                    + "it; check for a regenerative wave or an effect of the path's end.", vNear, vFar));
        }
        Estimate left = sideSpeed(distance, arrival, -1, dx);
        Estimate right = sideSpeed(distance, arrival, +1, dx);
        if (left != null && right != null && (left.hi95() < right.lo95() || right.hi95() < left.lo95())) {
            warnings.add(String.format(Locale.ROOT, "The fronts on the two sides of the stimulus travel at different "
                    + "speeds: %.3g um/s towards the start of the path and %.3g um/s towards its end (95%% intervals "
                    + "%.3g to %.3g and %.3g to %.3g um/s do not overlap).", left.value(), right.value(), left.lo95(),
                    left.hi95(), right.lo95(), right.hi95()));
        }
        return new Front(FrontVerdict.FRONT, "", vNear, vFar, left, right);
    }

    /**
     * Median peak of the nearest and of the farthest quarter of the positions reached by {@code untilS} after the
     * stimulus, {near, far}: a position reached late may not have reached its full height when the movie ended (a
     * broad front rises slowly), so only the earlier half of the movie is compared. NaN with fewer than 8 such
     * positions.
     */
    private static double[] peakDrop(double[] absD, double[] arrival, double[] peaks, double untilS) {
        Integer[] order = java.util.stream.IntStream.range(0, absD.length).filter(i -> arrival[i] <= untilS)
                .boxed().toArray(Integer[]::new);
        if (order.length < 8) {
            return new double[] {Double.NaN, Double.NaN};
        }
        Arrays.sort(order, (a, b) -> Double.compare(absD[a], absD[b]));
        int quarter = Math.max(1, order.length / 4);
        double[] near = new double[quarter];
        double[] far = new double[quarter];
        for (int i = 0; i < quarter; i++) {
            near[i] = peaks[order[i]];
            far[i] = peaks[order[order.length - 1 - i]];
        }
        return new double[] {Robust.median(near), Robust.median(far)};
    }

    /** The Theil-Sen front speed over all positions, both sides pooled by absolute distance. */
    static Estimate speed(double[] distance, double[] arrival, double[] lines) {
        double[] absD = Arrays.stream(distance).map(Math::abs).toArray();
        TheilSen.Line line = TheilSen.fit(arrival, absD);
        lines[0] = line.intercept();
        double lo = Math.max(0, line.slopeLo95());
        return new Estimate(line.slope(), Unit.SPEED.symbol(), lo, line.slopeHi95(),
                "Theil-Sen slope, Sen 1968 rank interval");
    }

    /** The front speed on one side of the stimulus (sign -1 or +1), or null with fewer than 5 positions there. */
    private static Estimate sideSpeed(double[] distance, double[] arrival, int sign, double dx) {
        List<double[]> side = new ArrayList<>();
        for (int i = 0; i < distance.length; i++) {
            if (Math.signum(distance[i]) == sign) {
                side.add(new double[] {arrival[i], Math.abs(distance[i])});
            }
        }
        if (side.size() < 5) {
            return null;
        }
        double[] t = column(side, 0);
        double[] d = column(side, 1);
        if (Arrays.stream(d).max().orElse(0) - Arrays.stream(d).min().orElse(0) < 3 * dx) {
            return null;
        }
        try {
            TheilSen.Line line = TheilSen.fit(t, d);
            if (!(line.slope() > 0) || !Double.isFinite(line.slope())) {
                return null;
            }
            return new Estimate(line.slope(), Unit.SPEED.symbol(), Math.max(0, line.slopeLo95()), line.slopeHi95(),
                    "Theil-Sen slope on one side, Sen 1968 rank interval");
        } catch (IllegalArgumentException e) {
            return null;
        }
    }

    /**
     * Theil-Sen speeds over the nearer and the farther half of the positions, {near, far} in um/s; NaN where a
     * half has fewer than 4 positions or too few distinct distances.
     */
    private static double[] halfSpeeds(double[] absD, double[] arrival) {
        double[] sorted = absD.clone();
        Arrays.sort(sorted);
        double split = sorted[sorted.length / 2];
        List<double[]> near = new ArrayList<>();
        List<double[]> far = new ArrayList<>();
        for (int i = 0; i < absD.length; i++) {
            (absD[i] < split ? near : far).add(new double[] {arrival[i], absD[i]});
        }
        if (near.size() < 4 || far.size() < 4) {
            return new double[] {Double.NaN, Double.NaN};
        }
        try {
            return new double[] {TheilSen.fit(column(near, 0), column(near, 1)).slope(),
                    TheilSen.fit(column(far, 0), column(far, 1)).slope()};
        } catch (IllegalArgumentException e) {
            return new double[] {Double.NaN, Double.NaN};
        }
    }

    /**
     * True when arrival = a + b d^2 leaves a smaller sum of squared residuals than arrival = a + b d (both least
     * squares, two parameters each): the arrival times follow the diffusive law better than a constant speed.
     */
    private static boolean quadraticCloser(double[] absD, double[] arrival) {
        SimpleRegression linear = new SimpleRegression();
        SimpleRegression quadratic = new SimpleRegression();
        for (int i = 0; i < absD.length; i++) {
            linear.addData(absD[i], arrival[i]);
            quadratic.addData(absD[i] * absD[i], arrival[i]);
        }
        return quadratic.getSumSquaredErrors() < linear.getSumSquaredErrors();
    }

    private static double quantile(double[] sorted, double q) {
        double pos = q * (sorted.length - 1);
        int i = (int) Math.floor(pos);
        int k = Math.min(sorted.length - 1, i + 1);
        return sorted[i] + (pos - i) * (sorted[k] - sorted[i]);
    }

    private static double[] column(List<double[]> rows, int c) {
        double[] out = new double[rows.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = rows.get(i)[c];
        }
        return out;
    }
}
