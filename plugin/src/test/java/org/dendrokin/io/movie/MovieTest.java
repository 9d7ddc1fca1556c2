package org.dendrokin.io.movie;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.awt.image.WritableRaster;
import java.io.IOException;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;

import javax.imageio.IIOImage;
import javax.imageio.ImageIO;
import javax.imageio.ImageWriteParam;
import javax.imageio.ImageWriter;
import javax.imageio.stream.ImageOutputStream;

import ij.ImagePlus;
import ij.io.FileInfo;
import ij.io.TiffDecoder;
import ij.process.FloatProcessor;

import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.io.InputException;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

class MovieTest {
    @TempDir
    Path dir;

    private static float expected(int bitDepth, int plane, int column, int row) {
        return TestMovies.value(plane, column, row) + (bitDepth == 16 ? 1000 : 0) + (bitDepth == 32 ? 0.25f : 0);
    }

    @ParameterizedTest
    @ValueSource(ints = {8, 16, 32})
    void readsStacksWrittenByImageJ(int bitDepth) {
        ImagePlus imp = TestMovies.stack(bitDepth, 23, 17, 6);
        imp.setDimensions(1, 1, 6);
        TestMovies.calibrate(imp, 0.2, 0.5, "sec");
        Path file = TestMovies.save(imp, dir.resolve("stack" + bitDepth + ".tif"));
        try (Movie movie = Movie.open(file, null, null)) {
            assertEquals(23, movie.width());
            assertEquals(17, movie.height());
            assertEquals(6, movie.frameCount());
            assertEquals(1, movie.channelCount());
            assertEquals(bitDepth, movie.bitDepth());
            FrameSource frames = movie.channel(0);
            float[] rows = frames.readRows(4, 3, 2, new float[2 * 23]);
            float[] picked = frames.gather(5, new int[] {0, 24, 17 * 23 - 1}, new float[3]);
            // REF: the values ImageJ's FileSaver was given for these pixels [common practice]
            assertEquals(expected(bitDepth, 4, 0, 3), rows[0], 0f, "frame 4, row 3, column 0");
            assertEquals(expected(bitDepth, 4, 22, 4), rows[2 * 23 - 1], 0f, "frame 4, row 4, column 22");
            assertEquals(expected(bitDepth, 5, 1, 1), picked[1], 0f, "frame 5, pixel 24");
            assertEquals(expected(bitDepth, 5, 22, 16), picked[2], 0f, "frame 5, last pixel");
            assertTrue(movie.warnings().isEmpty(), movie.warnings().toString());
        }
    }

    @Test
    void takesCalibrationFromTheTiff() {
        ImagePlus imp = TestMovies.stack(16, 8, 8, 4);
        imp.setDimensions(1, 1, 4);
        TestMovies.calibrate(imp, 0.125, 250, "ms");
        Path file = TestMovies.save(imp, dir.resolve("cal.tif"));
        try (Movie movie = Movie.open(file, null, null)) {
            // REF: calibration set through ImageJ's Calibration before FileSaver wrote the file [common practice]
            assertEquals(0.125, movie.pixelSizeUm(), 1e-12, "pixel size (um)");
            assertEquals(0.25, movie.frameIntervalS(), 1e-12, "frame interval (s), from 250 ms");
        }
        try (Movie movie = Movie.open(file, 0.3, 2.0)) {
            assertEquals(0.3, movie.pixelSizeUm(), 0.0, "overridden pixel size (um)");
            assertEquals(2.0, movie.frameIntervalS(), 0.0, "overridden frame interval (s)");
        }
    }

