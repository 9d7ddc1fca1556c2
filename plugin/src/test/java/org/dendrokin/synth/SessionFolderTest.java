package org.dendrokin.synth;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.path.PathFiles;
import org.dendrokin.io.session.SessionConfig;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import ij.IJ;
import ij.ImagePlus;
import ij.gui.Roi;
import ij.io.RoiDecoder;
import ij.measure.Calibration;
import ij.process.ImageProcessor;

/** A written session folder, read back by ImageJ and by the project's own readers. */
class SessionFolderTest {
    @TempDir
    Path dir;

    @Test
    void imageJReadsTheHyperstackItsCalibrationAndThePathBack() throws IOException {
        SessionSpec spec = SessionSpec.realistic(8).withChannels(SessionSpec.Channels.twoStructuralFirst())
                .withImaging(SessionSpec.Imaging.standard().withFrames(12).withSlices(3, 0.5));
        SessionGenerator.Rendering r = SessionGenerator.render(spec);
        SessionGenerator.Written w = SessionGenerator.write(spec, dir);
        // REF: ImageJ's own TIFF reader and ROI decoder (IJ.openImage, RoiDecoder) [common practice]
        ImagePlus imp = IJ.openImage(w.movie().toString());
        assertEquals(2, imp.getNChannels(), "channels");
        assertEquals(3, imp.getNSlices(), "slices");
        assertEquals(12, imp.getNFrames(), "frames");
        assertEquals(16, imp.getBitDepth(), "bit depth");
        Calibration cal = imp.getCalibration();
        assertEquals(0.2, cal.pixelWidth, 1e-12, "pixel width (um)");
        assertEquals(0.2, cal.pixelHeight, 1e-12, "pixel height (um)");
        assertEquals(0.5, cal.pixelDepth, 1e-12, "slice step (um)");
        assertEquals("micron", cal.getUnit());
        assertEquals(0.5, cal.frameInterval, 1e-12, "frame interval (s)");
        assertEquals("sec", cal.getTimeUnit());
        for (int[] czt : new int[][] {{0, 0, 0}, {1, 2, 7}, {1, 1, 11}}) {
            ImageProcessor ip = imp.getStack().getProcessor(imp.getStackIndex(czt[0] + 1, czt[1] + 1, czt[2] + 1));
            assertArrayEquals(r.recorded()[r.plane(czt[0], czt[1], czt[2])], (short[]) ip.getPixels(),
                    "plane c, z, t = " + java.util.Arrays.toString(czt));
        }
        Roi roi = RoiDecoder.open(w.roi().toString());
        assertEquals(Roi.POLYLINE, roi.getType(), "ROI type");
        assertEquals("dendrite", roi.getName());
        float[] xs = roi.getFloatPolygon().xpoints;
        float[] ys = roi.getFloatPolygon().ypoints;
        Truth.DrawnPath path = r.truth().path();
        for (int i = 0; i < path.xPx().length; i++) {
            assertEquals(path.roiXPx()[i], xs[i], 1e-4, "stored x of vertex " + i);
            assertEquals(path.roiYPx()[i], ys[i], 1e-4, "stored y of vertex " + i);
        }
        // The project's reader puts the stored line back into our convention.
        DendritePath read = PathFiles.read(w.roi(), null);
        assertArrayEquals(path.xPx(), read.xPx(), 1e-4, "path x read by PathFiles (pixels)");
        assertArrayEquals(path.yPx(), read.yPx(), 1e-4, "path y read by PathFiles (pixels)");
    }

