package org.dendrokin.io.movie;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;

import javax.imageio.plugins.tiff.BaselineTIFFTagSet;

import ij.ImagePlus;
import ij.ImageStack;
import ij.Prefs;
import ij.io.FileSaver;
import ij.process.ByteProcessor;
import ij.process.FloatProcessor;
import ij.process.ImageProcessor;
import ij.process.ShortProcessor;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.kymo.KymographExtractor;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.InputException;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The same small movie written as the TIFF variants users bring (compressed, tiled, either byte order, planar,
 * several samples a pixel) by Java's TIFF writer, ImageJ's writer and a small writer of our own for what neither
 * writes. Each variant must give the plain file's kymograph (through {@link Movie#open} and the extractor, as the
 * analysis reads a movie) or be refused with one sentence naming the file and the reason.
 */
class TiffVariantsTest {
    private static final int WIDTH = 41;
    private static final int HEIGHT = 29;
    private static final int FRAMES = 5;
    private static final double PIXEL_UM = 0.2;
    private static final double FRAME_S = 0.5;
    private static final double BAND_UM = 0.6;
    /** A bent path with sub-pixel vertices across the frame, so every sample interpolates between pixels. */
    private static final DendritePath PATH = DendritePath.of(new double[] {3.3, 20.7, 37.2},
            new double[] {4.6, 22.1, 9.8}, false);

    @TempDir
    Path dir;

    /**
     * The value written at (x, y) of sample s of image i: the full range of 8- and 16-bit samples, and for 32 bits
     * floating-point values whose low mantissa bits matter.
     */
    static double value(int bits, int image, int sample, int x, int y) {
        switch (bits) {
            case 8:
                return (37 * image + 11 * x + 7 * y + x * y + 90 * sample) % 256;
            case 16:
                return (40000 + 977 * image + 613 * x * (y % 5) + 59 * y + 7001 * sample) % 65536;
            default:
                return (float) (1000 * Math.sin(0.3 * x + 0.2 * y + 0.5 * image + sample) + 1e-3 * x * y - 0.1 * image);
        }
    }

    private static double[][][] images(int bits, int samples) {
        double[][][] v = new double[FRAMES][samples][WIDTH * HEIGHT];
        for (int i = 0; i < FRAMES; i++) {
            for (int s = 0; s < samples; s++) {
                for (int y = 0; y < HEIGHT; y++) {
                    for (int x = 0; x < WIDTH; x++) {
                        v[i][s][y * WIDTH + x] = value(bits, i, s, x, y);
                    }
                }
            }
        }
        return v;
    }

    /** The plain file: sample {@code sample} of the images, uncompressed, written by ImageJ's FileSaver. */
    private Path plain(int bits, int sample) {
        return imageJ(dir.resolve("plain-" + bits + "-" + sample + ".tif"), bits, sample, null);
    }

    private static Path imageJ(Path file, int bits, int sample, String description) {
        return imageJ(file, bits, sample, description, FRAMES);
    }

    /** Writes {@code images} images of sample {@code sample} with ImageJ's FileSaver, with the given description. */
    private static Path imageJ(Path file, int bits, int sample, String description, int images) {
        ImageStack stack = new ImageStack(WIDTH, HEIGHT);
        for (int i = 0; i < images; i++) {
            ImageProcessor ip = bits == 8 ? new ByteProcessor(WIDTH, HEIGHT)
                    : bits == 16 ? new ShortProcessor(WIDTH, HEIGHT) : new FloatProcessor(WIDTH, HEIGHT);
            for (int y = 0; y < HEIGHT; y++) {
                for (int x = 0; x < WIDTH; x++) {
                    ip.setf(x, y, (float) value(bits, i, sample, x, y));
                }
            }
            stack.addSlice(ip);
        }
        ImagePlus imp = new ImagePlus("movie", stack);
        FileSaver saver = description == null ? new FileSaver(imp) : new FileSaver(imp) {
            @Override
            public String getDescriptionString() {
                return description;
            }
        };
        if (!saver.saveAsTiff(file.toString())) {
            throw new IllegalStateException("ImageJ could not write " + file);
        }
        return file;
    }

