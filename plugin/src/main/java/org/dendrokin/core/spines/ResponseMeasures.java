package org.dendrokin.core.spines;

import org.dendrokin.core.preprocess.Robust;

/**
 * Model-free measures of one time course's response to the stimulus, defined as the shaft's spread measures define
 * the peak: on the 3-frame centred moving average, from the first frame at or after the stimulus on.
 *
 * @param peak        the largest value of the average (signal units); NaN when there is no finite value
 * @param timeToPeakS time from the stimulus to the frame of the peak, s
 * @param decayTimeS  time from the peak until the average first falls to 1/e of the peak, interpolated linearly
 *                    between frames, s; NaN when the peak is not positive or the average stays above 1/e of it
 */
record ResponseMeasures(double peak, double timeToPeakS, double decayTimeS) {
    static ResponseMeasures of(double[] timesS, double[] values, double stimulusTimeS) {
        double[] smooth = Robust.movingAverage(values, 1);
        int first = NeckExchangeModel.firstFrameAtOrAfter(timesS, stimulusTimeS);
        int at = -1;
        for (int f = first; f < smooth.length; f++) {
            if (Double.isFinite(smooth[f]) && (at < 0 || smooth[f] > smooth[at])) {
                at = f;
            }
        }
        if (at < 0) {
            return new ResponseMeasures(Double.NaN, Double.NaN, Double.NaN);
        }
        double peak = smooth[at];
        double decay = Double.NaN;
        if (peak > 0) {
            double level = peak / Math.E;
            for (int f = at + 1; f < smooth.length; f++) {
                if (Double.isFinite(smooth[f]) && smooth[f] <= level) {
                    double prev = smooth[f - 1];
                    double t = Double.isFinite(prev) && prev > level
                            ? timesS[f - 1] + (prev - level) / (prev - smooth[f]) * (timesS[f] - timesS[f - 1])
                            : timesS[f];
                    decay = t - timesS[at];
                    break;
                }
            }
        }
        return new ResponseMeasures(peak, timesS[at] - stimulusTimeS, decay);
    }
}
