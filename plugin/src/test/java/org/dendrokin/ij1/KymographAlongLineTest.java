package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Path;

import ij.IJ;
import ij.ImagePlus;
import ij.ImageStack;
import ij.WindowManager;
import ij.gui.Line;
import ij.gui.PolygonRoi;
import ij.gui.Roi;
import ij.io.RoiEncoder;
import ij.measure.Calibration;
import ij.process.ShortProcessor;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.kymo.KymographExtractor;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.movie.ImagePlusFrames;
import org.dendrokin.io.path.PathFiles;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Kymograph Along Line run by its menu label and options on a test movie with a line selection. */
class KymographAlongLineTest {
    private static final String OPTIONS = "lines=[current selection] pixel=0.2 frame=0.5 band=0.6 step=0.2";

    @BeforeAll
    static void imagej() {
        HeadlessImageJ.start();
    }

    /** A 16-bit movie, 40 x 30 pixels, 5 frames, whose value is linear in x, y and t: 100 + 10 i + 3 j + 50 t. */
    private static ImagePlus linearMovie() {
        ImageStack stack = new ImageStack(40, 30);
        for (int t = 0; t < 5; t++) {
            short[] p = new short[40 * 30];
            for (int j = 0; j < 30; j++) {
                for (int i = 0; i < 40; i++) {
                    p[j * 40 + i] = (short) (100 + 10 * i + 3 * j + 50 * t);
                }
            }
            stack.addSlice(new ShortProcessor(40, 30, p, null));
        }
        ImagePlus movie = new ImagePlus("linear", stack);
        movie.setDimensions(1, 1, 5);
        Calibration cal = movie.getCalibration();
        cal.pixelWidth = 0.2;
        cal.pixelHeight = 0.2;
        cal.setUnit("micron");
        cal.frameInterval = 0.5;
        cal.setTimeUnit("s");
        return movie;
    }

    private static ImagePlus run(ImagePlus movie, String options) {
        WindowManager.setTempCurrentImage(movie);
        IJ.run("Kymograph Along Line...", options);
        ImagePlus result = WindowManager.getCurrentImage();
        WindowManager.setTempCurrentImage(null);
        return result;
    }

    private static DendritePath viaRoiFile(Roi roi, Path dir) {
        Path file = dir.resolve("path.roi");
        RoiEncoder.save(roi, file.toString());
        return PathFiles.read(file, null);
    }

    @Test
    void straightLineGivesTheLinearMovieAlongIt() {
        ImagePlus movie = linearMovie();
        movie.setRoi(new Line(5.5, 15.5, 30.5, 15.5));
        Kymograph k = KymographImage.fromImage(run(movie, OPTIONS));
        assertEquals(26, k.positionCount(), "25 px long at 0.2 um = 1 px steps, both ends");
        assertEquals(5, k.frameCount());
        assertEquals(2.0, k.timeS(4), 1e-12, "frame 4 at 4 x 0.5 s");
        for (int f = 0; f < 5; f++) {
            for (int p = 0; p < k.positionCount(); p += 5) {
                double x = 5.5 + p;
                // ImageJ's line coordinates put pixel i's centre at the whole number i, as its own line profiles do
                double expected = 100 + 10 * x + 3 * 15.5 + 50 * f;
                // REF: bilinear interpolation and a symmetric band average reproduce a linear function exactly
                // [common practice]; float image: 1e-3 absolute
                assertEquals(expected, k.value(f, p), 1e-3, "intensity at frame " + f + ", sample " + p);
            }
        }
    }

    @Test
    void segmentedLineEqualsTheExtractorsOwnKymograph(@TempDir Path out) {
        ImagePlus movie = linearMovie();
        Roi roi = new PolygonRoi(new float[] {4.5f, 20.25f, 33.5f}, new float[] {5.5f, 24.0f, 10.5f}, Roi.POLYLINE);
        movie.setRoi(roi);
        ImagePlus image = run(movie, OPTIONS + " save=[" + out + "]");
        Kymograph viaMenu = KymographImage.fromImage(image);

        // the command line's route: the same line saved as a .roi file and read back
        DendritePath path = viaRoiFile(roi, out);
        Extraction core = KymographExtractor.extract(new ImagePlusFrames(movie, 0), path, 0.2, 0.5, 0.6, 0.2,
                Progress.NONE);
        assertArrayEquals(core.kymograph().distancesUm(), viaMenu.distancesUm(), 1e-9, "distances, um");
        assertArrayEquals(core.kymograph().timesS(), viaMenu.timesS(), 1e-12, "times, s");
        // the image holds 32-bit floats
        assertArrayEquals(core.kymograph().values(), viaMenu.values(), 1e-3, "intensities");

        Kymograph saved = KymographCsv.read(out.resolve("linear_kymograph.csv"), "intensity");
        assertArrayEquals(core.kymograph().values(), saved.values(), 1e-9, "saved CSV, intensities");
        assertEquals(true, out.resolve("linear_kymograph.tif").toFile().isFile(), "saved TIFF");
    }

    @Test
    void aVirtualStackGivesTheSameKymographWithoutLoadingTheMovie(@TempDir Path dir) {
        ImagePlus movie = linearMovie();
        Path tif = dir.resolve("movie.tif");
        Kymograph_Along_Line.saveTiff(movie, tif);
        ImagePlus virtual = IJ.openVirtual(tif.toString());
        assertEquals(true, virtual.getStack().isVirtual(), "opened as a virtual stack");
        Roi roi = new PolygonRoi(new float[] {4.5f, 20.25f, 33.5f}, new float[] {5.5f, 24.0f, 10.5f}, Roi.POLYLINE);
        movie.setRoi(roi);
        virtual.setRoi((Roi) roi.clone());
        Kymograph inMemory = KymographImage.fromImage(run(movie, OPTIONS));
        Kymograph fromDisk = KymographImage.fromImage(run(virtual, OPTIONS));
        assertArrayEquals(inMemory.values(), fromDisk.values(), 0, "intensities");
    }

    @Test
    void lineWidthIsTheDefaultBandWidth(@TempDir Path dir) {
        ImagePlus movie = linearMovie();
        Line line = new Line(5.5, 10.5, 30.5, 20.5);
        line.setStrokeWidth(5);
        movie.setRoi(line);
        Kymograph viaMenu = KymographImage.fromImage(run(movie, "lines=[current selection] pixel=0.2 frame=0.5"));
        Extraction core = KymographExtractor.extract(new ImagePlusFrames(movie, 0), viaRoiFile(line, dir), 0.2, 0.5,
                1.0, 0.2, Progress.NONE);
        // 5 px x 0.2 um = 1.0 um band; default step = pixel size
        assertArrayEquals(core.kymograph().values(), viaMenu.values(), 1e-3, "intensities with a 1 um band");
    }
}