    private static Kymograph kymograph(Path file, int channel) {
        try (Movie movie = Movie.open(file, PIXEL_UM, FRAME_S)) {
            // the call the session runner makes: band width from session.json, one sample a pixel size
            return KymographExtractor.extract(movie.channel(channel), PATH, movie.pixelSizeUm(),
                    movie.frameIntervalS(), BAND_UM, movie.pixelSizeUm(), Progress.NONE).kymograph();
        }
    }

    private static void assertSameKymograph(Kymograph expected, Kymograph actual, String what) {
        assertEquals(expected.frameCount(), actual.frameCount(), what + ": frames");
        assertEquals(expected.positionCount(), actual.positionCount(), what + ": positions");
        double scale = 0;
        for (double v : expected.values()) {
            scale = Math.max(scale, Math.abs(v));
        }
        double[] e = expected.values();
        double[] a = actual.values();
        for (int i = 0; i < e.length; i++) {
            assertEquals(e[i], a[i], 1e-6 * scale, what + ": kymograph value " + i);
        }
        assertEquals(expected.nanCount(), actual.nanCount(), what + ": NaN samples");
    }

    /** Every pixel of every frame and channel as the writer was given it. */
    private static void assertPixels(Path file, int bits, int samples, String what) {
        try (Movie movie = Movie.open(file, PIXEL_UM, FRAME_S)) {
            assertEquals(samples, movie.channelCount(), what + ": channels");
            assertEquals(FRAMES, movie.frameCount(), what + ": frames");
            assertEquals(bits, movie.bitDepth(), what + ": bit depth");
            float[] frame = new float[WIDTH * HEIGHT];
            for (int s = 0; s < samples; s++) {
                for (int i = 0; i < FRAMES; i++) {
                    movie.channel(s).readRows(i, 0, HEIGHT, frame);
                    for (int p = 0; p < frame.length; p++) {
                        // REF: the values the TIFF writer was given [common practice]
                        assertEquals((float) value(bits, i, s, p % WIDTH, p / WIDTH), frame[p], 0f,
                                what + ": channel " + s + ", frame " + i + ", pixel " + p);
                    }
                }
            }
        }
    }

    private static InputException assertRefused(Path file, String... words) {
        InputException e = assertThrows(InputException.class, () -> Movie.open(file, PIXEL_UM, FRAME_S));
        String m = e.getMessage();
        assertTrue(m.startsWith(file + ": "), "names the file: " + m);
        assertFalse(m.contains("\n"), "one line: " + m);
        assertTrue(m.endsWith(".") && m.indexOf(". ") < 0, "one sentence: " + m);
        for (String w : words) {
            assertTrue(m.contains(w), "says \"" + w + "\": " + m);
        }
        return e;
    }

    // ---- Java's TIFF writer (javax.imageio): every compression it writes, strips and tiles, both byte orders

    static Stream<Arguments> javaWriterVariants() {
        List<Arguments> out = new ArrayList<>();
        for (int bits : new int[] {8, 16, 32}) {
            for (String compression : new String[] {null, "LZW", "Deflate", "ZLib", "PackBits"}) {
                for (boolean tiled : new boolean[] {false, true}) {
                    for (ByteOrder order : new ByteOrder[] {ByteOrder.BIG_ENDIAN, ByteOrder.LITTLE_ENDIAN}) {
                        out.add(Arguments.of(bits, compression, tiled, order));
                    }
                }
            }
        }
        return out.stream();
    }