    @Test
    void keepsChannelsOfAHyperstack() {
        ImagePlus imp = TestMovies.stack(16, 10, 9, 2 * 5);
        imp.setDimensions(2, 1, 5);
        imp.setOpenAsHyperStack(true);
        TestMovies.calibrate(imp, 0.5, 1, "sec");
        Path file = TestMovies.save(imp, dir.resolve("hyper.tif"));
        try (Movie movie = Movie.open(file, null, null)) {
            assertEquals(2, movie.channelCount());
            assertEquals(5, movie.frameCount());
            float[] c0 = movie.channel(0).readRows(3, 0, 1, new float[10]);
            float[] c1 = movie.channel(1).readRows(3, 0, 1, new float[10]);
            // REF: ImageJ's hyperstack order, channel fastest: frame t, channel c is image c + 2 t [common practice]
            assertEquals(expected(16, 6, 4, 0), c0[4], 0f, "channel 1, frame 3");
            assertEquals(expected(16, 7, 4, 0), c1[4], 0f, "channel 2, frame 3");
            assertThrows(IllegalArgumentException.class, () -> movie.channel(2));
        }
    }

    @Test
    void readsSlicesAsTimeWithAWarning() {
        ImagePlus imp = TestMovies.stack(8, 6, 6, 7);
        imp.setDimensions(1, 7, 1);
        TestMovies.calibrate(imp, 0.5, 1, "sec");
        Path file = TestMovies.save(imp, dir.resolve("zstack.tif"));
        try (Movie movie = Movie.open(file, null, null)) {
            assertEquals(7, movie.frameCount(), "slices read as frames");
            assertEquals(1, movie.warnings().size());
            assertTrue(movie.warnings().get(0).contains("z-slices"), movie.warnings().get(0));
        }
    }

    @Test
    void readsCompressedTiffsThroughImageJ() throws IOException {
        Path file = dir.resolve("deflate.tif");
        writeWithImageIo(file, "Deflate", 3);
        try (Movie movie = Movie.open(file, 0.2, 0.1)) {
            assertEquals(3, movie.frameCount());
            float[] row = movie.channel(0).readRows(2, 4, 1, new float[12]);
            // REF: the values javax.imageio's TIFF writer was given, decoded by ImageJ [common practice]
            assertEquals(1000 + TestMovies.value(2, 11, 4), row[11], 0f, "frame 2, row 4, column 11");
        }
    }

    @Test
    void convertsLengthAndTimeUnitsAndWarnsAboutNonSquarePixels() {
        ImagePlus imp = TestMovies.stack(16, 8, 8, 3);
        imp.setDimensions(1, 1, 3);
        ij.measure.Calibration c = imp.getCalibration();
        c.setUnit("nm");
        c.pixelWidth = 150;
        c.pixelHeight = 300;
        c.frameInterval = 0.5;
        c.setTimeUnit("min");
        Path file = TestMovies.save(imp, dir.resolve("units.tif"));
        try (Movie movie = Movie.open(file, null, null)) {
            // REF: 1 nm = 1e-3 um, 1 min = 60 s (SI) [common practice]
            // the TIFF keeps the resolution as a ratio of 32-bit integers: ImageJ's rounding is about 1e-4 relative
            assertEquals(0.15, movie.pixelSizeUm(), 2e-4 * 0.15, "pixel size (um) from 150 nm");
            assertEquals(30.0, movie.frameIntervalS(), 1e-12, "frame interval (s) from 0.5 min");
            assertEquals(1, movie.warnings().size(), movie.warnings().toString());
            assertTrue(movie.warnings().get(0).contains("not square"), movie.warnings().get(0));
        }
    }

    @Test
    void refusesColourAndFourDimensionalMovies() {
        ij.ImageStack rgb = new ij.ImageStack(6, 6);
        for (int i = 0; i < 3; i++) {
            rgb.addSlice(new ij.process.ColorProcessor(6, 6));
        }
        Path colour = TestMovies.save(new ImagePlus("rgb", rgb), dir.resolve("rgb.tif"));
        InputException e = assertThrows(InputException.class, () -> Movie.open(colour, 0.2, 0.1));
        assertTrue(e.getMessage().startsWith(colour.toString()) && e.getMessage().contains("colour"), e.getMessage());

    }

