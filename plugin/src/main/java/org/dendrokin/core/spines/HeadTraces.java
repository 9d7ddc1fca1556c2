package org.dendrokin.core.spines;

import java.util.Arrays;
import java.util.List;
import java.util.TreeSet;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.FrameSource;

/**
 * The mean intensity of a small disc around each spine head in every frame, streamed from the movie one frame at
 * a time through {@link FrameSource#gather}, so that only the heads' pixels are read. A disc holds the pixels whose
 * centres lie within its radius of the head's centre (at least the pixel that holds the centre), inside the image.
 */
final class HeadTraces {
    private HeadTraces() {
    }

    /**
     * The pixels of a disc, as row-major indices in ascending order.
     *
     * @param xPx      centre x, ImageJ pixel coordinates
     * @param yPx      centre y
     * @param radiusPx radius, pixels
     */
    static int[] disc(double xPx, double yPx, double radiusPx, int width, int height) {
        TreeSet<Integer> pixels = new TreeSet<>();
        int c0 = (int) Math.floor(xPx - radiusPx - 1);
        int c1 = (int) Math.ceil(xPx + radiusPx + 1);
        int r0 = (int) Math.floor(yPx - radiusPx - 1);
        int r1 = (int) Math.ceil(yPx + radiusPx + 1);
        for (int row = Math.max(0, r0); row <= Math.min(height - 1, r1); row++) {
            for (int col = Math.max(0, c0); col <= Math.min(width - 1, c1); col++) {
                if (Math.hypot(col + 0.5 - xPx, row + 0.5 - yPx) <= radiusPx) {
                    pixels.add(row * width + col);
                }
            }
        }
        int col = (int) Math.floor(xPx);
        int row = (int) Math.floor(yPx);
        if (col >= 0 && row >= 0 && col < width && row < height) {
            pixels.add(row * width + col);
        }
        return pixels.stream().mapToInt(Integer::intValue).toArray();
    }

    /**
     * The mean of each disc in every frame.
     *
     * @param frames   the movie's analysed channel
     * @param discs    each disc's pixels (from {@link #disc}); a disc without pixels gives NaN
     * @param progress reports one unit a frame; checked for cancellation
     * @return {@code means[spine][frame]}, grey values
     */
    static double[][] means(FrameSource frames, List<int[]> discs, Progress progress) {
        int[] all = discs.stream().flatMapToInt(Arrays::stream).sorted().distinct().toArray();
        int[][] slots = new int[discs.size()][];
        for (int s = 0; s < discs.size(); s++) {
            int[] d = discs.get(s);
            slots[s] = new int[d.length];
            for (int i = 0; i < d.length; i++) {
                slots[s][i] = Arrays.binarySearch(all, d[i]);
            }
        }
        int nt = frames.frameCount();
        double[][] out = new double[discs.size()][nt];
        float[] buffer = new float[all.length];
        for (int f = 0; f < nt; f++) {
            progress.checkCancelled();
            if (all.length > 0) {
                frames.gather(f, all, buffer);
            }
            for (int s = 0; s < slots.length; s++) {
                double sum = 0;
                for (int k : slots[s]) {
                    sum += buffer[k];
                }
                out[s][f] = slots[s].length > 0 ? sum / slots[s].length : Double.NaN;
            }
            progress.report("measuring spine heads", f + 1, nt);
        }
        return out;
    }
}
