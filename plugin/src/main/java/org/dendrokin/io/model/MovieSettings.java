package org.dendrokin.io.model;

import java.util.Set;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;

/**
 * The optional {@code movie} block of a model file: a synthetic microscope movie along a drawn path, made
 * from the simulated kymograph.
 *
 * @param fileName      output TIFF name (inside the output folder)
 * @param pathXPx       path vertices, x in pixels (ImageJ convention: pixel i spans [i, i + 1))
 * @param pathYPx       path vertices, y in pixels
 * @param pixelSizeUm   pixel size, um
 * @param widthPx       image width, pixels
 * @param heightPx      image height, pixels
 * @param radiusUm      dendrite half-width: the signal falls off across the path as a Gaussian of this sd, um
 * @param baseline      background intensity
 * @param gain          intensity per model concentration unit
 * @param noiseSd       standard deviation of added Gaussian noise (0 for none)
 * @param seed          seed of the noise
 */
public record MovieSettings(String fileName, double[] pathXPx, double[] pathYPx, double pixelSizeUm, int widthPx,
        int heightPx, double radiusUm, double baseline, double gain, double noiseSd, long seed) {

    static MovieSettings read(ModelFile mf, JsonObject o) {
        mf.keys(o, "movie.", Set.of("file", "path_px", "pixel_size_um", "width_px", "height_px", "radius_um",
                "baseline", "gain", "noise_sd", "seed"));
        String name = mf.string(o, "file", "movie.file");
        if (!name.matches("[A-Za-z0-9._-]+\\.tiff?")) {
            throw mf.fail("movie.file must be a plain file name ending in .tif, got \"" + name + "\"");
        }
        JsonArray path = mf.array(o, "path_px", "movie.path_px");
        if (path.size() < 2) {
            throw mf.fail("movie.path_px needs at least two [x, y] points");
        }
        double[] x = new double[path.size()];
        double[] y = new double[path.size()];
        for (int i = 0; i < path.size(); i++) {
            if (!path.get(i).isJsonArray() || path.get(i).getAsJsonArray().size() != 2) {
                throw mf.fail("movie.path_px[" + i + "] must be a pair [x, y]");
            }
            JsonArray p = path.get(i).getAsJsonArray();
            try {
                x[i] = p.get(0).getAsDouble();
                y[i] = p.get(1).getAsDouble();
            } catch (RuntimeException e) {
                throw mf.fail("movie.path_px[" + i + "] must hold two numbers");
            }
        }
        double pixel = mf.positive(o, "pixel_size_um", "movie.pixel_size_um");
        int w = (int) mf.positive(o, "width_px", "movie.width_px");
        int h = (int) mf.positive(o, "height_px", "movie.height_px");
        if ((long) w * h > 16_000_000) {
            throw mf.fail("movie.width_px x movie.height_px is too large (at most 16 million pixels a frame)");
        }
        double radius = o.has("radius_um") ? mf.positive(o, "radius_um", "movie.radius_um") : 1.0;
        double baseline = o.has("baseline") ? mf.number(o, "baseline", "movie.baseline") : 100;
        double gain = o.has("gain") ? mf.number(o, "gain", "movie.gain") : 100;
        double noise = o.has("noise_sd") ? mf.nonNegative(o, "noise_sd", "movie.noise_sd") : 0;
        long seed = o.has("seed") ? (long) mf.number(o, "seed", "movie.seed") : 1L;
        return new MovieSettings(name, x, y, pixel, w, h, radius, baseline, gain, noise, seed);
    }
}
