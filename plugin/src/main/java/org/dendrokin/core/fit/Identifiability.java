package org.dendrokin.core.fit;

import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;

/**
 * Plain-sentence warnings when the data do not pin parameters down: a parameter at the edge of its allowed
 * range, a 95% interval wider than the value itself, or two parameters so strongly correlated (|r| > 0.95)
 * that the data fix only a combination of them.
 */
final class Identifiability {
    static final double STRONG_CORRELATION = 0.95;
    /** Beyond this |r| a headline parameter counts as not determined on its own. */
    static final double NEARLY_COLLINEAR = 0.99;

    private Identifiability() {
    }

    /**
     * Adds warnings and returns the names of the poorly determined parameters.
     *
     * @param theta     natural values. Not modified.
     * @param intervals the reported interval of each parameter. Not modified.
     * @param corr      correlation matrix on the optimiser's scale. Not modified.
     * @param atBound   which parameters sit at a bound. Not modified.
     * @param warnings  receives the sentences. Modified.
     */
    static Set<String> assess(FitModel model, double[] theta, Interval[] intervals, double[][] corr,
                              boolean[] atBound, List<String> warnings) {
        List<ParameterSpec> specs = model.parameters();
        Set<String> poor = new LinkedHashSet<>();
        for (int j = 0; j < specs.size(); j++) {
            String name = specs.get(j).name();
            if (atBound[j]) {
                poor.add(name);
                warnings.add(String.format(Locale.ROOT, "%s ended at the edge of its allowed range (%s): the data "
                        + "push it there, so its value is a limit, not an estimate.", name, fmt(theta[j])));
            }
            Interval ci = intervals[j];
            if (ci != null && specs.get(j).scale() != ParameterSpec.Scale.LINEAR
                    && (!ci.isFinite() || ci.width() > Math.abs(theta[j]))) {
                poor.add(name);
                String unit = specs.get(j).unit().symbol().isEmpty() ? "" : " " + specs.get(j).unit().symbol();
                warnings.add(String.format(Locale.ROOT, "The 95%% interval of %s (%s to %s%s) is wider than its "
                        + "value (%s): these data do not determine %s.", name, fmt(ci.lower()), fmt(ci.upper()),
                        unit, fmt(theta[j]), name));
            }
        }
        for (int a = 0; a < specs.size(); a++) {
            for (int b = a + 1; b < specs.size(); b++) {
                if (Math.abs(corr[a][b]) > STRONG_CORRELATION) {
                    String na = specs.get(a).name();
                    String nb = specs.get(b).name();
                    warnings.add(String.format(Locale.ROOT, "%s and %s are strongly correlated (r = %.3f): the "
                            + "data fix a combination of the two better than either one.", na, nb, corr[a][b]));
                    boolean nearlyCollinear = Math.abs(corr[a][b]) > NEARLY_COLLINEAR;
                    if (nearlyCollinear && model.headlineParameters().contains(na)) {
                        poor.add(na);
                    }
                    if (nearlyCollinear && model.headlineParameters().contains(nb)) {
                        poor.add(nb);
                    }
                }
            }
        }
        boolean headlinePoor = model.headlineParameters().stream().anyMatch(poor::contains);
        if (headlinePoor && !model.poorlyDeterminedAdvice().isEmpty()) {
            warnings.add(model.poorlyDeterminedAdvice());
        }
        return poor;
    }

    static String fmt(double v) {
        if (Double.isInfinite(v)) {
            return v > 0 ? "infinity" : "-infinity";
        }
        return String.format(Locale.ROOT, "%.4g", v);
    }
}
