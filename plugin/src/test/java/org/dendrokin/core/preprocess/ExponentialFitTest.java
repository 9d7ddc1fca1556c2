package org.dendrokin.core.preprocess;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;

import org.apache.commons.math3.stat.regression.SimpleRegression;
import org.junit.jupiter.api.Test;

class ExponentialFitTest {
    @Test
    void recoversAnExactExponential() {
        double[] t = new double[30];
        double[] y = new double[30];
        for (int i = 0; i < t.length; i++) {
            t[i] = 2.0 * i;
            y[i] = 600 * Math.exp(-(t[i] - 4) / 120.0);
        }
        ExponentialFit.Result fit = ExponentialFit.fit(t, y, 4);
        // REF: the generating closed form A exp(-(t - tRef) / tau) [common practice]
        assertEquals(600, fit.amplitude(), 1e-7, "amplitude");
        assertEquals(1 / 120.0, fit.rate(), 1e-12, "rate, 1/s");
        assertTrue(fit.converged());
    }

    @Test
    void agreesWithALogLinearRegressionWhenTheNoiseIsSmall() {
        // With tiny relative noise, ln y is a straight line in t whose slope is -rate.
        Random random = new Random(11);
        int n = 40;
        double[] t = new double[n];
        double[] y = new double[n];
        SimpleRegression reg = new SimpleRegression();
        double a = 1000;
        double rate = 0.05;
        for (int i = 0; i < n; i++) {
            t[i] = i;
            double clean = a * Math.exp(-rate * t[i]);
            y[i] = clean * (1 + 1e-4 * random.nextGaussian());
            reg.addData(t[i], Math.log(y[i]));
        }
        ExponentialFit.Result fit = ExponentialFit.fit(t, y, 0);
        // REF: Commons Math SimpleRegression on ln y as an independent estimate of the same rate [common practice]
        assertEquals(-reg.getSlope(), fit.rate(), 1e-5, "rate, 1/s");
    }

    @Test
    void rateIntervalCoversTheTruthAboutNinetyFivePercentOfTheTime() {
        Random random = new Random(424242);
        int hits = 0;
        int replicates = 400;
        for (int r = 0; r < replicates; r++) {
            double[] t = new double[25];
            double[] y = new double[25];
            for (int i = 0; i < t.length; i++) {
                t[i] = i * 4.0;
                y[i] = 1.0 * Math.exp(-t[i] / 60.0) + 0.01 * random.nextGaussian();
            }
            double[] ci = ExponentialFit.fit(t, y, 0).rateCi95();
            if (ci[0] <= 1 / 60.0 && 1 / 60.0 <= ci[1]) {
                hits++;
            }
        }
        double coverage = hits / (double) replicates;
        // REF: s^2 (J^T J)^-1 with Student t(m - p) gives nominal 95% coverage near linearity [published
        // formula: Seber & Wild 1989 ch. 5; from memory, sure]; sheet s8.2. 400 replicates: binomial SD 1.1%.
        assertTrue(coverage > 0.91 && coverage < 0.985, "coverage " + coverage);
    }
}