    @ParameterizedTest(name = "{0}-bit, {1}, tiled {2}, {3}")
    @MethodSource("javaWriterVariants")
    void javaWriterVariantsGiveThePlainKymograph(int bits, String compression, boolean tiled, ByteOrder order)
            throws IOException {
        String what = String.format(Locale.ROOT, "%d-bit %s %s %s", bits, compression, tiled ? "tiles" : "strips",
                order);
        Path file = JavaTiffWriter.write(WIDTH, HEIGHT, dir.resolve(what.replace(' ', '-') + ".tif"), bits,
                compression, tiled, order, false, null, images(bits, 1));
        assertPixels(file, bits, 1, what);
        assertSameKymograph(kymograph(plain(bits, 0), 0), kymograph(file, 0), what);
    }

    @ParameterizedTest(name = "8-bit, {0} with predictor 2")
    @ValueSource(strings = {"LZW", "Deflate"})
    void eightBitPredictorFilesFromJavaGiveThePlainKymograph(String compression) throws IOException {
        for (boolean tiled : new boolean[] {false, true}) {
            String what = "8-bit " + compression + " predictor 2 " + (tiled ? "tiles" : "strips");
            Path file = JavaTiffWriter.write(WIDTH, HEIGHT, dir.resolve(what.replace(' ', '-') + ".tif"), 8,
                    compression, tiled, ByteOrder.LITTLE_ENDIAN, true, null, images(8, 1));
            assertPixels(file, 8, 1, what);
            assertSameKymograph(kymograph(plain(8, 0), 0), kymograph(file, 0), what);
        }
    }

    @Test
    void jpegIsReadWithAWarningThatItIsLossy() throws IOException {
        double[][][] smooth = new double[FRAMES][1][WIDTH * HEIGHT];
        for (int i = 0; i < FRAMES; i++) {
            for (int p = 0; p < WIDTH * HEIGHT; p++) {
                smooth[i][0][p] = 100 + 2 * (p % WIDTH) + (p / WIDTH) + 3 * i;
            }
        }
        Path file = JavaTiffWriter.write(WIDTH, HEIGHT, dir.resolve("jpeg.tif"), 8, "JPEG", false,
                ByteOrder.LITTLE_ENDIAN, false, null, smooth);
        try (Movie movie = Movie.open(file, PIXEL_UM, FRAME_S)) {
            assertEquals(FRAMES, movie.frameCount());
            assertTrue(movie.warnings().stream().anyMatch(w -> w.contains("JPEG-compressed")),
                    movie.warnings().toString());
            float[] px = movie.channel(0).gather(2, new int[] {14 * WIDTH + 20}, new float[1]);
            // a smooth ramp survives JPEG at the writer's default quality to within a few grey levels
            assertEquals(smooth[2][0][14 * WIDTH + 20], px[0], 4.0, "pixel (20, 14) of frame 2");
        }
    }

    // ---- ImageJ's own writer: both byte orders

    @ParameterizedTest(name = "{0}-bit")
    @ValueSource(ints = {8, 16, 32})
    void imageJLittleEndianGivesThePlainKymograph(int bits) {
        boolean before = Prefs.intelByteOrder;
        Path file;
        try {
            Prefs.intelByteOrder = true;
            file = imageJ(dir.resolve("intel-" + bits + ".tif"), bits, 0, null);
        } finally {
            Prefs.intelByteOrder = before;
        }
        assertPixels(file, bits, 1, "ImageJ little-endian");
        assertSameKymograph(kymograph(plain(bits, 0), 0), kymograph(file, 0), "ImageJ little-endian " + bits);
    }

    // ---- our small writer: predictors ImageJ undoes, the planar configuration, several samples a pixel

    @ParameterizedTest(name = "{0}-bit")
    @ValueSource(ints = {8, 16})
    void deflateWithPredictor2OnIntegersGivesThePlainKymograph(int bits) throws IOException {
        for (ByteOrder order : new ByteOrder[] {ByteOrder.BIG_ENDIAN, ByteOrder.LITTLE_ENDIAN}) {
            String what = bits + "-bit Deflate predictor 2 " + order;
            SmallTiffWriter.Format f = SmallTiffWriter.Format.of(bits, 1).compressed(SmallTiffWriter.DEFLATE, 2)
                    .order(order);
            Path file = SmallTiffWriter.write(dir.resolve(what.replace(' ', '-') + ".tif"), f, WIDTH, HEIGHT,
                    images(bits, 1));
            assertPixels(file, bits, 1, what);
            assertSameKymograph(kymograph(plain(bits, 0), 0), kymograph(file, 0), what);
        }
    }

