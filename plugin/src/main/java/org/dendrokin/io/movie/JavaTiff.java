package org.dendrokin.io.movie;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Path;
import java.util.Iterator;

import javax.imageio.ImageIO;
import javax.imageio.ImageReadParam;
import javax.imageio.ImageReader;
import javax.imageio.metadata.IIOMetadata;
import javax.imageio.plugins.tiff.TIFFDirectory;
import javax.imageio.spi.IIORegistry;
import javax.imageio.spi.ImageReaderSpi;
import javax.imageio.stream.ImageInputStream;

/**
 * A TIFF file open in Java's own TIFF reader (the {@code javax.imageio} TIFF plug-in of the JDK, Java 9 and
 * later). It reads tiled files and files with several samples a pixel, which ImageJ's reader does not. The file is
 * read through a file-backed stream: one image directory, and one image when asked, at a time; nothing else is
 * kept. Not safe for concurrent use.
 */
final class JavaTiff implements AutoCloseable {
    /** The JDK's reader; another TIFF plug-in on the class path (as in some ImageJ installations) is not used. */
    private static final String JDK_READER = "com.sun.imageio.plugins.tiff.TIFFImageReader";

    private final ImageInputStream input;
    private final ImageReader reader;
    private final ImageReadParam param;

    private JavaTiff(ImageInputStream input, ImageReader reader) {
        this.input = input;
        this.reader = reader;
        this.param = reader.getDefaultReadParam();
    }

    /**
     * Opens the file.
     *
     * @throws IOException if the file cannot be opened or the JDK's TIFF reader is missing
     */
    static JavaTiff open(Path file) throws IOException {
        ImageReader reader = jdkReader();
        ImageInputStream input = ImageIO.createImageInputStream(file.toFile());
        if (input == null) {
            reader.dispose();
            throw new IOException("no image stream for the file");
        }
        reader.setInput(input, false, false);
        return new JavaTiff(input, reader);
    }

    private static ImageReader jdkReader() throws IOException {
        Iterator<ImageReaderSpi> providers = IIORegistry.getDefaultInstance()
                .getServiceProviders(ImageReaderSpi.class, true);
        while (providers.hasNext()) {
            ImageReaderSpi spi = providers.next();
            if (JDK_READER.equals(spi.getPluginClassName())) {
                return spi.createReaderInstance();
            }
        }
        throw new IOException("Java's TIFF reader is not available in this Java installation");
    }

    /** The tags of image directory {@code image} (0-based). */
    TiffTags tags(int image) throws IOException {
        IIOMetadata metadata = reader.getImageMetadata(image);
        if (metadata == null) {
            throw new IOException("the reader gave no TIFF tags for image " + (image + 1));
        }
        return TiffTags.of(TIFFDirectory.createFromMetadata(metadata));
    }

    /** Number of images in the file's chain of image directories. */
    int imageCount() throws IOException {
        return reader.getNumImages(true);
    }

    /**
     * Decodes image {@code image} (0-based) whole, into {@code destination} when it is not null (it must be what
     * an earlier call returned for an image of the same kind).
     */
    BufferedImage read(int image, BufferedImage destination) throws IOException {
        param.setDestination(destination);
        return reader.read(image, param);
    }

    @Override
    public void close() {
        reader.dispose();
        try {
            input.close();
        } catch (IOException e) {
            // a read-only stream: nothing was written, nothing to lose
        }
    }
}
