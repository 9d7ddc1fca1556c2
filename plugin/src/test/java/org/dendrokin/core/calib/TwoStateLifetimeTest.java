package org.dendrokin.core.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;

import org.apache.commons.math3.analysis.UnivariateFunction;
import org.apache.commons.math3.analysis.differentiation.DerivativeStructure;
import org.apache.commons.math3.analysis.differentiation.FiniteDifferencesDifferentiator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegratorFactory;
import org.apache.commons.math3.stat.descriptive.moment.StandardDeviation;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

class TwoStateLifetimeTest {
    /** Free and bound lifetimes of a FRET sensor in the range such sensors show, invented for the test, ns. */
    private static final double TAU_FREE = 2.6;
    private static final double TAU_BOUND = 1.1;

    /**
     * The mean photon arrival time of a two-state mixture, straight from its definition: the decay after a pulse is
     * I(t) = (1 - P) exp(-t / tau_free) + P exp(-t / tau_bound) (amplitudes = fractions of molecules), and the mean
     * lifetime is int t I dt / int I dt, both integrals done numerically by Commons Math's 10-point Gauss-Legendre
     * rule on 200 pieces of [0, 60 tau_free] (the tail beyond holds e^-60 of the light).
     */
    private static double meanArrivalTimeNs(double fractionBound) {
        UnivariateFunction decay = t -> (1 - fractionBound) * Math.exp(-t / TAU_FREE)
                + fractionBound * Math.exp(-t / TAU_BOUND);
        UnivariateFunction moment = t -> t * decay.value(t);
        double upper = 60 * TAU_FREE;
        int pieces = 200;
        GaussIntegratorFactory gauss = new GaussIntegratorFactory();
        double photons = 0;
        double first = 0;
        for (int i = 0; i < pieces; i++) {
            double a = upper * i / pieces;
            double b = upper * (i + 1) / pieces;
            photons += gauss.legendre(10, a, b).integrate(decay);
            first += gauss.legendre(10, a, b).integrate(moment);
        }
        return first / photons;
    }

    @Test
    void invertsTheMeanLifetimeOfATwoExponentialMixture() {
        TwoStateLifetime cal = new TwoStateLifetime(TAU_FREE, TAU_BOUND);
        for (double p = 0; p <= 1.0001; p += 0.1) {
            double tauM = meanArrivalTimeNs(p);
            // REF: P = tau_f (tau_f - tau_m) / ((tau_f - tau_b)(tau_f + tau_b - tau_m)) [from memory: Yasuda et al.
            // 2006 Nat Neurosci 9:283; re-derived here from tau_m = sum a_i tau_i^2 / sum a_i tau_i, which the
            // quadrature of the decay computes independently]
            assertEquals(p, cal.concentrationMicromolar(tauM), 1e-9, "fraction bound from the mean arrival time");
            assertEquals(tauM, cal.signal(p), 1e-9, "mean lifetime (ns) of the mixture with P = " + p);
        }
        assertEquals(0.0, cal.concentrationMicromolar(TAU_FREE), 1e-15, "the free sensor");
        assertEquals(1.0, cal.concentrationMicromolar(TAU_BOUND), 1e-15, "the bound sensor");
    }

    @Test
    void keepsNoiseAroundTheEndsAndRefusesMeaninglessLifetimes() {
        TwoStateLifetime cal = new TwoStateLifetime(TAU_FREE, TAU_BOUND);
        assertTrue(cal.concentrationMicromolar(TAU_FREE + 0.05) < 0, "a lifetime a little above tau_free is kept");
        assertTrue(cal.concentrationMicromolar(TAU_BOUND - 0.05) > 1, "a lifetime a little below tau_bound is kept");
        assertTrue(Double.isNaN(cal.concentrationMicromolar(TAU_FREE + TAU_BOUND)), "no finite P at tau_f + tau_b");
        assertTrue(Double.isNaN(cal.concentrationMicromolar(0)), "a lifetime of zero");
        assertTrue(Double.isNaN(cal.concentrationMicromolar(-1)), "a negative lifetime");
        assertFalse(cal.saturates(), "no flags or NaN near the ends");
        assertEquals(Unit.FRACTION_BOUND, cal.outputUnit());
        assertEquals(SignalKind.LIFETIME, cal.input());
        assertThrows(IllegalArgumentException.class, () -> new TwoStateLifetime(1.1, 2.6));
        assertThrows(IllegalArgumentException.class, () -> new TwoStateLifetime(2.6, 2.6));
        assertThrows(IllegalArgumentException.class, () -> new TwoStateLifetime(2.6, -1));
    }