    @ParameterizedTest(name = "{0}-bit")
    @ValueSource(ints = {8, 16, 32})
    void severalSamplesAPixelAreChannels(int bits) throws IOException {
        int format = bits == 32 ? 3 : 1;
        for (int planar : new int[] {1, 2}) {
            for (int compression : new int[] {SmallTiffWriter.NONE, SmallTiffWriter.DEFLATE}) {
                String what = String.format(Locale.ROOT, "%d-bit, 2 samples, planar configuration %d, compression %d",
                        bits, planar, compression);
                SmallTiffWriter.Format f = SmallTiffWriter.Format.of(bits, format).samples(2, planar)
                        .compressed(compression, 1).order(ByteOrder.BIG_ENDIAN);
                Path file = SmallTiffWriter.write(dir.resolve("samples-" + bits + "-" + planar + "-" + compression
                        + ".tif"), f, WIDTH, HEIGHT, images(bits, 2));
                assertPixels(file, bits, 2, what);
                for (int s = 0; s < 2; s++) {
                    assertSameKymograph(kymograph(plain(bits, s), 0), kymograph(file, s), what + ", channel " + s);
                }
            }
        }
    }

    @Test
    void signedSixteenBitSamplesKeepTheirSignCompressedOrNot() throws IOException {
        double[][][] signed = images(16, 1);
        for (double[][] image : signed) {
            for (int p = 0; p < image[0].length; p++) {
                image[0][p] -= 40000;  // -40000 .. 25535: both signs
            }
        }
        SmallTiffWriter.Format plainSigned = SmallTiffWriter.Format.of(16, 2).order(ByteOrder.BIG_ENDIAN);
        Path plainFile = SmallTiffWriter.write(dir.resolve("signed.tif"), plainSigned, WIDTH, HEIGHT, signed);
        Path deflate = SmallTiffWriter.write(dir.resolve("signed-deflate.tif"),
                plainSigned.compressed(SmallTiffWriter.DEFLATE, 2), WIDTH, HEIGHT, signed);
        for (Path file : new Path[] {plainFile, deflate}) {
            try (Movie movie = Movie.open(file, PIXEL_UM, FRAME_S)) {
                float[] px = movie.channel(0).gather(3, new int[] {0, 11 * WIDTH + 30}, new float[2]);
                // REF: the signed values the writer was given [common practice]
                assertEquals(signed[3][0][0], px[0], 0.0, file.getFileName() + ", pixel 0");
                assertEquals(signed[3][0][11 * WIDTH + 30], px[1], 0.0, file.getFileName() + ", pixel (30, 11)");
            }
        }
        assertSameKymograph(kymograph(plainFile, 0), kymograph(deflate, 0), "signed 16-bit, Deflate predictor 2");
    }

    @Test
    void planarConfigurationWithOneSampleIsPlain() throws IOException {
        SmallTiffWriter.Format f = SmallTiffWriter.Format.of(16, 1).samples(1, 2).order(ByteOrder.BIG_ENDIAN);
        Path file = SmallTiffWriter.write(dir.resolve("planar-one.tif"), f, WIDTH, HEIGHT, images(16, 1));
        assertPixels(file, 16, 1, "planar, one sample");
        assertSameKymograph(kymograph(plain(16, 0), 0), kymograph(file, 0), "planar, one sample");
    }

    // ---- refused, with the reason

    @Test
    void floatingPointPredictorIsRefused() throws IOException {
        SmallTiffWriter.Format f = SmallTiffWriter.Format.of(32, 3).compressed(SmallTiffWriter.DEFLATE, 3);
        Path file = SmallTiffWriter.write(dir.resolve("float-deflate-predictor3.tif"), f, WIDTH, HEIGHT,
                images(32, 1));
        assertRefused(file, "Deflate", "floating-point predictor (TIFF predictor 3)", "save the movie uncompressed");
    }