    @Test
    void sessionJsonAndTruthJsonSayWhatWasMade() throws IOException {
        SessionSpec spec = SessionSpec.realistic(12).withChannels(SessionSpec.Channels.twoSignalFirst())
                .withImaging(SessionSpec.Imaging.standard().withFrames(30).withLinePeriod(0.002))
                .withPath(SessionSpec.DrawnPath.freehand());
        SessionGenerator.Written w = SessionGenerator.write(spec, dir);
        SessionConfig config = SessionConfig.read(dir);
        Truth truth = w.truth();
        assertEquals(SessionGenerator.MOVIE, config.movie());
        assertEquals(SessionGenerator.ROI, config.path());
        assertEquals(truth.stimulus().timeS(), config.stimulusTimeS(), 0, "stimulus time (s)");
        assertEquals(truth.stimulus().pathPositionUm(), config.stimulusPositionUm(), 1e-12, "stimulus position (um)");
        assertEquals(java.util.List.of("diffusion-decay"), config.models());
        assertEquals(truth.movie().signalChannel(), config.acquisition().channel(), "signal channel");
        assertEquals(truth.movie().structuralChannel(), config.acquisition().structuralChannel(),
                "structural channel");
        assertEquals(Roi.FREELINE, RoiDecoder.open(w.roi().toString()).getType(), "ROI type");

        Truth back = Truth.read(dir.resolve(SessionGenerator.TRUTH));
        assertEquals(truth.signal(), back.signal());
        assertEquals(truth.stimulus(), back.stimulus());
        assertEquals(truth.spines(), back.spines());
        assertEquals(1, back.movie().signalChannel());
        assertEquals(2, back.movie().structuralChannel());
        assertEquals(0.002, back.movie().linePeriodS(), 0);
        assertTrue(Files.readString(dir.resolve(SessionGenerator.TRUTH)).contains("\"d_um2_per_s\""));
    }

    @Test
    void theSameSpecGivesTheSameBytesAndAnotherSeedDoesNot(@TempDir Path other, @TempDir Path third)
            throws IOException {
        SessionSpec spec = SessionSpec.realistic(31).withImaging(SessionSpec.Imaging.standard().withFrames(20));
        SessionGenerator.write(spec, dir);
        SessionGenerator.write(spec, other);
        SessionGenerator.write(spec.withSeed(32), third);
        for (String name : new String[] {SessionGenerator.MOVIE, SessionGenerator.ROI, SessionGenerator.TRUTH}) {
            assertArrayEquals(Files.readAllBytes(dir.resolve(name)), Files.readAllBytes(other.resolve(name)), name);
        }
        assertNotEquals(Files.readString(dir.resolve(SessionGenerator.TRUTH)),
                Files.readString(third.resolve(SessionGenerator.TRUTH)));
    }

    @Test
    void imageJsLineProfileRunsAlongTheAxisOnTheStoredCoordinates() {
        // A straight dendrite with its axis on the border of two pixel rows, the path drawn exactly on it.
        SessionSpec spec = SessionSpec.clean(2).withOptics(SessionSpec.Optics.sigma(0.17))
                .withCamera(SessionSpec.Camera.noiseless(1000))
                .withImaging(SessionSpec.Imaging.standard().withFrames(3));
        SessionGenerator.Rendering r = SessionGenerator.render(spec);
        ImageProcessor ip = r.image().getStack().getProcessor(1);
        ip.setInterpolate(true);
        double[] x = r.truth().path().roiXPx();
        double[] y = r.truth().path().roiYPx();
        // REF: ImageJ ImageProcessor.getLine, ImageJ's own line profile sampling [common practice]
        double on = mean(ip.getLine(x[0], y[0], x[1], y[1]));
        // ImageJ interpolates linearly between pixel centres at whole coordinates, so lines less than half a pixel
        // apart between the same two rows give the same profile; 0.75 pixel off reaches the next pair of rows.
        double above = mean(ip.getLine(x[0], y[0] - 0.75, x[1], y[1] - 0.75));
        double below = mean(ip.getLine(x[0], y[0] + 0.75, x[1], y[1] + 0.75));
        assertTrue(on > 1.01 * above && on > 1.01 * below, "the profile along the stored line is the brightest");
        assertEquals(above, below, 1e-6 * on, "0.75 pixel to either side gives the same profile");
    }

    private static double mean(double[] v) {
        double s = 0;
        for (double d : v) {
            s += d;
        }
        return s / v.length;
    }
}
