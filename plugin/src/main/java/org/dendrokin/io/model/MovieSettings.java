package org.dendrokin.io.model;

import java.util.Set;

import org.dendrokin.io.json.JsonFields;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;

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

    static MovieSettings read(JsonFields o) {
        o.refuseUnknownKeys(Set.of("file", "path_px", "pixel_size_um", "width_px", "height_px", "radius_um",
                "baseline", "gain", "noise_sd", "seed"));
        String name = o.string("file");
        if (!name.matches("[A-Za-z0-9._-]+\\.tiff?")) {
            throw o.fail("movie.file must be a plain file name ending in .tif, got \"" + name + "\"");
        }
        JsonArray path = o.array("path_px");
        if (path.size() < 2) {
            throw o.fail("movie.path_px needs at least two [x, y] points");
        }
        double[] x = new double[path.size()];
        double[] y = new double[path.size()];
        for (int i = 0; i < path.size(); i++) {
            JsonElement point = path.get(i);
            if (!point.isJsonArray() || point.getAsJsonArray().size() != 2 || !finite(point.getAsJsonArray().get(0))
                    || !finite(point.getAsJsonArray().get(1))) {
                throw o.fail("movie.path_px[" + i + "] must be a pair of numbers [x, y]");
            }
            x[i] = point.getAsJsonArray().get(0).getAsDouble();
            y[i] = point.getAsJsonArray().get(1).getAsDouble();
        }
        double pixel = o.positive("pixel_size_um");
        int w = (int) o.positive("width_px");
        int h = (int) o.positive("height_px");
        if ((long) w * h > 16_000_000) {
            throw o.fail("movie.width_px x movie.height_px is too large (at most 16 million pixels a frame)");
        }
        double radius = o.has("radius_um") ? o.positive("radius_um") : 1.0;
        double baseline = o.has("baseline") ? o.number("baseline") : 100;
        double gain = o.has("gain") ? o.number("gain") : 100;
        double noise = o.has("noise_sd") ? o.nonNegative("noise_sd") : 0;
        long seed = o.has("seed") ? (long) o.number("seed") : 1L;
        return new MovieSettings(name, x, y, pixel, w, h, radius, baseline, gain, noise, seed);
    }

    private static boolean finite(JsonElement e) {
        return e.isJsonPrimitive() && e.getAsJsonPrimitive().isNumber() && Double.isFinite(e.getAsDouble());
    }
}