    @Test
    void predictor2On32BitSamplesIsRefused() throws IOException {
        SmallTiffWriter.Format f = SmallTiffWriter.Format.of(32, 3).compressed(SmallTiffWriter.DEFLATE, 2);
        Path deflate = SmallTiffWriter.write(dir.resolve("float-deflate-predictor2.tif"), f, WIDTH, HEIGHT,
                images(32, 1));
        assertRefused(deflate, "32-bit", "Deflate", "horizontal differencing (TIFF predictor 2)", "ImageJ decodes "
                + "wrongly");

        // Java's writer applies no predictor to 32-bit samples: give it rows already differenced (as 32-bit words),
        // then mark the file as predicted. Rows rise from left to right, so each difference is a small positive
        // word, stored exactly as a (subnormal) float.
        double[][][] differenced = new double[FRAMES][1][WIDTH * HEIGHT];
        for (int i = 0; i < FRAMES; i++) {
            for (int y = 0; y < HEIGHT; y++) {
                int previous = 0;
                for (int x = 0; x < WIDTH; x++) {
                    int bitsOf = Float.floatToRawIntBits((float) (100 + 1.5 * x + 0.1 * y + i));
                    differenced[i][0][y * WIDTH + x] = Float.intBitsToFloat(bitsOf - previous);
                    previous = bitsOf;
                }
            }
        }
        Path lzw = JavaTiffWriter.write(WIDTH, HEIGHT, dir.resolve("float-lzw-predictor2.tif"), 32, "LZW", false,
                ByteOrder.BIG_ENDIAN, false, null, differenced);
        setShortTag(lzw, BaselineTIFFTagSet.TAG_PREDICTOR, 2);
        assertRefused(lzw, "32-bit", "LZW", "TIFF predictor 2");
    }

    @Test
    void compressionNeitherReaderKnowsIsRefused() throws IOException {
        SmallTiffWriter.Format f = SmallTiffWriter.Format.of(16, 1).compressed(50000, 1);
        Path file = SmallTiffWriter.write(dir.resolve("zstd.tif"), f, WIDTH, HEIGHT, images(16, 1));
        assertRefused(file, "Zstandard (50000)", "neither ImageJ nor Java's TIFF reader");
    }

    @Test
    void halfPrecisionFloatIsRefused() throws IOException {
        SmallTiffWriter.Format f = SmallTiffWriter.Format.of(16, 3);
        Path file = SmallTiffWriter.write(dir.resolve("half.tif"), f, WIDTH, HEIGHT, images(16, 1));
        assertRefused(file, "16-bit floating-point");
    }

    @Test
    void tiledFileWithPredictor2On16BitSamplesIsRefused() throws IOException {
        // Java's writer writes 16-bit tiles without a predictor; marking them predicted makes the file this layout
        Path file = JavaTiffWriter.write(WIDTH, HEIGHT, dir.resolve("tiles-16-predictor2.tif"), 16, "Deflate", true,
                ByteOrder.LITTLE_ENDIAN, false, null, images(16, 1));
        setShortTag(file, BaselineTIFFTagSet.TAG_PREDICTOR, 2);
        assertRefused(file, "16-bit", "in tiles", "TIFF predictor 2");
    }

    // ---- OME-TIFF metadata

    private static final String OME_NS = "http://www.openmicroscopy.org/Schemas/OME/2016-06";

