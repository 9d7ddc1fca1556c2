package org.dendrokin.core.model;

import java.util.ArrayList;
import java.util.List;
import java.util.Optional;

import org.dendrokin.core.units.Unit;

/**
 * {@code fisher-kpp}: u_t = D u_xx + r u (1 - u), growth without threshold; parameters D (um^2/s) and r (1/s).
 * The reaction sub-step is the exact logistic solution u(tau) = u0 e / (1 + u0 (e - 1)), e = exp(r tau). Any
 * positive stimulus invades at the minimal speed c* = 2 sqrt(r D) (Fisher 1937; Kolmogorov, Petrovsky and
 * Piskunov 1937) with width of order sqrt(D / r).
 */
final class FisherKpp extends ScalarModel {
    private static final List<ModelParameter> PARAMETERS = List.of(
            ModelParameter.diffusion("D", "diffusion coefficient"),
            ModelParameter.rate("r", "growth rate"));
    // REF for the formulas: Fisher 1937, Kolmogorov-Petrovsky-Piskunov 1937; sheet s5.1: c* = 2 sqrt(r D), sqrt(D / r)
    private static final ClosedForm FRONT_SPEED = new ClosedForm("front_speed", "front speed 2 sqrt(r D)",
            Unit.SPEED, true, p -> 2 * Math.sqrt(p[1] * p[0]));
    private static final ClosedForm FRONT_WIDTH = new ClosedForm("front_width", "front width sqrt(D / r)",
            Unit.MICROMETRE, true, p -> Math.sqrt(p[0] / p[1]));

    @Override
    public String name() {
        return "fisher-kpp";
    }

    @Override
    public List<ModelParameter> parameters() {
        return PARAMETERS;
    }

    @Override
    public double stiffnessPerS(double[] p) {
        return p[1];
    }

    @Override
    public List<ClosedForm> closedForms() {
        return List.of(FRONT_SPEED, FRONT_WIDTH);
    }

    @Override
    public Optional<ClosedForm> gridScale() {
        return Optional.of(FRONT_WIDTH);
    }

    @Override
    public double rate(double u, double[] p) {
        return p[1] * u * (1 - u);
    }

    @Override
    public double rateDu(double u, double[] p) {
        return p[1] * (1 - 2 * u);
    }

    @Override
    public double rateDp(double u, double[] p, int j) {
        return j == 1 ? u * (1 - u) : 0;
    }

    @Override
    void react(double[] p, double tau, double[] from, double[] to, int n) {
        double e = Math.exp(p[1] * tau);
        double em1 = Math.expm1(p[1] * tau);
        for (int i = 0; i < n; i++) {
            double v = from[i];
            to[i] = v * e / (1 + v * em1);
        }
    }

    /**
     * u1 = v e / (1 + v (e - 1)): du1/dv = e / den^2 and du1/dr = tau e v (1 - v) / den^2, den = 1 + v (e - 1).
     */
    @Override
    void reactWithSensitivities(double[] p, double tau, double[] u, double[][] sens, int n, double[][] scratch) {
        double e = Math.exp(p[1] * tau);
        double em1 = Math.expm1(p[1] * tau);
        double[] sD = sens[0];
        double[] sR = sens[1];
        for (int i = 0; i < n; i++) {
            double v = u[i];
            double den = 1 + v * em1;
            double inv2 = 1 / (den * den);
            double du = e * inv2;
            double dr = tau * e * v * (1 - v) * inv2;
            u[i] = v * e / den;
            sD[i] *= du;
            sR[i] = du * sR[i] + dr;
        }
    }

    /** For each trial front width w: D from the speed c = 2 sqrt(r D) and the width w = sqrt(D / r). */
    @Override
    public StartPoints startPoints(DataGuesses g) {
        double c = g.frontSpeedUmPerS();
        List<double[]> points = new ArrayList<>();
        double narrowest = Double.POSITIVE_INFINITY;
        for (double w : g.trialFrontWidthsUm()) {
            double d = c * w / 2;
            points.add(new double[] {d, d / (w * w)});
            narrowest = Math.min(narrowest, w);
        }
        return new StartPoints(points, narrowest);
    }

    @Override
    public String fitAdvice() {
        return "A travelling front shows mainly its speed and width, so D and r of the fisher-kpp fit are not "
                + "separately determined: report front_speed and front_width instead.";
    }
}
