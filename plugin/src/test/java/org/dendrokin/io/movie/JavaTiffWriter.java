package org.dendrokin.io.movie;

import java.awt.color.ColorSpace;
import java.awt.image.BufferedImage;
import java.awt.image.ColorModel;
import java.awt.image.ComponentColorModel;
import java.awt.image.DataBuffer;
import java.awt.image.WritableRaster;
import java.io.IOException;
import java.nio.ByteOrder;
import java.nio.file.Path;

import javax.imageio.IIOImage;
import javax.imageio.ImageIO;
import javax.imageio.ImageTypeSpecifier;
import javax.imageio.ImageWriteParam;
import javax.imageio.ImageWriter;
import javax.imageio.metadata.IIOMetadata;
import javax.imageio.metadata.IIOMetadataNode;
import javax.imageio.plugins.tiff.BaselineTIFFTagSet;
import javax.imageio.plugins.tiff.TIFFDirectory;
import javax.imageio.plugins.tiff.TIFFField;
import javax.imageio.plugins.tiff.TIFFTag;
import javax.imageio.stream.ImageOutputStream;

/** Grey movies written by Java's own TIFF writer (javax.imageio), as other programs' TIFF libraries write them. */
final class JavaTiffWriter {
    private JavaTiffWriter() {
    }

    /**
     * Writes images[i][0] (row by row, {@code width} a row) as image i.
     *
     * @param bits        8 (unsigned), 16 (unsigned) or 32 (floating point)
     * @param compression a compression type of Java's writer ("LZW", "Deflate", "ZLib", "PackBits"), null for none
     * @param tiled       16 x 16 pixel tiles instead of strips
     * @param predictor   horizontal differencing (Java's writer applies it to 8-bit samples only)
     * @param description the first image's ImageDescription (one byte a character), or null
     */
    static Path write(int width, int height, Path file, int bits, String compression, boolean tiled, ByteOrder order,
            boolean predictor, String description, double[][][] images) throws IOException {
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
            if (tiled) {
                param.setTilingMode(ImageWriteParam.MODE_EXPLICIT);
                param.setTiling(16, 16, 0, 0);
            }
            IIOMetadata stream = writer.getDefaultStreamMetadata(param);
            IIOMetadataNode root = new IIOMetadataNode("javax_imageio_tiff_stream_1.0");
            IIOMetadataNode byteOrder = new IIOMetadataNode("ByteOrder");
            byteOrder.setAttribute("value", order.toString());
            root.appendChild(byteOrder);
            stream.setFromTree("javax_imageio_tiff_stream_1.0", root);
            writer.prepareWriteSequence(stream);
            for (int i = 0; i < images.length; i++) {
                BufferedImage image = grey(width, height, bits, images[i][0]);
                IIOMetadata metadata = writer.getDefaultImageMetadata(new ImageTypeSpecifier(image), param);
                TIFFDirectory tags = TIFFDirectory.createFromMetadata(metadata);
                BaselineTIFFTagSet base = BaselineTIFFTagSet.getInstance();
                tags.addTIFFField(new TIFFField(base.getTag(BaselineTIFFTagSet.TAG_PREDICTOR), predictor ? 2 : 1));
                if (description != null && i == 0) {
                    tags.addTIFFField(new TIFFField(base.getTag(BaselineTIFFTagSet.TAG_IMAGE_DESCRIPTION),
                            TIFFTag.TIFF_ASCII, 1, new String[] {description}));
                }
                writer.writeToSequence(new IIOImage(image, null, tags.getAsMetadata()), param);
            }
            writer.endWriteSequence();
        } finally {
            writer.dispose();
        }
        return file;
    }

    private static BufferedImage grey(int width, int height, int bits, double[] values) {
        int type = bits == 8 ? DataBuffer.TYPE_BYTE : bits == 16 ? DataBuffer.TYPE_USHORT : DataBuffer.TYPE_FLOAT;
        ColorModel cm = new ComponentColorModel(ColorSpace.getInstance(ColorSpace.CS_GRAY), false, false,
                ColorModel.OPAQUE, type);
        WritableRaster r = cm.createCompatibleWritableRaster(width, height);
        for (int p = 0; p < values.length; p++) {
            r.setSample(p % width, p / width, 0, (float) values[p]);
        }
        return new BufferedImage(cm, r, false, null);
    }
}
