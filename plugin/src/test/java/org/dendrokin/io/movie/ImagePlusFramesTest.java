package org.dendrokin.io.movie;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;

import ij.IJ;
import ij.ImagePlus;
import ij.process.ColorProcessor;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class ImagePlusFramesTest {
    @TempDir
    Path dir;

    @Test
    void readsOneChannelOfAHyperstack() {
        ImagePlus imp = TestMovies.stack(16, 11, 7, 3 * 4);
        imp.setDimensions(3, 1, 4);
        ImagePlusFrames frames = new ImagePlusFrames(imp, 2);
        assertEquals(4, frames.frameCount());
        float[] row = frames.readRows(1, 6, 1, new float[11]);
        float[] picked = frames.gather(3, new int[] {5}, new float[1]);
        // REF: ImageJ's hyperstack order, channel fastest: channel c of frame t is image c + 3 t [common practice]
        assertEquals(1000 + TestMovies.value(2 + 3, 10, 6), row[10], 0f, "channel 3, frame 1, (10, 6)");
        assertEquals(1000 + TestMovies.value(2 + 9, 5, 0), picked[0], 0f, "channel 3, frame 3, (5, 0)");
    }

    @Test
    void readsAVirtualStackPlaneByPlane() {
        ImagePlus imp = TestMovies.stack(8, 9, 5, 6);
        Path file = TestMovies.save(imp, dir.resolve("virtual.tif"));
        ImagePlus virtual = IJ.openVirtual(file.toString());
        assertTrue(virtual.getStack().isVirtual(), "opened as a virtual stack");
        ImagePlusFrames frames = new ImagePlusFrames(virtual, 0);
        assertTrue(frames.slicesAreTime(), "a plain stack's slices are time points");
        assertEquals(6, frames.frameCount());
        float[] rows = frames.readRows(4, 2, 3, new float[27]);
        // REF: the values ImageJ's FileSaver was given [common practice]
        assertEquals(TestMovies.value(4, 8, 4), rows[26], 0f, "frame 4, (8, 4)");
    }

    @Test
    void refusesColourImages() {
        ImagePlus rgb = new ImagePlus("rgb", new ColorProcessor(4, 4));
        assertThrows(IllegalArgumentException.class, () -> new ImagePlusFrames(rgb, 0));
    }
}