    @Test
    void derivativesMatchFiniteDifferences() {
        double sdFree = 0.03;
        double sdBound = 0.05;
        TwoStateLifetime cal = new TwoStateLifetime(TAU_FREE, TAU_BOUND, sdFree, sdBound);
        for (double tauM : new double[] {1.0, 1.3, 1.9, 2.4, 2.7}) {
            double h = 1e-3;
            FiniteDifferencesDifferentiator fd = new FiniteDifferencesDifferentiator(5, h);
            double dTauM = fd.differentiate((UnivariateFunction) cal::concentrationMicromolar)
                    .value(new DerivativeStructure(1, 1, 0, tauM)).getPartialDerivative(1);
            double dFree = fd.differentiate((UnivariateFunction) tf -> new TwoStateLifetime(tf, TAU_BOUND)
                    .concentrationMicromolar(tauM)).value(new DerivativeStructure(1, 1, 0, TAU_FREE))
                    .getPartialDerivative(1);
            double dBound = fd.differentiate((UnivariateFunction) tb -> new TwoStateLifetime(TAU_FREE, tb)
                    .concentrationMicromolar(tauM)).value(new DerivativeStructure(1, 1, 0, TAU_BOUND))
                    .getPartialDerivative(1);
            // REF: Commons Math FiniteDifferencesDifferentiator, 5-point stencil [common practice]
            assertEquals(dTauM, cal.derivative(tauM), 1e-7 * Math.abs(dTauM), "dP/dtau_m at " + tauM + " ns");
            // REF: delta method sd = sqrt(sum (dP/dtheta_i sd_i)^2) for independent constants [common practice]
            assertEquals(Math.hypot(dFree * sdFree, dBound * sdBound), cal.concentrationSdMicromolar(tauM),
                    1e-7 * cal.concentrationSdMicromolar(tauM), "SD of P from the reference lifetimes at " + tauM);
        }
    }

    @Test
    void deltaMethodSdAgreesWithMonteCarlo() {
        double sdFree = 0.04;
        double sdBound = 0.06;
        TwoStateLifetime cal = new TwoStateLifetime(TAU_FREE, TAU_BOUND, sdFree, sdBound);
        Random random = new Random(20261213L);
        for (double tauM : new double[] {1.5, 2.0, 2.5}) {
            double photons = 2000;
            double tauSd = LifetimePrecision.sdNs(tauM, photons);
            double predicted = cal.concentrationSdMicromolar(tauM, tauSd);
            int draws = 200_000;
            double[] p = new double[draws];
            for (int i = 0; i < draws; i++) {
                double tf = TAU_FREE + sdFree * random.nextGaussian();
                double tb = TAU_BOUND + sdBound * random.nextGaussian();
                double tm = tauM + tauSd * random.nextGaussian();
                p[i] = new TwoStateLifetime(tf, tb).concentrationMicromolar(tm);
            }
            double simulated = new StandardDeviation().evaluate(p);
            // REF: Monte Carlo of the same inputs, 2e5 seeded draws [common practice]; 3% covers the sampling error
            // of an SD (0.2%) and the curvature the first-order formula leaves out at these SDs
            assertEquals(simulated, predicted, 0.03 * simulated, "SD of the fraction bound at tau_m = " + tauM);
        }
    }
}