    @Test
    void aZStackOverTimeGivesEachPlaneAndTheProjections() {
        ImagePlus zt = TestMovies.stack(16, 6, 6, 3 * 4);
        zt.setDimensions(1, 3, 4);
        zt.setOpenAsHyperStack(true);
        Path fourD = TestMovies.save(zt, dir.resolve("zt.tif"));
        try (Movie movie = Movie.open(fourD, 0.2, 0.1)) {
            assertEquals(3, movie.zSlices(), "focal planes");
            assertEquals(4, movie.frameCount(), "time points");
            float[] plane = new float[36];
            float[] max = movie.projected(0, "max").readRows(2, 0, 6, new float[36]);
            float[] mean = movie.projected(0, "mean").readRows(2, 0, 6, new float[36]);
            float[] expectedMax = new float[36];
            float[] expectedMean = new float[36];
            java.util.Arrays.fill(expectedMax, Float.NEGATIVE_INFINITY);
            for (int z = 0; z < 3; z++) {
                // REF: ImageJ's own stack order, channel fastest, then slice, then frame (ImagePlus.getStackIndex) [common practice]
                ij.process.ImageProcessor ip = zt.getStack().getProcessor(zt.getStackIndex(1, z + 1, 3));
                movie.slice(0, z).readRows(2, 0, 6, plane);
                for (int i = 0; i < 36; i++) {
                    assertEquals(ip.getf(i), plane[i], 0, "plane " + z + " pixel " + i);
                    expectedMax[i] = Math.max(expectedMax[i], ip.getf(i));
                    expectedMean[i] += ip.getf(i) / 3f;
                }
            }
            assertArrayEquals(expectedMax, max, 0f, "maximum projection");
            assertArrayEquals(expectedMean, mean, 1e-3f, "mean projection");
        }
    }

    @Test
    void refusesATruncatedTiff() throws IOException {
        ImagePlus imp = TestMovies.stack(16, 20, 10, 12);
        TestMovies.calibrate(imp, 0.5, 1, "sec");
        Path file = TestMovies.save(imp, dir.resolve("cut.tif"));
        long planeBytes = 20 * 10 * 2;
        long firstImage = new TiffDecoder(dir + "/", "cut.tif").getTiffInfo()[0].getOffset();
        try (FileChannel ch = FileChannel.open(file, StandardOpenOption.WRITE)) {
            // ImageJ writes the other images' directories after the pixels: cut inside the pixels of image 9
            ch.truncate(firstImage + 8 * planeBytes + 100);
        }
        InputException e = assertThrows(InputException.class, () -> Movie.open(file, null, null));
        assertTrue(e.getMessage().startsWith(file.toString()), e.getMessage());
        assertTrue(e.getMessage().contains("promises 12 images") && e.getMessage().contains("only 8 complete"),
                e.getMessage());
    }

    @Test
    void refusesATruncatedTiffFromAnotherWriter() throws IOException {
        Path file = dir.resolve("imageio.tif");
        writeWithImageIo(file, null, 4);
        FileInfo[] info = new TiffDecoder(dir + "/", "imageio.tif").getTiffInfo();
        assertEquals(4, info.length, "images in the intact file");
        Path cutInPixels = Files.copy(file, dir.resolve("cut-pixels.tif"));
        Path cutInDirectories = Files.copy(file, dir.resolve("cut-directories.tif"));
        try (FileChannel ch = FileChannel.open(cutInPixels, StandardOpenOption.WRITE)) {
            ch.truncate(info[3].getOffset() + 50);  // inside the last image's pixels
        }
        try (FileChannel ch = FileChannel.open(cutInDirectories, StandardOpenOption.WRITE)) {
            ch.truncate(info[1].getOffset() + 20);  // the second image's pixels and every later directory
        }
        for (Path cut : new Path[] {cutInPixels, cutInDirectories}) {
            InputException e = assertThrows(InputException.class, () -> Movie.open(cut, 0.2, 0.1));
            assertTrue(e.getMessage().startsWith(cut.toString()) && e.getMessage().contains("truncated"),
                    e.getMessage());
        }
    }

