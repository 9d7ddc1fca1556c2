package org.dendrokin.core.kymo;

/**
 * The result of sampling a movie along a path: a raw intensity kymograph (signal unit {@code "intensity"}),
 * how many of its samples fell outside the image (NaN in the kymograph), and the sample centres in ImageJ
 * pixel coordinates (pixel i covers [i, i+1)), for drawing the path over the movie.
 *
 * @param kymograph       intensities, one row a frame, one column a sample along the path
 * @param samplesOutside  number of NaN values in the kymograph because the band left the image
 * @param fractionOutside fraction of path samples (columns) that lie outside the image, 0..1
 * @param xPx             x of each sample centre, ImageJ pixel coordinates
 * @param yPx             y of each sample centre, ImageJ pixel coordinates
 */
public record Extraction(Kymograph kymograph, long samplesOutside, double fractionOutside, double[] xPx,
        double[] yPx) {
    public Extraction {
        xPx = xPx.clone();
        yPx = yPx.clone();
    }

    @Override
    public double[] xPx() {
        return xPx.clone();
    }

    @Override
    public double[] yPx() {
        return yPx.clone();
    }
}
