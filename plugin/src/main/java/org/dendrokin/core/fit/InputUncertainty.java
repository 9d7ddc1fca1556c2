package org.dendrokin.core.fit;

import java.util.List;
import java.util.Objects;

import org.dendrokin.core.Checks;

/**
 * The uncertainty of an input the data were computed from, which the residuals cannot show: each entry of
 * {@code shifts} is the change of the data (on the fit's grid, signal units) when one independent part of the input
 * moves up by one standard deviation. A fit turns each shift into the change of its estimates that a refit would
 * make, to first order ({@code delta theta = (J^T W J)^-1 J^T W delta y}), and adds their outer products to the
 * estimates' covariance: the propagation of an input's error through a least-squares fit (the "systematic" part of
 * an error budget in the usual sense; see docs/decisions.md).
 *
 * <p>The background under the dendrite is the example that matters: an error e in it becomes, after the bleaching
 * correction divides by b(t), a drift of about (e / F0)(1 / b(t) - 1) in dF/F0 that grows over the movie and that a
 * decay rate takes for its own. The data are the same whatever e is, so no residual check sees it.
 *
 * @param source short name written after the interval's method ({@code robust-profile+background})
 * @param shifts one array per independent part, each as long as the data's grid. Not modified; copied.
 */
public record InputUncertainty(String source, List<double[]> shifts) {
    public InputUncertainty {
        Objects.requireNonNull(source, "source");
        Checks.require(!source.isBlank(), "an input uncertainty needs a name");
        shifts = shifts.stream().map(double[]::clone).toList();
    }

    /** The k-th shift (not a copy: read only). */
    double[] shift(int k) {
        return shifts.get(k);
    }

    @Override
    public List<double[]> shifts() {
        return shifts.stream().map(double[]::clone).toList();
    }
}
