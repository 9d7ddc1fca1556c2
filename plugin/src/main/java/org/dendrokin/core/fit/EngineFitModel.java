package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.List;

import org.dendrokin.core.Checks;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.ScalarRun;
import org.dendrokin.core.model.SolverSettings;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.core.units.Unit;

/**
 * Any scalar engine model ({@link ScalarRun}) as a fit model: the observed signal is b + A u(x, t; theta), with
 * u from the engine (Strang-split Crank-Nicolson on the model's domain, stimuli fixed as given) and theta the
 * model's own parameters, plus the amplitude A and baseline b. The engine runs with a fixed time step chosen once
 * from the starting parameters, so the objective is a smooth function of theta, and the Jacobian columns of theta
 * are forward differences of the engine's own solve (relative step 1e-7, runs in parallel), multiplied by A;
 * those of A and b are exact. Forward differences cost one plain run per parameter, several times less than the
 * engine's forward-sensitivity solve ({@link ScalarRun#solveWithSensitivities}), and agree with it to about
 * 1e-6 relative.
 *
 * <p>Scales: D, k, r (and any other rate or diffusion coefficient) on the log scale; Nagumo's threshold a on a
 * logistic map onto (0, 0.5), where the front invades the resting state.
 */
public final class EngineFitModel implements FitModel {
    private final String modelName;
    private final Domain domain;
    private final double[] outputTimesS;
    private final double[] outputPositionsUm;
    private final List<Stimulus> stimuli;
    private final SolverSettings settings;
    private final List<ParameterSpec> specs;
    private final int engineParameters;
    private final ThreadLocal<Work> work;
    /** Relative step of the forward differences (the engine's output is smooth in theta at a fixed time step). */
    private static final double RELATIVE_STEP = 1e-7;

    private static final class Work {
        final ScalarRun run;
        final double[] u;

        Work(ScalarRun run, int size) {
            this.run = run;
            this.u = new double[size];
        }
    }

    /**
     * @param model             engine model name ("diffusion-decay", "nagumo", "fisher-kpp")
     * @param domain            the cable the engine solves on
     * @param outputTimesS      kymograph frame times, s. Not modified.
     * @param outputPositionsUm kymograph positions measured in the domain's coordinates, um. Not modified.
     * @param stimuli           the protocol (fixed during the fit)
     * @param fixedStepS        engine time step, s (fixed so that the fit's objective is smooth)
     * @param signalUnit        unit of amplitude and baseline
     */
    public EngineFitModel(String model, Domain domain, double[] outputTimesS, double[] outputPositionsUm,
                          List<Stimulus> stimuli, double fixedStepS, Unit signalUnit) {
        Checks.positiveFinite(fixedStepS, "engine time step (s)");
        this.modelName = model;
        this.domain = domain;
        this.outputTimesS = outputTimesS.clone();
        this.outputPositionsUm = outputPositionsUm.clone();
        this.stimuli = List.copyOf(stimuli);
        this.settings = SolverSettings.DEFAULT.withFixedStepS(fixedStepS);
        ScalarRun probe = ScalarRun.prepare(model, domain, outputTimesS, outputPositionsUm, stimuli, settings);
        List<ParameterSpec> s = new ArrayList<>();
        for (String name : probe.parameterNames()) {
            if (name.equals("a")) {
                s.add(ParameterSpec.bounded("a", Unit.DIMENSIONLESS, 0, 0.5));
            } else if (name.equals("D")) {
                s.add(ParameterSpec.positive("D", Unit.DIFFUSION));
            } else {
                s.add(ParameterSpec.positive(name, Unit.RATE));
            }
        }
        engineParameters = s.size();
        s.add(ParameterSpec.linear("amplitude", signalUnit));
        s.add(ParameterSpec.linear("baseline", signalUnit));
        this.specs = List.copyOf(s);
        int size = outputTimesS.length * outputPositionsUm.length;
        this.work = ThreadLocal.withInitial(() -> new Work(
                ScalarRun.prepare(model, domain, this.outputTimesS, this.outputPositionsUm, this.stimuli, settings),
                size));
    }

    @Override
    public String name() {
        return modelName;
    }

    @Override
    public List<ParameterSpec> parameters() {
        return specs;
    }

