package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.distribution.TDistribution;

/**
 * Two groups compared in one shared constant c: the joint problem over both groups' sessions with the coordinates
 * (c of the first group A on its scale, the difference c_B - c_A, then every other constant once per group), so
 * that c_B = c_A + difference. Its minimum is the two groups fitted apart; holding the difference at 0 gives the
 * fit with c common, and twice the log-likelihood difference of the two is the likelihood-ratio statistic,
 * chi-square with one degree of freedom when c_A = c_B (Wilks 1938). The profile of the same objective over the
 * difference gives the difference's interval, so the interval excludes 0 exactly when p &lt; 0.05.
 */
final class GroupDifference {
    private static final int SCALED = 0;
    private static final int DIFFERENCE = 1;

    private GroupDifference() {
    }

    static GlobalFit.Comparison compare(GlobalFit.Fitted a, GlobalFit.Fitted b, int c, GlobalFit.Options options,
                                       GlobalFit.Counter counter) {
        String constant = GlobalFit.SHARED.get(c);
        List<String> warnings = new ArrayList<>();
        List<JointProblem.Coordinate> groupCoords = GlobalFit.coordinates(a.blocks.get(0).specs, "");
        ParameterSpec spec = groupCoords.get(c).spec();
        List<JointProblem.Coordinate> coords = new ArrayList<>();
        coords.add(new JointProblem.Coordinate(constant + " (" + a.name + ")", spec));
        coords.add(new JointProblem.Coordinate(constant + " difference",
                ParameterSpec.linear(constant + " difference", spec.unit())));
        int[] otherA = new int[groupCoords.size()];
        int[] otherB = new int[groupCoords.size()];
        for (int o = 0; o < groupCoords.size(); o++) {
            if (o != c) {
                otherA[o] = coords.size();
                coords.add(new JointProblem.Coordinate(groupCoords.get(o).name() + " (" + a.name + ")",
                        groupCoords.get(o).spec()));
                otherB[o] = coords.size();
                coords.add(new JointProblem.Coordinate(groupCoords.get(o).name() + " (" + b.name + ")",
                        groupCoords.get(o).spec()));
            }
        }
        List<JointProblem.Block> blocks = new ArrayList<>();
        List<double[]> locals = new ArrayList<>();
        for (GlobalFit.Fitted f : List.of(a, b)) {
            boolean second = f == b;
            for (int i = 0; i < f.blocks.size(); i++) {
                JointProblem.Block old = f.blocks.get(i);
                List<JointProblem.Link> links = new ArrayList<>();
                for (int o = 0; o < groupCoords.size(); o++) {
                    int slot = old.model.indexOf(GlobalFit.SHARED.get(o));
                    if (o == c) {
                        links.add(new JointProblem.Link(slot, SCALED, second ? DIFFERENCE : -1));
                    } else {
                        links.add(new JointProblem.Link(slot, second ? otherB[o] : otherA[o], -1));
                    }
                }
                blocks.add(new JointProblem.Block(old.id, old.model, old.data, links));
                locals.add(f.solution.state().u[i].clone());
            }
        }
        JointProblem problem = new JointProblem(coords, blocks);
        double[] gamma = new double[coords.size()];
        double[] ga = a.solution.state().gamma;
        double[] gb = b.solution.state().gamma;
        gamma[SCALED] = ga[c];
        gamma[DIFFERENCE] = spec.toNatural(gb[c]) - spec.toNatural(ga[c]);
        for (int o = 0; o < groupCoords.size(); o++) {
            if (o != c) {
                gamma[otherA[o]] = ga[o];
                gamma[otherB[o]] = gb[o];
            }
        }
        JointProblem.State start = new JointProblem.State(gamma, locals.toArray(new double[0][]));
        double[] ones = problem.ones();
        boolean[] none = new boolean[coords.size()];
        // the groups' own fits are this problem's minimum: one pass confirms it
        JointProblem.Solution apart = problem.solve(start, none, ones, options.maxPasses(), counter.progress());
        counter.step("comparing " + a.name + " and " + b.name);
        if (!apart.converged()) {
            return failed(a, b, constant, "the two groups could not be fitted together: " + apart.reason());
        }
        boolean[] held = none.clone();
        held[DIFFERENCE] = true;
        JointProblem.Solution common = JointIntervals.refit(problem, apart, DIFFERENCE,
                -apart.state().gamma[DIFFERENCE], held, ones, options, counter.progress());
        counter.step("comparing " + a.name + " and " + b.name);
        if (!common.converged()) {
            return failed(a, b, constant, "the fit with a common " + constant + " did not converge: "
                    + common.reason());
        }
        double statistic = Math.max(0, common.objective() - apart.objective());
        double p = 1 - new ChiSquaredDistribution(null, 1).cumulativeProbability(statistic);
        BlockArrowSystem.Covariance cov = problem.covariance(apart, none, ones);
        if (cov == null) {
            return failed(a, b, constant, "the sensitivity matrix of the two groups together is singular");
        }
        int points = blocks.stream().mapToInt(x -> x.n).sum();
        int free = coords.size() + blocks.stream().mapToInt(x -> x.local.length).sum();
        double tq = new TDistribution(null, Math.max(1, points - free)).inverseCumulativeProbability(0.975);
        double variance = cov.global()[DIFFERENCE][DIFFERENCE];
        Interval profile = options.profiles() ? JointIntervals.profile(problem, apart, DIFFERENCE, none, ones,
                tq * Math.sqrt(variance), options, warnings, counter) : null;
        Interval bootstrap = null;
        double pBoot = Double.NaN;
        if (a.replicates != null && b.replicates != null) {
            // sessions resampled within each group, independently: the variances add, each with its own G / (G - 1)
            double va = groupVariance(a, c, spec);
            double vb = groupVariance(b, c, spec);
            double se = Math.sqrt(va + vb);
            if (se > 0) {
                int na = a.sessions.size();
                int nb = b.sessions.size();
                double dof = (va + vb) * (va + vb) / (va * va / (na - 1) + vb * vb / (nb - 1));
                double delta = apart.state().gamma[DIFFERENCE];
                double half = JointIntervals.tQuantile(dof) * se;
                bootstrap = new Interval(delta - half, delta + half, GlobalFit.BOOTSTRAP);
                pBoot = 2 * (1 - new TDistribution(null, Math.max(1, dof)).cumulativeProbability(Math.abs(delta) / se));
            }
        }
        ParameterEstimate difference = JointIntervals.estimate(new JointProblem.Coordinate(constant,
                coords.get(DIFFERENCE).spec()), apart.state().gamma[DIFFERENCE], variance, tq, profile, bootstrap);
        if (Math.max(a.scatter[c], b.scatter[c]) > GlobalFit.HETEROGENEOUS) {
            warnings.add(String.format(Locale.ROOT, "The sessions differ more than their noise explains, so the "
                    + "likelihood-ratio p value (which takes %s as exactly shared within each group) is too small; "
                    + "judge the difference by its bootstrap interval.", constant));
        }
        boolean differs = p < 0.05 && (Double.isNaN(pBoot) || pBoot < 0.05);
        return new GlobalFit.Comparison(a.name, b.name, constant, statistic, p, pBoot, differs, difference, warnings);
    }

    /** The bootstrap variance of a group's constant on the natural scale, with the factor G / (G - 1). */
    private static double groupVariance(GlobalFit.Fitted f, int c, ParameterSpec spec) {
        double[] v = new double[f.replicates.length];
        for (int r = 0; r < v.length; r++) {
            v[r] = f.replicates[r] == null ? Double.NaN : spec.toNatural(f.replicates[r][c]);
        }
        return JointIntervals.clusterVariance(v, f.sessions.size());
    }

    private static GlobalFit.Comparison failed(GlobalFit.Fitted a, GlobalFit.Fitted b, String constant,
                                               String why) {
        return new GlobalFit.Comparison(a.name, b.name, constant, Double.NaN, Double.NaN, Double.NaN, false, null,
                List.of("No comparison of " + constant + ": " + why + "."));
    }
}