    /** Writes 12 x 5 16-bit images with javax.imageio's TIFF writer; compression null means none. */
    private static void writeWithImageIo(Path file, String compression, int images) throws IOException {
        ImageWriter writer = ImageIO.getImageWritersByFormatName("tiff").next();
        try (ImageOutputStream out = ImageIO.createImageOutputStream(file.toFile())) {
            writer.setOutput(out);
            ImageWriteParam param = writer.getDefaultWriteParam();
            if (compression == null) {
                param.setCompressionMode(ImageWriteParam.MODE_DISABLED);
            } else {
                param.setCompressionMode(ImageWriteParam.MODE_EXPLICIT);
                param.setCompressionType(compression);
            }
            writer.prepareWriteSequence(null);
            for (int p = 0; p < images; p++) {
                BufferedImage image = new BufferedImage(12, 5, BufferedImage.TYPE_USHORT_GRAY);
                WritableRaster raster = image.getRaster();
                for (int y = 0; y < 5; y++) {
                    for (int x = 0; x < 12; x++) {
                        raster.setSample(x, y, 0, 1000 + TestMovies.value(p, x, y));
                    }
                }
                writer.writeToSequence(new IIOImage(image, null, null), param);
            }
            writer.endWriteSequence();
        } finally {
            writer.dispose();
        }
    }

    @Test
    void readsUncompressedTiffsFromAnotherWriter() throws IOException {
        Path file = dir.resolve("plain-imageio.tif");
        writeWithImageIo(file, null, 3);
        try (Movie movie = Movie.open(file, 0.2, 0.1)) {
            assertEquals(3, movie.frameCount());
            float[] row = movie.channel(0).readRows(1, 2, 1, new float[12]);
            // REF: the values javax.imageio's TIFF writer was given, at the offsets ImageJ's decoder found [common practice]
            assertEquals(1000 + TestMovies.value(1, 7, 2), row[7], 0f, "frame 1, row 2, column 7");
        }
    }

    @Test
    void refusesAFileThatIsNotATiff() throws IOException {
        Path file = Files.writeString(dir.resolve("movie.tif"), "time,intensity\n0,1\n");
        InputException e = assertThrows(InputException.class, () -> Movie.open(file, 1.0, 1.0));
        assertTrue(e.getMessage().startsWith(file.toString()) && e.getMessage().contains("not a TIFF"),
                e.getMessage());
        Path empty = Files.createFile(dir.resolve("empty.tif"));
        assertThrows(InputException.class, () -> Movie.open(empty, 1.0, 1.0));
        InputException missing = assertThrows(InputException.class,
                () -> Movie.open(dir.resolve("absent.tif"), 1.0, 1.0));
        assertTrue(missing.getMessage().contains("does not exist"), missing.getMessage());
    }

    @Test
    void asksForTheMissingCalibrationKey() {
        ImagePlus imp = TestMovies.stack(16, 8, 8, 3);
        Path file = TestMovies.save(imp, dir.resolve("plain.tif"));
        InputException both = assertThrows(InputException.class, () -> Movie.open(file, null, null));
        assertTrue(both.getMessage().startsWith(file.toString()), both.getMessage());
        assertTrue(both.getMessage().contains("\"pixel_size_um\" and \"frame_interval_s\""), both.getMessage());
        InputException interval = assertThrows(InputException.class, () -> Movie.open(file, 0.2, null));
        assertTrue(interval.getMessage().contains("set \"frame_interval_s\" in session.json"), interval.getMessage());
        try (Movie movie = Movie.open(file, 0.2, 0.05)) {
            assertEquals(3, movie.frameCount());
        }
    }

    @Test
    void refusesANaNFilledMovie() {
        FloatProcessor fp = new FloatProcessor(9, 9);
        fp.setValue(Double.NaN);
        fp.fill();
        ImagePlus imp = new ImagePlus("nan", fp);
        ij.ImageStack stack = new ij.ImageStack(9, 9);
        for (int i = 0; i < 4; i++) {
            stack.addSlice(fp.duplicate());
        }
        imp.setStack(stack);
        Path file = TestMovies.save(imp, dir.resolve("nan.tif"));
        InputException e = assertThrows(InputException.class, () -> Movie.open(file, 0.2, 0.1));
        assertTrue(e.getMessage().startsWith(file.toString()) && e.getMessage().contains("only NaN"), e.getMessage());
    }
}
