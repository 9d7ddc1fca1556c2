package org.dendrokin.io.movie;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;

import ij.ImagePlus;
import ij.ImageStack;
import ij.gui.Line;
import ij.gui.ProfilePlot;
import ij.gui.RotatedRectRoi;
import ij.io.RoiEncoder;
import ij.process.FloatProcessor;
import ij.process.ImageStatistics;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.kymo.KymographExtractor;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.InputException;
import org.dendrokin.io.path.PathFiles;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Our band average against ImageJ's own measurement of the same band. */
class BandAverageVersusImageJTest {
    @TempDir
    Path dir;

    /** A smooth synthetic frame: a bright oblique dendrite-like ridge over a gentle gradient. */
    private static FloatProcessor frame(int width, int height, double phase) {
        FloatProcessor fp = new FloatProcessor(width, height);
        for (int y = 0; y < height; y++) {
            for (int x = 0; x < width; x++) {
                double cx = x + 0.5;
                double cy = y + 0.5;
                double ridge = Math.exp(-Math.pow((cy - 0.5 * cx - 20) / 14.0, 2));
                fp.setf(x, y, (float) (200 + 2 * cx + cy + 800 * ridge * (1 + 0.3 * Math.sin(cx / 9.0 + phase))));
            }
        }
        return fp;
    }

    @Test
    void matchesImageJsRotatedRectangleMeanWithinOnePercent() {
        int width = 160;
        int height = 120;
        ImageStack stack = new ImageStack(width, height);
        for (int t = 0; t < 3; t++) {
            stack.addSlice(frame(width, height, t));
        }
        ImagePlus imp = new ImagePlus("ridge", stack);
        ImagePlusFrames frames = new ImagePlusFrames(imp, 0);
        double pixelUm = 0.25;
        double bandUm = 2.0;  // 8 px
        // a straight path along the ridge, in our (and ImageJ's area-ROI) convention
        double x0 = 12.3;
        double y0 = 26.4;
        double dx = 2 * 0.4472135955;
        double dy = 0.4472135955;
        double windowPx = 20;
        for (int w = 0; w < 6; w++) {
            double sx = x0 + w * windowPx * dx;
            double sy = y0 + w * windowPx * dy;
            double ex = sx + windowPx * dx;
            double ey = sy + windowPx * dy;
            DendritePath path = DendritePath.of(new double[] {sx, ex}, new double[] {sy, ey}, false);
            Extraction e = KymographExtractor.extract(frames, path, pixelUm, 1.0, bandUm, pixelUm / 4, Progress.NONE);
            Kymograph k = e.kymograph();
            for (int t = 0; t < 3; t++) {
                imp.setSlice(t + 1);
                imp.setRoi(new RotatedRectRoi(sx, sy, ex, ey, bandUm / pixelUm));
                ImageStatistics stats = imp.getStatistics();
                double ours = 0;
                for (int s = 0; s < k.positionCount(); s++) {
                    ours += k.value(t, s);
                }
                ours /= k.positionCount();
                // REF: ImageJ 1.54p RotatedRectRoi mean (pixels whose centres lie in the band) [common practice];
                // 1 % covers the pixel-centre staircase at the band's edges
                assertEquals(stats.mean, ours, 0.01 * stats.mean, "window " + w + ", frame " + t + " mean");
            }
        }
    }

    @Test
    void matchesImageJsLineProfileAlongALineRoi() throws java.io.IOException {
        int width = 120;
        int height = 90;
        ImagePlus imp = new ImagePlus("ridge", frame(width, height, 0.7));
        Line line = new Line(14, 20, 86, 74);  // 72-54-90 triangle: a whole number of pixels long
        Path roiFile = dir.resolve("line.roi");
        RoiEncoder.save(line, roiFile.toString());
        DendritePath path = PathFiles.read(roiFile, null);
        Extraction e = KymographExtractor.extract(new ImagePlusFrames(imp, 0), path, 1.0, 1.0, 0.0, 1.0,
                Progress.NONE);
        imp.setRoi(line);
        double[] profile = new ProfilePlot(imp).getProfile();
        Kymograph k = e.kymograph();
        int n = Math.min(profile.length, k.positionCount());
        assertTrue(n >= 90, "profile points: " + profile.length + ", samples: " + k.positionCount());
        for (int s = 0; s < n; s++) {
            // REF: ImageJ 1.54p ProfilePlot along the same line ROI, one bilinear sample a pixel [common practice];
            // the tolerance is float rounding of the 32-bit image
            assertEquals(profile[s], k.value(0, s), 1e-5 * profile[s], "profile point " + s);
        }
    }

    @Test
    void extractsFromAMovieFileAsFromTheOpenImage() {
        int width = 96;
        int height = 64;
        ImageStack stack = new ImageStack(width, height);
        for (int t = 0; t < 4; t++) {
            stack.addSlice(frame(width, height, t).convertToShortProcessor(false));
        }
        ImagePlus imp = new ImagePlus("ridge", stack);
        imp.setDimensions(1, 1, 4);
        TestMovies.calibrate(imp, 0.2, 0.1, "sec");
        Path file = TestMovies.save(imp, dir.resolve("ridge.tif"));
        DendritePath path = DendritePath.of(new double[] {5.5, 40.2, 80.7}, new double[] {22.5, 40.1, 55.0}, false);
        try (Movie movie = Movie.open(file, null, null)) {
            Extraction fromFile = PathExtraction.extract(movie, 0, path, dir.resolve("path.csv"), 1.0, Progress.NONE);
            Extraction fromImage = KymographExtractor.extract(new ImagePlusFrames(imp, 0), path, 0.2, 0.1, 1.0, 0.2,
                    Progress.NONE);
            // REF: ImageJ's in-memory stack as the reference reader for the mapped file [common practice]
            assertEquals(fromImage.kymograph().values().length, fromFile.kymograph().values().length);
            double[] a = fromImage.kymograph().values();
            double[] b = fromFile.kymograph().values();
            for (int i = 0; i < a.length; i++) {
                assertEquals(a[i], b[i], 1e-9, "value " + i);
            }
            assertEquals(0.1, fromFile.kymograph().timeStepS(), 1e-12, "time step (s)");
            assertEquals(0.2, fromFile.kymograph().distanceStepUm(), 1e-12, "distance step (um)");
        }
    }

    @Test
    void refusesAPathMostlyOutsideTheImage() {
        ImagePlus imp = TestMovies.stack(16, 30, 30, 2);
        TestMovies.calibrate(imp, 0.5, 1, "sec");
        Path file = TestMovies.save(imp, dir.resolve("small.tif"));
        Path pathFile = dir.resolve("far.csv");
        DendritePath path = DendritePath.of(new double[] {20.5, 80.5}, new double[] {10.5, 10.5}, false);
        try (Movie movie = Movie.open(file, null, null)) {
            InputException e = assertThrows(InputException.class,
                    () -> PathExtraction.extract(movie, 0, path, pathFile, 1.0, Progress.NONE));
            assertTrue(e.getMessage().startsWith(pathFile.toString()) && e.getMessage().contains("outside"),
                    e.getMessage());
        }
    }
}
