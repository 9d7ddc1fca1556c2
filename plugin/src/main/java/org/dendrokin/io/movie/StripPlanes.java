package org.dendrokin.io.movie;

import java.io.IOException;
import java.io.RandomAccessFile;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.zip.DataFormatException;
import java.util.zip.Inflater;

import ij.io.FileInfo;
import ij.io.ImageReader;
import ij.io.RandomAccessStream;

import org.dendrokin.io.InputException;

/**
 * Planes of a TIFF in strips that cannot be mapped (compressed with LZW, Deflate or PackBits, or of a sample type the
 * map does not handle), each decoded whole by ImageJ's own {@link ImageReader} from a seekable stream over the file.
 * One plane is decoded at a time and kept, so several reads of one frame decode it once; the heap holds one frame.
 *
 * <p>ImageJ's virtual stack is not used for these files: for a compressed TIFF it reads through a memory cache of
 * every byte from the start of the file up to the plane ({@link RandomAccessStream} over a file input stream), so
 * frame k costs k frames of reading and as much heap, and a long movie cannot be read in a modest heap. Here the
 * stream is built over a {@link RandomAccessFile}, which seeks instead. Signed 16-bit samples, which ImageJ shifts by
 * 32768, are shifted back, so the values are those of the file (as {@link MappedPlanes} gives them). Not safe for
 * concurrent readers.
 */
final class StripPlanes implements PlaneStore {
    private final Path file;
    private final FileInfo[] planes;
    private final RandomAccessStream in;
    private final long fileBytes;
    private int cachedPlane = -1;
    private float[] cached;

    /**
     * @param file   the TIFF, opened read-only
     * @param planes ImageJ's description of each plane (offsets, strips, sample type), in file order
     */
    StripPlanes(Path file, FileInfo[] planes) throws IOException {
        this.file = file;
        this.planes = planes.clone();
        this.in = new RandomAccessStream(new RandomAccessFile(file.toFile(), "r"));
        this.fileBytes = Files.size(file);
    }

    private float[] plane(int plane) {
        if (plane != cachedPlane) {
            cachedPlane = -1;
            cached = toFloats(decode(plane), planes[plane].fileType, cached);
            cachedPlane = plane;
        }
        return cached;
    }

    private Object decode(int plane) {
        FileInfo fi = planes[plane];
        Object pixels;
        if (fi.compression > FileInfo.COMPRESSION_NONE) {
            requireStripsInFile(plane, fi);
        }
        if (fi.compression == FileInfo.ZIP || fi.compression == FileInfo.ZIP_WITH_DIFFERENCING) {
            requireInflatable(plane, fi);
        }
        try {
            // uncompressed strips are read from the stream's position, compressed ones from each strip's offset
            in.seek(fi.getOffset());
            pixels = new ImageReader(fi).readPixels(in, 0);
        } catch (IOException | RuntimeException e) {
            throw new InputException(file, "image " + (plane + 1) + " of the movie could not be decoded by ImageJ's "
                    + "TIFF reader (" + MovieLayout.oneLine(e) + ")", e);
        }
        if (pixels == null) {
            throw new InputException(file, "image " + (plane + 1) + " of the movie could not be decoded by ImageJ's "
                    + "TIFF reader (its data end early or are corrupt)");
        }
        return pixels;
    }

    /** Refuses a compressed strip that runs past the end of the file: its reader would allocate its claimed length. */
    private void requireStripsInFile(int plane, FileInfo fi) {
        if (fi.stripOffsets == null || fi.stripLengths == null) {
            return;
        }
        for (int i = 0; i < fi.stripOffsets.length && i < fi.stripLengths.length; i++) {
            long end = (fi.stripOffsets[i] & 0xffffffffL) + (fi.stripLengths[i] & 0xffffffffL);
            if (fi.stripLengths[i] < 0 || end > fileBytes) {
                throw new InputException(file, String.format(Locale.ROOT, "image %d of the movie has a strip of %d"
                        + " bytes at byte %d, past the end of the %d-byte file (the file is cut short or damaged)",
                        plane + 1, fi.stripLengths[i] & 0xffffffffL, fi.stripOffsets[i] & 0xffffffffL, fileBytes));
            }
        }
    }

    /**
     * Refuses a plane whose Deflate strips do not inflate: ImageJ's reader prints the inflater's complaint to standard
     * output and leaves the rest of the plane zero, which would be analysed as data. Each strip is inflated once more
     * here for the check (Deflate decodes at hundreds of MB/s, small beside the analysis).
     */
    private void requireInflatable(int plane, FileInfo fi) {
        if (fi.stripOffsets == null || fi.stripLengths == null) {
            return;
        }
        byte[] sink = new byte[64 * 1024];
        Inflater inflater = new Inflater();
        try {
            for (int i = 0; i < fi.stripOffsets.length && i < fi.stripLengths.length; i++) {
                byte[] strip = new byte[fi.stripLengths[i]];
                in.seek(fi.stripOffsets[i] & 0xffffffffL);
                in.readFully(strip);
                inflater.reset();
                inflater.setInput(strip);
                while (!inflater.finished()) {
                    if (inflater.inflate(sink) == 0 && (inflater.needsInput() || inflater.needsDictionary())) {
                        throw new DataFormatException("the data end before the stream does");
                    }
                }
            }
        } catch (DataFormatException | IOException e) {
            throw new InputException(file, "image " + (plane + 1) + " of the movie is marked Deflate-compressed, but"
                    + " its data do not inflate (" + MovieLayout.oneLine(e) + ")", e);
        } finally {
            inflater.end();
        }
    }

    private float[] toFloats(Object pixels, int fileType, float[] reuse) {
        int n = pixels instanceof byte[] ? ((byte[]) pixels).length : pixels instanceof short[]
                ? ((short[]) pixels).length : pixels instanceof float[] ? ((float[]) pixels).length : -1;
        if (n < 0) {
            throw new InputException(file, "ImageJ decoded the movie's samples to an unexpected type ("
                    + pixels.getClass().getSimpleName() + ")");
        }
        if (pixels instanceof float[]) {
            return (float[]) pixels;
        }
        float[] out = reuse != null && reuse.length == n ? reuse : new float[n];
        if (pixels instanceof byte[]) {
            byte[] b = (byte[]) pixels;
            for (int i = 0; i < n; i++) {
                out[i] = b[i] & 0xff;
            }
        } else {
            short[] s = (short[]) pixels;
            int shift = fileType == FileInfo.GRAY16_SIGNED ? 32768 : 0;
            for (int i = 0; i < n; i++) {
                out[i] = (s[i] & 0xffff) - shift;
            }
        }
        return out;
    }

    @Override
    public void readRows(int plane, int firstRow, int rowCount, float[] dst) {
        int width = planes[plane].width;
        System.arraycopy(plane(plane), firstRow * width, dst, 0, rowCount * width);
    }

    @Override
    public void gather(int plane, int[] pixelIndices, float[] dst) {
        float[] p = plane(plane);
        for (int i = 0; i < pixelIndices.length; i++) {
            dst[i] = p[pixelIndices[i]];
        }
    }

    @Override
    public void close() {
        cached = null;
        try {
            in.close();
        } catch (IOException e) {
            // opened read-only: nothing was written, nothing to lose
        }
    }
}
