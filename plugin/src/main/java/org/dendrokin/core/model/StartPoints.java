package org.dendrokin.core.model;

import java.util.List;

import org.dendrokin.core.Checks;

/**
 * Starting points of a fit of a built-in model, and the narrowest feature they put into the solution, which sets
 * how fine the fit's grid must be.
 *
 * @param points             the model's parameters in the order of {@link BuiltInModel#parameters()}, one array
 *                           a start, in the order the fit should try them. Copied.
 * @param narrowestFeatureUm the narrowest front or stimulus width among the starts, um
 */
public record StartPoints(List<double[]> points, double narrowestFeatureUm) {
    public StartPoints {
        Checks.require(!points.isEmpty(), "at least one starting point is needed");
        points = points.stream().map(double[]::clone).toList();
        Checks.positiveFinite(narrowestFeatureUm, "narrowest feature (um)");
    }

    @Override
    public List<double[]> points() {
        return points.stream().map(double[]::clone).toList();
    }
}