    @Override
    public int size() {
        return outputTimesS.length * outputPositionsUm.length;
    }

    @Override
    public List<String> headlineParameters() {
        return specs.subList(0, engineParameters).stream().map(ParameterSpec::name).toList();
    }

    @Override
    public List<DerivedQuantity> derivedQuantities() {
        switch (modelName) {
            case "nagumo":
                // REF for the formulas: McKean 1970; sheet s5.2: c = sqrt(k D / 2)(1 - 2a), w = sqrt(2 D / k)
                return List.of(
                        new DerivedQuantity("front_speed", Unit.SPEED, true,
                                th -> Math.sqrt(th[1] * th[0] / 2) * (1 - 2 * th[2])),
                        new DerivedQuantity("front_width", Unit.MICROMETRE, true, th -> Math.sqrt(2 * th[0] / th[1])));
            case "fisher-kpp":
                // Fisher 1937, Kolmogorov-Petrovsky-Piskunov 1937; sheet s5.1: c* = 2 sqrt(r D), ell = sqrt(D / r)
                return List.of(
                        new DerivedQuantity("front_speed", Unit.SPEED, true, th -> 2 * Math.sqrt(th[1] * th[0])),
                        new DerivedQuantity("front_width", Unit.MICROMETRE, true, th -> Math.sqrt(th[0] / th[1])));
            case "diffusion-decay":
                return List.of(new DerivedQuantity("length_constant", Unit.MICROMETRE, true,
                        th -> Math.sqrt(th[0] / th[1])));
            default:
                return List.of();
        }
    }

    @Override
    public String poorlyDeterminedAdvice() {
        if (modelName.equals("nagumo")) {
            return "A steadily travelling bistable front shows only its speed and its width, so D, k and a of the "
                    + "nagumo fit are not separately determined by these data: report front_speed and front_width "
                    + "(with their intervals) instead of D, k and a.";
        }
        if (modelName.equals("fisher-kpp")) {
            return "A travelling front shows mainly its speed and width, so D and r of the fisher-kpp fit are not "
                    + "separately determined: report front_speed and front_width instead.";
        }
        return "";
    }

    /** The engine's domain. */
    public Domain domain() {
        return domain;
    }

    @Override
    public void evaluate(double[] p, double[] values, double[] jac) {
        double[] theta = java.util.Arrays.copyOf(p, engineParameters);
        double amp = p[engineParameters];
        double base = p[engineParameters + 1];
        int np = specs.size();
        int size = values.length;
        if (jac == null) {
            Work w = work.get();
            w.run.solve(theta, w.u);
            for (int g = 0; g < size; g++) {
                values[g] = base + amp * w.u[g];
            }
            return;
        }
        // The engine's derivatives by forward differences of its own solve (fixed step, so a smooth function of
        // theta): one run per engine parameter plus the base run, in parallel. The forward-sensitivity solve
        // gives the same derivatives but costs several plain runs per parameter. Outputs are allocated per call:
        // a worker that waits for these runs may meanwhile run another evaluation with its thread's work arrays.
        double[] u = new double[size];
        double[][] shifted = new double[engineParameters][size];
        double[] step = new double[engineParameters];
        for (int j = 0; j < engineParameters; j++) {
            step[j] = RELATIVE_STEP * Math.max(Math.abs(theta[j]), specs.get(j).scale() == ParameterSpec.Scale.LOGISTIC
                    ? 0.01 * (specs.get(j).upper() - specs.get(j).lower()) : Math.abs(theta[j]));
            if (!(step[j] > 0)) {
                step[j] = RELATIVE_STEP;
            }
        }
        java.util.stream.IntStream.rangeClosed(0, engineParameters).parallel().forEach(j -> {
            ScalarRun run = work.get().run;
            if (j == engineParameters) {
                run.solve(theta, u);
            } else {
                double[] t = theta.clone();
                t[j] += step[j];
                run.solve(t, shifted[j]);
            }
        });
        for (int g = 0; g < size; g++) {
            values[g] = base + amp * u[g];
            int r = g * np;
            for (int j = 0; j < engineParameters; j++) {
                jac[r + j] = amp * (shifted[j][g] - u[g]) / step[j];
            }
            jac[r + engineParameters] = u[g];
            jac[r + engineParameters + 1] = 1;
        }
    }
}
