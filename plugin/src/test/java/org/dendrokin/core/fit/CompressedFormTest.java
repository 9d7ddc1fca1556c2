package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

/**
 * The compressed problem (residuals (z, rho), Jacobian (R; 0) from the normal equations) against the full one: the
 * Levenberg-Marquardt iteration must visit the same points and end with the same estimates and intervals.
 */
class CompressedFormTest {
    /** Delegates to a model and records every parameter point at which it is evaluated. */
    static final class Recording implements FitModel {
        final FitModel inner;
        final List<double[]> points = new ArrayList<>();
        int fullEvaluations;

        Recording(FitModel inner) {
            this.inner = inner;
        }

        @Override
        public String name() {
            return inner.name();
        }

        @Override
        public List<ParameterSpec> parameters() {
            return inner.parameters();
        }

        @Override
        public int size() {
            return inner.size();
        }

        @Override
        public List<String> headlineParameters() {
            return inner.headlineParameters();
        }

        @Override
        public synchronized void evaluate(double[] parameters, double[] values, double[] jacobian) {
            points.add(parameters.clone());
            fullEvaluations++;
            inner.evaluate(parameters, values, jacobian);
        }

        @Override
        public boolean hasNormalEquations() {
            return inner.hasNormalEquations();
        }

        @Override
        public synchronized void normalEquations(double[] parameters, FitData data, NormalEquations out,
                                                 double[] fitted) {
            points.add(parameters.clone());
            inner.normalEquations(parameters, data, out, fitted);
        }

        /** The points in order of first visit (the full problem evaluates a point twice: value, then Jacobian). */
        List<double[]> distinctPoints() {
            List<double[]> out = new ArrayList<>();
            for (double[] q : points) {
                if (out.stream().noneMatch(o -> Arrays.equals(o, q))) {
                    out.add(q);
                }
            }
            return out;
        }
    }

    private static FitResult fit(Recording model, FitData data, double[] start, ModelFit.Form form) {
        ModelFit.Options options = ModelFit.Options.defaults().withProfiles(false).withTolerance(1e-10);
        return ModelFit.fit(model, data, List.of(start), options, Progress.NONE, form);
    }

    @Test
    void compressedAndFullProblemsTakeTheSameSteps() {
        Kymograph k = Synthetic.pulse(80, 120, 0.5, 0.25, 0.5, 0.02, 2, 20, 1.0, 0.1, 2, 0.05, 31);
        double[] sigma = new double[k.positionCount()];
        Arrays.fill(sigma, 0.05);
        FitData data = FitData.of(k, sigma);
        for (double[] walls : new double[][] {null, {0, k.distancesUm()[k.positionCount() - 1]}}) {
            DiffusionDecayPulse model = new DiffusionDecayPulse(k.distancesUm(), k.timesS(), 2, Double.NaN, walls,
                    Unit.DF_F0);
            double[] start = model.pack(0.9, 0.01, 1.5, 21, 1.4, 0.15, 2);
            Recording full = new Recording(model);
            Recording compressed = new Recording(model);
            FitResult a = fit(full, data, start, ModelFit.Form.FULL);
            FitResult b = fit(compressed, data, start, ModelFit.Form.COMPRESSED);
            assertTrue(a.converged() && b.converged(), a.reason() + b.reason());
            List<double[]> pa = full.distinctPoints();
            List<double[]> pb = compressed.distinctPoints();
            assertTrue(pa.size() > 4, "the fit takes several steps: " + pa.size());
            // Same iterates in exact arithmetic: J~^T J~ = J^T W J, J~^T r~ = J^T W r, |r~| = |r| [common practice]
            assertEquals(pa.size(), pb.size(), "number of points visited");
            for (int i = 0; i < pa.size(); i++) {
                for (int j = 0; j < pa.get(i).length; j++) {
                    // REF: Levenberg-Marquardt depends on J and r only through J^T J, J^T r and |r| [common practice]
                    assertEquals(pa.get(i)[j], pb.get(i)[j], 1e-8 * (1 + Math.abs(pa.get(i)[j])),
                            "point " + i + ", parameter " + j);
                }
            }
            assertEquals(a.chiSquare(), b.chiSquare(), 1e-10 * a.chiSquare(), "chi^2");
            for (int j = 0; j < a.parameters().size(); j++) {
                ParameterEstimate ea = a.parameters().get(j);
                ParameterEstimate eb = b.parameters().get(j);
                assertEquals(ea.value(), eb.value(), 1e-8 * (1 + Math.abs(ea.value())), ea.name());
                assertEquals(ea.standardError(), eb.standardError(), 1e-7 * ea.standardError(), ea.name() + " SE");
                assertEquals(ea.ci95().lower(), eb.ci95().lower(), 1e-7 * (1 + Math.abs(ea.ci95().lower())));
                assertEquals(ea.ci95().upper(), eb.ci95().upper(), 1e-7 * (1 + Math.abs(ea.ci95().upper())));
            }
        }
    }

    @Test
    void illConditionedProblemsFallBackToTheFullForm() {
        // Amplitude and width are nearly interchangeable when the pulse is seen only long after release (V >> s0^2):
        // the scaled J^T J is then far beyond the compressed form's limit, and the fit must still agree with the
        // full problem.
        Kymograph k = Synthetic.pulse(60, 40, 0.5, 0.25, 0.5, 0.02, 2, 15, 0.05, 0.1, -1, 0.02, 32);
        double[] sigma = new double[k.positionCount()];
        Arrays.fill(sigma, 0.02);
        FitData data = FitData.of(k, sigma);
        DiffusionDecayPulse model = new DiffusionDecayPulse(k.distancesUm(), k.timesS(), -1, Double.NaN, null,
                Unit.DF_F0);
        double[] start = model.pack(0.7, 0.03, 1.5, 15.2, 0.08, 0.12, -1);
        FitResult a = fit(new Recording(model), data, start, ModelFit.Form.FULL);
        Recording compressed = new Recording(model);
        FitResult b = fit(compressed, data, start, ModelFit.Form.COMPRESSED);
        assertTrue(compressed.fullEvaluations > 0, "the compressed fit fell back to the full problem");
        assertEquals(a.converged(), b.converged(), a.reason() + " / " + b.reason());
        // REF: the full problem is the reference for the compressed one [common practice]
        assertEquals(a.chiSquare(), b.chiSquare(), 1e-8 * a.chiSquare(), "chi^2");
    }
}