    @Test
    void omeMetadataFromImageJsWriterGivesCalibrationChannelsAndOrder() {
        // Two channels at two time points in four 16-bit images written time-first: image i holds channel i / 2 at
        // time point i % 2. The OME dimension order XYZTC (z fastest, then t, then c) says exactly that.
        String xml = "<?xml version=\"1.0\" encoding=\"UTF-8\"?>"
                + "<OME xmlns=\"" + OME_NS + "\"><Image ID=\"Image:0\"><Pixels ID=\"Pixels:0\" DimensionOrder=\"XYZTC\""
                + " Type=\"uint16\" SizeX=\"" + WIDTH + "\" SizeY=\"" + HEIGHT + "\" SizeZ=\"1\" SizeC=\"2\" "
                + "SizeT=\"2\" PhysicalSizeX=\"130\" PhysicalSizeXUnit=\"nm\" "
                + "PhysicalSizeY=\"130\" PhysicalSizeYUnit=\"nm\" TimeIncrement=\"250\" TimeIncrementUnit=\"ms\">"
                + "<Channel ID=\"Channel:0:0\" Name=\"GCaMP\" SamplesPerPixel=\"1\"/>"
                + "<Channel ID=\"Channel:0:1\" Name=\"tdTomato\" SamplesPerPixel=\"1\"/>"
                + "<TiffData/></Pixels></Image></OME>";
        Path file = imageJ(dir.resolve("ome-imagej.tif"), 16, 0, xml, 4);
        try (Movie movie = Movie.open(file, null, null)) {
            // REF: 130 nm = 0.130 um and 250 ms = 0.250 s, converted by hand (SI prefixes) [common practice]
            assertEquals(0.130, movie.pixelSizeUm(), 1e-12, "pixel size (um) from PhysicalSizeX 130 nm");
            assertEquals(0.250, movie.frameIntervalS(), 1e-12, "frame interval (s) from TimeIncrement 250 ms");
            assertEquals(List.of("GCaMP", "tdTomato"), movie.channelNames());
            assertEquals(2, movie.channelCount());
            assertEquals(2, movie.frameCount());
            float[] px = new float[1];
            for (int c = 0; c < 2; c++) {
                for (int t = 0; t < 2; t++) {
                    movie.channel(c).gather(t, new int[] {7 * WIDTH + 13}, px);
                    // REF: OME dimension order XYZTC places (c, t) at image t + 2 c [published: OME data model]
                    assertEquals(value(16, t + 2 * c, 0, 13, 7), px[0], 0f, "channel " + c + ", time " + t);
                }
            }
        }
        try (Movie movie = Movie.open(file, 0.3, 2.0)) {
            assertEquals(0.3, movie.pixelSizeUm(), 0.0, "session.json overrides the OME pixel size");
            assertEquals(2.0, movie.frameIntervalS(), 0.0, "session.json overrides the OME time increment");
        }
    }

    @Test
    void omeMetadataInUtf8WithTiffDataAndDefaultUnitsInATiledFile() throws IOException {
        // UTF-8 micro sign, planes placed by TiffData elements in reverse order of the file, default time unit (s)
        StringBuilder tiffData = new StringBuilder();
        for (int t = 0; t < FRAMES; t++) {
            tiffData.append("<TiffData FirstT=\"").append(t).append("\" IFD=\"").append(FRAMES - 1 - t)
                    .append("\" PlaneCount=\"1\"/>");
        }
        String xml = "<?xml version=\"1.0\" encoding=\"UTF-8\"?><OME xmlns=\"" + OME_NS + "\" UUID=\"urn:uuid:1\">"
                + "<Image ID=\"Image:0\"><Pixels ID=\"Pixels:0\" DimensionOrder=\"XYCZT\" Type=\"float\" SizeX=\""
                + WIDTH + "\" SizeY=\"" + HEIGHT + "\" SizeZ=\"1\" SizeC=\"1\" SizeT=\"" + FRAMES + "\" "
                + "PhysicalSizeX=\"0.25\" PhysicalSizeXUnit=\"\u00b5m\" PhysicalSizeY=\"0.25\" "
                + "PhysicalSizeYUnit=\"\u00b5m\" TimeIncrement=\"1.5\"><Channel ID=\"Channel:0:0\" Name=\"F\u00e9\"/>"
                + tiffData + "</Pixels></Image></OME>";
        double[][][] reversed = new double[FRAMES][][];
        double[][][] forward = images(32, 1);
        for (int i = 0; i < FRAMES; i++) {
            reversed[i] = forward[FRAMES - 1 - i];
        }
        SmallTiffWriter.Format f = SmallTiffWriter.Format.of(32, 3)
                .description(xml.getBytes(java.nio.charset.StandardCharsets.UTF_8));
        Path file = SmallTiffWriter.write(dir.resolve("ome-utf8.tif"), f, WIDTH, HEIGHT, reversed);
        try (Movie movie = Movie.open(file, null, null)) {
            // REF: OME's default TimeIncrementUnit is s; 0.25 um is already in um [published: OME schema 2016-06]
            assertEquals(0.25, movie.pixelSizeUm(), 1e-12, "pixel size (um)");
            assertEquals(1.5, movie.frameIntervalS(), 1e-12, "frame interval (s)");
            assertEquals(List.of("F\u00e9"), movie.channelNames());
            assertTrue(movie.warnings().isEmpty(), movie.warnings().toString());
        }
        assertPixels(file, 32, 1, "OME TiffData in reverse order");
    }

