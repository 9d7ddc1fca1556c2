package org.dendrokin.io.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;

import org.dendrokin.core.analysis.LifetimeRequest;
import org.dendrokin.io.InputException;
import org.dendrokin.io.movie.Movie;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonParser;

import ij.ImagePlus;
import ij.ImageStack;
import ij.io.FileSaver;
import ij.process.FloatProcessor;

/** Opening the lifetime method's movies against the session's movie. */
class SessionLifetimeTest {
    @TempDir
    Path dir;

    /** A float hyperstack whose pixel (c, r) of channel ch, frame t holds 1000 ch + 100 t + 10 r + c. */
    private Path tiff(String name, int width, int height, int channels, int frames) {
        ImageStack stack = new ImageStack(width, height);
        for (int t = 0; t < frames; t++) {
            for (int ch = 1; ch <= channels; ch++) {
                float[] px = new float[width * height];
                for (int i = 0; i < px.length; i++) {
                    px[i] = 1000 * ch + 100 * t + 10 * (i / width) + i % width;
                }
                stack.addSlice(new FloatProcessor(width, height, px));
            }
        }
        ImagePlus imp = new ImagePlus(name, stack);
        imp.setDimensions(channels, 1, frames);
        imp.setOpenAsHyperStack(channels > 1);
        Path file = dir.resolve(name);
        assertTrue(new FileSaver(imp).saveAsTiffStack(file.toString()), "written");
        return file;
    }

    private CalibrationSetup setup(String block) {
        return CalibrationConfig.parse(JsonParser.parseString(block).getAsJsonObject(), dir.resolve("session.json"));
    }

    private static float pixel(LifetimeRequest r, boolean photons, int frame, int column, int row) {
        var source = photons ? r.photons() : r.lifetimeNs();
        return source.gather(frame, new int[] {row * source.width() + column}, new float[1])[0];
    }

    @Test
    void readsTheLifetimeAndPhotonsFromTheFilesAndChannelsNamed() {
        Path movieFile = tiff("dendrite.tif", 8, 6, 2, 3);
        tiff("tau.tif", 8, 6, 1, 3);
        try (Movie movie = Movie.open(movieFile, 0.2, 0.1)) {
            try (SessionLifetime l = SessionLifetime.open(setup("{\"method\": \"lifetime\", \"movie\": \"tau.tif\", "
                    + "\"photons\": \"dendrite.tif\", \"photon_channel\": 2}"), dir.resolve("session.json"), movie)) {
                assertEquals(1000 + 100 * 2 + 10 * 3 + 4, pixel(l.request(), false, 2, 4, 3), "lifetime from tau.tif");
                assertEquals(2000 + 100 + 10 * 5 + 7, pixel(l.request(), true, 1, 7, 5),
                        "photons from channel 2 of the session's movie");
            }
            try (SessionLifetime l = SessionLifetime.open(setup("{\"method\": \"lifetime\", \"lifetime_channel\": 2}"),
                    dir.resolve("session.json"), movie)) {
                assertEquals(2000 + 21, pixel(l.request(), false, 0, 1, 2), "lifetime from the session's channel 2");
                assertNull(l.request().photons(), "equal weights");
            }
        }
    }

    @Test
    void aLifetimeMovieOfAnotherSizeOrWithoutTheChannelIsRefusedByKey() {
        Path movieFile = tiff("dendrite.tif", 8, 6, 1, 3);
        tiff("small.tif", 7, 6, 1, 3);
        tiff("short.tif", 8, 6, 1, 2);
        tiff("tau.tif", 8, 6, 1, 3);
        try (Movie movie = Movie.open(movieFile, 0.2, 0.1)) {
            Path session = dir.resolve("session.json");
            InputException e = assertThrows(InputException.class, () -> SessionLifetime.open(
                    setup("{\"method\": \"lifetime\", \"movie\": \"small.tif\"}"), session, movie));
            assertTrue(e.getMessage().startsWith(session.toString()) && e.getMessage().contains("calibration.movie")
                    && e.getMessage().contains("7 x 6 pixels") && e.getMessage().contains("8 x 6 pixels"),
                    e.getMessage());
            e = assertThrows(InputException.class, () -> SessionLifetime.open(setup("{\"method\": \"lifetime\", "
                    + "\"movie\": \"tau.tif\", \"photons\": \"short.tif\"}"), session, movie));
            assertTrue(e.getMessage().contains("calibration.photons") && e.getMessage().contains("2 time points"),
                    e.getMessage());
            e = assertThrows(InputException.class, () -> SessionLifetime.open(setup("{\"method\": \"lifetime\", "
                    + "\"movie\": \"tau.tif\", \"photon_channel\": 3}"), session, movie));
            assertTrue(e.getMessage().contains("calibration.photon_channel") && e.getMessage().contains("tau.tif has 1 "
                    + "channel"), e.getMessage());
            e = assertThrows(InputException.class, () -> SessionLifetime.open(setup("{\"method\": \"lifetime\", "
                    + "\"lifetime_channel\": 2}"), session, movie));
            assertTrue(e.getMessage().contains("calibration.lifetime_channel")
                    && e.getMessage().contains("the session's movie dendrite.tif has 1 channel"), e.getMessage());
            assertEquals(1, e.getMessage().split("\n").length, "one line");
        }
    }
}
