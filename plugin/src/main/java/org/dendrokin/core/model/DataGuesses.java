package org.dendrokin.core.model;

/**
 * What the model-free measures of a kymograph suggest, from which each built-in model makes its starting points
 * for a fit ({@link ScalarModel#startPoints}). Every value is positive and finite (the caller substitutes a
 * fallback when a measure is missing).
 *
 * @param frontSpeedUmPerS speed of the half-maximum front, um/s
 * @param stimulusWidthUm  width (Gaussian standard deviation) of the stimulus, um
 * @param dUm2PerS         apparent diffusion coefficient, um^2/s
 * @param kPerS            inverse of the decay time, 1/s
 * @param gridUm           spacing of the kymograph's positions, um
 */
public record DataGuesses(double frontSpeedUmPerS, double stimulusWidthUm, double dUm2PerS, double kPerS,
        double gridUm) {
    /**
     * Two front widths to start from, um: a narrow one (half the stimulus width, at least 3 grid steps) and a
     * wide one (twice the stimulus width, at least 8 grid steps). A front is about as wide as the stimulus that
     * set it off, within a factor that the two bracket.
     */
    public double[] trialFrontWidthsUm() {
        return new double[] {Math.max(3 * gridUm, stimulusWidthUm / 2), Math.max(8 * gridUm, 2 * stimulusWidthUm)};
    }
}