    @Test
    void omeMetadataInATiledFileFromJavasWriter() throws IOException {
        String xml = "<OME xmlns=\"" + OME_NS + "\"><Image ID=\"Image:0\"><Pixels ID=\"Pixels:0\" "
                + "DimensionOrder=\"XYCZT\" Type=\"uint8\" SizeX=\"" + WIDTH + "\" SizeY=\"" + HEIGHT
                + "\" SizeZ=\"1\" SizeC=\"1\" SizeT=\"" + FRAMES + "\" PhysicalSizeX=\"0.0004\" "
                + "PhysicalSizeXUnit=\"mm\" "
                + "TimeIncrement=\"2\" TimeIncrementUnit=\"min\"><TiffData/></Pixels></Image></OME>";
        Path file = JavaTiffWriter.write(WIDTH, HEIGHT, dir.resolve("ome-tiled.tif"), 8, "LZW", true,
                ByteOrder.BIG_ENDIAN, false, xml, images(8, 1));
        try (Movie movie = Movie.open(file, null, null)) {
            // REF: 0.0004 mm = 0.4 um and 2 min = 120 s, converted by hand [common practice]
            assertEquals(0.4, movie.pixelSizeUm(), 1e-12, "pixel size (um)");
            assertEquals(120, movie.frameIntervalS(), 1e-12, "frame interval (s)");
            assertEquals(FRAMES, movie.frameCount());
        }
        assertSameKymograph(kymograph(plain(8, 0), 0), kymograph(file, 0), "tiled OME-TIFF");
    }

