package org.dendrokin.io.movie;

import java.nio.file.Path;
import java.util.Locale;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.KymographExtractor;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.InputException;

/** Extracts a kymograph from a movie file along a path file, refusing a path that mostly misses the image. */
public final class PathExtraction {
    /** Largest fraction of path samples that may lie outside the image. */
    public static final double MAX_FRACTION_OUTSIDE = 0.5;

    private PathExtraction() {
    }

    /**
     * Samples one channel of the movie along the path, one sample a pixel size along it (see
     * {@link KymographExtractor}). Samples outside the image are NaN; more than half of them outside is an
     * error.
     *
     * @param movie       the open movie
     * @param channel     0-based channel
     * @param path        the path, ImageJ pixel coordinates
     * @param pathFile    the file the path came from, named in error messages
     * @param bandWidthUm width of the band averaged across the path, um
     * @param progress    progress and cancellation
     * @throws InputException naming the path file when more than half of the path lies outside the image
     */
    public static Extraction extract(Movie movie, int channel, DendritePath path, Path pathFile, double bandWidthUm,
            Progress progress) {
        Extraction e = KymographExtractor.extract(movie.channel(channel), path, movie.pixelSizeUm(),
                movie.frameIntervalS(), bandWidthUm, movie.pixelSizeUm(), progress);
        requireMostlyInside(e, pathFile, movie.width(), movie.height(), movie.file());
        return e;
    }

    /**
     * Throws if more than {@link #MAX_FRACTION_OUTSIDE} of the path samples lie outside the image.
     *
     * @param e         an extraction
     * @param pathFile  the path's file, named in the message
     * @param width     image width, pixels
     * @param height    image height, pixels
     * @param movieFile the movie's file, named in the message (may be null)
     */
    public static void requireMostlyInside(Extraction e, Path pathFile, int width, int height, Path movieFile) {
        if (e.fractionOutside() > MAX_FRACTION_OUTSIDE) {
            throw new InputException(pathFile, String.format(Locale.ROOT,
                    "%.0f%% of the path lies outside the %d x %d pixel image%s; check that the path belongs to "
                            + "this movie and uses pixel coordinates",
                    100 * e.fractionOutside(), width, height,
                    movieFile == null ? "" : " of " + movieFile.getFileName()));
        }
    }
}