    @Test
    void omeMetadataProblemsAreRefusedOrReported() throws IOException {
        String pixels = "<Pixels ID=\"Pixels:0\" DimensionOrder=\"XYCZT\" Type=\"uint16\" SizeX=\"" + WIDTH
                + "\" SizeY=\"" + HEIGHT + "\" SizeZ=\"1\" SizeC=\"1\" SizeT=\"" + FRAMES + "\"";
        String otherFile = "<OME xmlns=\"" + OME_NS + "\" UUID=\"urn:uuid:a\"><Image ID=\"Image:0\">" + pixels + ">"
                + "<TiffData IFD=\"0\" PlaneCount=\"2\"><UUID FileName=\"here.ome.tif\">urn:uuid:a</UUID></TiffData>"
                + "<TiffData IFD=\"0\" FirstT=\"2\" PlaneCount=\"3\"><UUID FileName=\"there.ome.tif\">urn:uuid:b</UUID>"
                + "</TiffData></Pixels></Image></OME>";
        assertRefused(imageJ(dir.resolve("multi-file.tif"), 16, 0, otherFile), "multi-file OME-TIFF");

        String gap = "<OME xmlns=\"" + OME_NS + "\"><Image ID=\"Image:0\">" + pixels + "><TiffData IFD=\"0\" "
                + "PlaneCount=\"3\"/></Pixels></Image></OME>";
        assertRefused(imageJ(dir.resolve("gap.tif"), 16, 0, gap), "no image for channel 1, z-slice 1, time point 4");

        String beyond = "<OME xmlns=\"" + OME_NS + "\"><Image ID=\"Image:0\">" + pixels.replace("SizeT=\"5\"",
                "SizeT=\"7\"") + "><TiffData/></Pixels></Image></OME>";
        assertRefused(imageJ(dir.resolve("beyond.tif"), 16, 0, beyond), "truncated", "holds only 5");

        String broken = "<OME xmlns=\"" + OME_NS + "\"><Image ID=\"Image:0\">" + pixels + " PhysicalSizeX=\"3\" "
                + "PhysicalSizeXUnit=\"thou\"><TiffData/></Pixels></Image></OME>";
        Path thou = imageJ(dir.resolve("thou.tif"), 16, 0, broken);
        InputException noPixel = assertThrows(InputException.class, () -> Movie.open(thou, null, 1.0));
        assertTrue(noPixel.getMessage().contains("set \"pixel_size_um\""), noPixel.getMessage());
        try (Movie movie = Movie.open(thou, 0.2, 1.0)) {
            assertTrue(movie.warnings().stream().anyMatch(w -> w.contains("\"thou\"")), movie.warnings().toString());
        }

        String malformed = "<OME xmlns=\"" + OME_NS + "\"><Image ID=\"Image:0\">" + pixels + "></Image></OME>";
        try (Movie movie = Movie.open(imageJ(dir.resolve("malformed.tif"), 16, 0, malformed), 0.2, 1.0)) {
            assertEquals(FRAMES, movie.frameCount(), "read as a plain stack");
            assertTrue(movie.warnings().stream().anyMatch(w -> w.contains("could not be read as XML")),
                    movie.warnings().toString());
        }

        String external = "<!DOCTYPE OME [<!ENTITY x SYSTEM \"file:///etc/hostname\">]><OME xmlns=\"" + OME_NS
                + "\"><Image ID=\"Image:0\">" + pixels + "><Channel Name=\"&x;\"/><TiffData/></Pixels></Image></OME>";
        try (Movie movie = Movie.open(imageJ(dir.resolve("entity.tif"), 16, 0, external), 0.2, 1.0)) {
            assertEquals(List.of(""), movie.channelNames(), "no entity is resolved");
            assertTrue(movie.warnings().stream().anyMatch(w -> w.contains("could not be read as XML")),
                    movie.warnings().toString());
        }
    }

    /** Sets a SHORT tag that each image directory already has, in place. */
    private static void setShortTag(Path file, int tag, int value) throws IOException {
        try (FileChannel ch = FileChannel.open(file, StandardOpenOption.READ, StandardOpenOption.WRITE)) {
            ByteBuffer b = ByteBuffer.allocate(12);
            ch.read(b, 0);
            ByteOrder order = b.get(0) == 'I' ? ByteOrder.LITTLE_ENDIAN : ByteOrder.BIG_ENDIAN;
            b.order(order);
            long ifd = b.getInt(4) & 0xffffffffL;
            int found = 0;
            while (ifd != 0) {
                b.clear().limit(2);
                ch.read(b, ifd);
                int entries = b.getShort(0) & 0xffff;
                for (int e = 0; e < entries; e++) {
                    b.clear();
                    ch.read(b, ifd + 2 + 12L * e);
                    if ((b.getShort(0) & 0xffff) == tag) {
                        ByteBuffer v = ByteBuffer.allocate(2).order(order).putShort((short) value);
                        ch.write(v.flip(), ifd + 2 + 12L * e + 8);
                        found++;
                    }
                }
                b.clear().limit(4);
                ch.read(b, ifd + 2 + 12L * entries);
                ifd = b.getInt(0) & 0xffffffffL;
            }
            assertTrue(found > 0, "tag " + tag + " present");
        }
    }
}
