package org.dendrokin.core.motion;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CompletionException;
import java.util.concurrent.ForkJoinPool;
import java.util.concurrent.atomic.AtomicInteger;

import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.kymo.KymographExtractor;
import org.dendrokin.core.path.DendritePath;

/**
 * Measures the rigid translation of every frame of a movie against a reference image, and extracts a kymograph along
 * a path that moves with it. The movie is read one frame at a time, a small window of each, and never copied.
 *
 * <p>Window. Motion is measured in one window of at most {@link MotionSettings#windowPx()} pixels a side near the
 * path: the path's bounding box widened by the largest shift looked for, clamped to the image. If that region is
 * larger than the window, the window is placed where the reference has the most structure (the largest sum of
 * squared central differences, weighted by the window's taper), and outside the stimulus region when one is given.
 * A stimulus region that still overlaps the window is faded out of it ({@link StimulusRegion#weight}). The window
 * is tapered to zero at its edges by a Tukey window (a flat top over the middle half, half cosines over a quarter
 * at each end).
 *
 * <p>Reference. The mean, pixel by pixel, of the baseline frames (those before the stimulus): a time average, so
 * single-frame noise does not enter it, and free of the response by construction. Pass the structural channel if
 * there is one; with only the signal channel the response changes the frames after the stimulus, which the
 * whitened phase correlation ({@link PhaseCorrelation}) weighs by structure, not by brightness, so that a focal
 * rise does not read as motion.
 *
 * <p>Following the content. Frames are taken in blocks of 64. Each block is read in the window moved by the
 * whole-pixel part of the last shift measured, so that the shift measured in the window (the residual) stays near zero
 * and little of the content leaves the tapered window: the tapered edges stay in place while the content moves, which
 * would bias a large shift towards zero (by about 0.03 pixel for a 2.7 pixel drift in a 64 pixel window in our tests,
 * against 0.007 pixel when following). A frame whose residual exceeds 2 pixels (a jump) is measured again with the
 * window moved onto the content. The search range {@link MotionSettings#maxShiftPx()} therefore limits the jump from
 * one block to the next, not the total drift; the window stays inside the image.
 *
 * <p>Each frame's shift is measured by {@link PhaseCorrelation}; a running median over
 * {@link MotionSettings#smoothingFrames()} frames may then smooth the trace. The cost is one 2-D real transform and
 * one partial inverse of the window's size a frame (about 0.09 ms at 64 x 64 on one core of the reference machine).
 * Frames are read in order on the calling thread (a frame source need not be thread-safe); the transforms of a block
 * run in parallel on the common fork-join pool, each thread with its own scratch. The result does not depend on the
 * number of threads. {@link #measureAndExtract} also samples a kymograph along the moving path, each block of
 * frames while the next block's transforms run.
 */
public final class MotionCorrection {
    /** Standard deviation of the correlation peak (the Gaussian weighting of the spectrum), pixels. */
    static final double PEAK_SIGMA_PX = 1.5;
    /** Fraction of the window over which the Tukey taper falls to zero (half at each end). */
    static final double TUKEY_ALPHA = 0.5;
    /** Peak height below which a frame's measurement is counted as unreliable. */
    public static final double MIN_PEAK_HEIGHT = 0.2;
    /**
     * Residual shift, pixels, beyond which a frame is measured a second time with the window moved onto the content.
     * Below it, the window only follows the content from the next block of frames on.
     */
    private static final int RETRACK_PX = 2;
    /** Frames read, then measured in parallel, at a time; the window follows the content from block to block. */
    private static final int BLOCK_FRAMES = 64;
    /** Frames of the baseline averaged to choose where the window goes. */
    private static final int PLACEMENT_FRAMES = 8;
    /** Candidate window positions tried at most. */
    private static final int PLACEMENT_CANDIDATES = 4096;

    private MotionCorrection() {
    }

    /**
     * Measures the translation of every frame against the mean of the baseline frames, as described in the class
     * comment.
     *
     * @param frames        the channel to measure on (the structural channel if there is one, else the signal).
     *                      Not modified.
     * @param box           region the path occupies, ImageJ pixel coordinates, e.g. {@link PixelBox#around}
     * @param baselineFirst first frame of the reference, 0-based
     * @param baselineLast  last frame of the reference, 0-based, inclusive, at least {@code baselineFirst}
     * @param stimulus      where the stimulus changes the signal, or null if unknown or not wanted
     * @param settings      window, search range, smoothing, units and warning threshold
     * @param progress      receives one report a block of frames; checked for cancellation as often
     * @return the shift of every frame, in pixels and um, with its quality and warnings
     * @throws IllegalArgumentException for a baseline outside the movie, a box that misses the image, or an image
     *                                  smaller than 16 pixels a side
     * @throws Progress.CancelledException if the user cancelled
     */
    public static MotionTrace measure(FrameSource frames, PixelBox box, int baselineFirst, int baselineLast,
            StimulusRegion stimulus, MotionSettings settings, Progress progress) {
        return run(frames, box, baselineFirst, baselineLast, stimulus, settings, null, progress);
    }

    /**
     * The motion and the kymograph along the moving path.
     *
     * @param trace      the measured motion
     * @param extraction the kymograph of the channel asked for, along the path moved by the measured shifts
     */
    public record Corrected(MotionTrace trace, Extraction extraction) {
    }

    /**
     * Measures the motion as {@link #measure} does and extracts a channel's kymograph along the moving path as
     * {@link #extract} does, with the same results; without smoothing the extraction of each block of frames runs
     * while the next block's transforms do, so the two cost little more than the measurement alone. All reading
     * is done on the calling thread.
     *
     * @param frames         the channel to measure on. Not modified.
     * @param box            region the path occupies, ImageJ pixel coordinates
     * @param baselineFirst  first frame of the reference, 0-based
     * @param baselineLast   last frame of the reference, 0-based, inclusive
     * @param stimulus       where the stimulus changes the signal, or null
     * @param settings       window, search range, smoothing, units and warning threshold
     * @param channel        the channel to extract (may be {@code frames}). Not modified.
     * @param path           the path as drawn on the reference, ImageJ pixel coordinates
     * @param frameIntervalS time between frames, s
     * @param bandWidthUm    width of the band averaged across the path, um
     * @param stepUm         spacing of the samples along the path, um
     * @param progress       receives one report a block of frames; checked for cancellation as often
     */
    public static Corrected measureAndExtract(FrameSource frames, PixelBox box, int baselineFirst, int baselineLast,
            StimulusRegion stimulus, MotionSettings settings, FrameSource channel, DendritePath path,
            double frameIntervalS, double bandWidthUm, double stepUm, Progress progress) {
        Checks.require(channel.frameCount() == frames.frameCount(), "the channel to extract has "
                + channel.frameCount() + " frames, the one measured " + frames.frameCount());
        if (settings.smoothingFrames() > 1) {
            // a smoothed shift needs the frames after it: measure first
            MotionTrace trace = measure(frames, box, baselineFirst, baselineLast, stimulus, settings, progress);
            return new Corrected(trace, extract(channel, path, trace, settings.pixelSizeUm(), frameIntervalS,
                    bandWidthUm, stepUm, progress));
        }
        KymographExtractor.MovingPath moving = new KymographExtractor.MovingPath(channel, path,
                settings.pixelSizeUm(), frameIntervalS, bandWidthUm, stepUm);
        MotionTrace trace = run(frames, box, baselineFirst, baselineLast, stimulus, settings, moving, progress);
        return new Corrected(trace, moving.result());
    }

    /** The measurement; with {@code moving} not null, each measured block of frames is sampled along it. */
    private static MotionTrace run(FrameSource frames, PixelBox box, int baselineFirst, int baselineLast,
            StimulusRegion stimulus, MotionSettings settings, KymographExtractor.MovingPath moving,
            Progress progress) {
        int width = frames.width();
        int height = frames.height();
        int frameCount = frames.frameCount();
        Checks.require(frameCount > 0, "the movie has no frames");
        Checks.require(baselineFirst >= 0 && baselineFirst <= baselineLast && baselineLast < frameCount,
                "the reference frames " + baselineFirst + " to " + baselineLast + " are not within the movie's "
                        + frameCount + " frames");
        Checks.require(width >= 16 && height >= 16, "motion is measured only in images of at least 16 x 16 pixels, "
                + "not " + width + " x " + height);

        Window window = Window.place(frames, box, baselineFirst, baselineLast, stimulus, settings);
        int maxShift = Math.min(settings.maxShiftPx(), Math.min(window.nx, window.ny) / 4);
        PhaseCorrelation correlation = new PhaseCorrelation(window.width, window.height, window.weights, window.nx,
                window.ny, PEAK_SIGMA_PX, maxShift);

        int[] pixels = window.pixelIndices(width);
        correlation.reference(meanTile(frames, pixels, baselineFirst, baselineLast, progress));
        Tracking tracking = new Tracking(frames, window, pixels, correlation);
        int previous = 0;
        for (int start = 0; start < frameCount; start += BLOCK_FRAMES) {
            progress.checkCancelled();
            int count = Math.min(BLOCK_FRAMES, frameCount - start);
            int from = previous;
            int to = start;
            // the frames measured in the last block are sampled while this block's transforms run
            tracking.block(start, count, moving == null ? () -> { } : () -> moving.sample(from, to, tracking.dx,
                    tracking.dy));
            previous = start;
            progress.report("Measuring motion", start + count, frameCount);
        }
        if (moving != null) {
            moving.sample(previous, frameCount, tracking.dx, tracking.dy);
        }

        double[] smoothX = runningMedian(tracking.dx, settings.smoothingFrames());
        double[] smoothY = runningMedian(tracking.dy, settings.smoothingFrames());
        MotionTrace.Reference reference = new MotionTrace.Reference(baselineFirst, baselineLast, window.x, window.y,
                window.width, window.height, window.stimulusFadedOut);
        MotionTrace trace = new MotionTrace(smoothX, smoothY, tracking.dx, tracking.dy, tracking.peaks,
                tracking.atLimit, settings.pixelSizeUm(), settings.warningThresholdUm(), reference, List.of());
        return trace.withWarnings(warnings(trace, settings, maxShift));
    }

    /**
     * Extracts a kymograph as {@link KymographExtractor#extract} does, with the path moved in each frame by that
     * frame's shift, so that it stays on the same structure while the image moves.
     *
     * @param frames         the movie channel to sample. Not modified.
     * @param path           the path as drawn on the reference, ImageJ pixel coordinates
     * @param trace          the shift of every frame, one per frame of {@code frames}
     * @param pixelSizeUm    pixel size, um
     * @param frameIntervalS time between frames, s
     * @param bandWidthUm    width of the band averaged across the path, um
     * @param stepUm         spacing of the samples along the path, um
     * @param progress       receives one report a frame; checked for cancellation once a frame
     * @return the kymograph, the count of samples outside the image and the sample centres on the reference
     */
    public static Extraction extract(FrameSource frames, DendritePath path, MotionTrace trace, double pixelSizeUm,
            double frameIntervalS, double bandWidthUm, double stepUm, Progress progress) {
        Checks.require(trace.frameCount() == frames.frameCount(), "the motion trace has " + trace.frameCount()
                + " frames, the movie " + frames.frameCount());
        return KymographExtractor.extract(frames, path, pixelSizeUm, frameIntervalS, bandWidthUm, stepUm,
                trace.dxPx(), trace.dyPx(), progress);
    }

    /** The pixel-by-pixel mean of the window over frames first..last. */
    private static double[] meanTile(FrameSource frames, int[] pixels, int first, int last, Progress progress) {
        float[] tile = new float[pixels.length];
        double[] mean = new double[pixels.length];
        for (int f = first; f <= last; f++) {
            progress.checkCancelled();
            frames.gather(f, pixels, tile);
            for (int i = 0; i < tile.length; i++) {
                mean[i] += tile[i];
            }
        }
        int count = last - first + 1;
        for (int i = 0; i < mean.length; i++) {
            mean[i] /= count;
        }
        return mean;
    }

    private static List<String> warnings(MotionTrace trace, MotionSettings settings, int maxShift) {
        List<String> out = new ArrayList<>();
        if (trace.exceedsThreshold()) {
            String rule = settings.bandWidthUm() >= settings.pixelSizeUm() ? "a quarter of the band width"
                    : "a quarter of a pixel";
            out.add(String.format(Locale.ROOT, "The image moved by up to %.2f um (RMS %.2f um) against %s, more "
                    + "than %.2f um (%s): structures can move in and out of the band unless the motion is corrected.",
                    trace.maxShiftUm(), trace.rmsShiftUm(), trace.reference().describe(), trace.warningThresholdUm(),
                    rule));
        }
        double[] peaks = trace.peakHeights();
        int weak = 0;
        for (double p : peaks) {
            if (!(p >= MIN_PEAK_HEIGHT)) {
                weak++;
            }
        }
        if (weak > 0) {
            out.add(String.format(Locale.ROOT, "The motion of %d of %d frames could not be measured reliably (their "
                    + "correlation with the reference peaked below %.2f of a perfect match); their shifts may be "
                    + "wrong.", weak, peaks.length, MIN_PEAK_HEIGHT));
        }
        if (trace.framesAtLimit() > 0) {
            out.add(String.format(Locale.ROOT, "In %d frames the measured shift reached the largest shift looked "
                    + "for (%d pixels); the motion may be larger than measured.", trace.framesAtLimit(), maxShift));
        }
        return out;
    }

    /**
     * Running median over {@code width} frames centred on each frame (fewer at the ends).
     *
     * @param v     values. Not modified.
     * @param width odd window width, frames; 1 returns a copy
     */
    static double[] runningMedian(double[] v, int width) {
        if (width <= 1) {
            return v.clone();
        }
        int h = width / 2;
        double[] out = new double[v.length];
        for (int i = 0; i < v.length; i++) {
            int a = Math.max(0, i - h);
            int b = Math.min(v.length - 1, i + h);
            out[i] = median(Arrays.copyOfRange(v, a, b + 1));
        }
        return out;
    }

    /** The median of the values; sorts the array. */
    static double median(double[] v) {
        Arrays.sort(v);
        int n = v.length;
        if (n == 0) {
            return Double.NaN;
        }
        return n % 2 == 1 ? v[n / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
    }

    /** The measurement of successive blocks of frames, with the window following the content. */
    private static final class Tracking {
        final double[] dx;
        final double[] dy;
        final double[] peaks;
        int atLimit;
        private final FrameSource frames;
        private final Window window;
        private final int[] pixels;
        private final int[] moved;
        private final float[] tile;
        private final float[][] tiles;
        private final PhaseCorrelation.Shift[] shifts;
        private final PhaseCorrelation correlation;
        private final ThreadLocal<PhaseCorrelation> perThread;
        private int trackX;
        private int trackY;

        Tracking(FrameSource frames, Window window, int[] pixels, PhaseCorrelation correlation) {
            int n = frames.frameCount();
            this.frames = frames;
            this.window = window;
            this.pixels = pixels;
            this.correlation = correlation;
            this.perThread = ThreadLocal.withInitial(correlation::copy);
            this.dx = new double[n];
            this.dy = new double[n];
            this.peaks = new double[n];
            this.moved = new int[pixels.length];
            this.tile = new float[pixels.length];
            this.tiles = new float[Math.min(BLOCK_FRAMES, n)][pixels.length];
            this.shifts = new PhaseCorrelation.Shift[tiles.length];
        }

        /**
         * Measures frames start to start + count - 1, count at most BLOCK_FRAMES, and runs {@code meanwhile} on this
         * thread while the transforms run.
         */
        void block(int start, int count, Runnable meanwhile) {
            // frames are read in order on this thread (a frame source need not be thread-safe); the transforms,
            // nearly all the work, run on the common pool, and on this thread too once meanwhile is done
            for (int i = 0; i < count; i++) {
                gather(start + i, trackX, trackY, tiles[i]);
            }
            AtomicInteger next = new AtomicInteger();
            Runnable drain = () -> {
                for (int i = next.getAndIncrement(); i < count; i = next.getAndIncrement()) {
                    shifts[i] = perThread.get().measure(tiles[i]);
                }
            };
            int helpers = Math.max(1, ForkJoinPool.getCommonPoolParallelism());
            CompletableFuture<?>[] running = new CompletableFuture<?>[helpers];
            for (int h = 0; h < helpers; h++) {
                running[h] = CompletableFuture.runAsync(drain);
            }
            meanwhile.run();
            drain.run();
            try {
                CompletableFuture.allOf(running).join();
            } catch (CompletionException e) {
                throw e.getCause() instanceof RuntimeException r ? r : e;
            }
            for (int i = 0; i < count; i++) {
                int f = start + i;
                PhaseCorrelation.Shift s = shifts[i];
                int offsetX = trackX;
                int offsetY = trackY;
                int nearestX = window.clampOffsetX(Math.round(offsetX + s.dxPx()), frames.width());
                int nearestY = window.clampOffsetY(Math.round(offsetY + s.dyPx()), frames.height());
                if (Math.abs(nearestX - offsetX) > RETRACK_PX || Math.abs(nearestY - offsetY) > RETRACK_PX) {
                    // a jump: measure again with the window over the content, so that little of it has left
                    offsetX = nearestX;
                    offsetY = nearestY;
                    gather(f, offsetX, offsetY, tile);
                    s = correlation.measure(tile);
                }
                dx[f] = offsetX + s.dxPx();
                dy[f] = offsetY + s.dyPx();
                peaks[f] = s.peakHeight();
                if (s.atLimit()) {
                    atLimit++;
                }
            }
            int last = start + count - 1;
            trackX = window.clampOffsetX(Math.round(dx[last]), frames.width());
            trackY = window.clampOffsetY(Math.round(dy[last]), frames.height());
        }

        /** Reads frame f in the window moved by (offsetX, offsetY) whole pixels from the reference window. */
        private void gather(int f, int offsetX, int offsetY, float[] into) {
            int offset = offsetY * frames.width() + offsetX;
            for (int i = 0; i < pixels.length; i++) {
                moved[i] = pixels[i] + offset;
            }
            frames.gather(f, moved, into);
        }
    }

    /** Where the measurement window lies, its transform size and its weights. */
    static final class Window {
        final int x;
        final int y;
        final int width;
        final int height;
        final int nx;
        final int ny;
        final double[] weights;
        final boolean stimulusFadedOut;

        private Window(int x, int y, int width, int height, StimulusRegion stimulus) {
            this.x = x;
            this.y = y;
            this.width = width;
            this.height = height;
            this.nx = nextPowerOfTwo(width);
            this.ny = nextPowerOfTwo(height);
            double[] wx = tukey(width);
            double[] wy = tukey(height);
            this.weights = new double[width * height];
            boolean faded = false;
            for (int j = 0; j < height; j++) {
                for (int i = 0; i < width; i++) {
                    double s = stimulus == null ? 1 : stimulus.weight(x + i + 0.5, y + j + 0.5);
                    faded |= s < 1;
                    weights[j * width + i] = wx[i] * wy[j] * s;
                }
            }
            this.stimulusFadedOut = faded;
        }

        /** The whole-pixel x offset nearest {@code offset} that keeps the window inside an image {@code limit} wide. */
        int clampOffsetX(long offset, int limit) {
            return (int) Math.max(-x, Math.min(limit - width - x, offset));
        }

        /** The whole-pixel y offset nearest {@code offset} that keeps the window inside an image {@code limit} high. */
        int clampOffsetY(long offset, int limit) {
            return (int) Math.max(-y, Math.min(limit - height - y, offset));
        }

        /** Indices of the window's pixels in a frame {@code frameWidth} wide, ascending. */
        int[] pixelIndices(int frameWidth) {
            int[] idx = new int[width * height];
            for (int j = 0; j < height; j++) {
                for (int i = 0; i < width; i++) {
                    idx[j * width + i] = (y + j) * frameWidth + x + i;
                }
            }
            return idx;
        }

        static Window place(FrameSource frames, PixelBox box, int baselineFirst, int baselineLast,
                StimulusRegion stimulus, MotionSettings settings) {
            int imageW = frames.width();
            int imageH = frames.height();
            int margin = settings.maxShiftPx();
            int c0 = Math.max(0, (int) Math.floor(box.minXPx() - margin));
            int c1 = Math.min(imageW, (int) Math.ceil(box.maxXPx() + margin));
            int r0 = Math.max(0, (int) Math.floor(box.minYPx() - margin));
            int r1 = Math.min(imageH, (int) Math.ceil(box.maxYPx() + margin));
            Checks.require(c1 > c0 && r1 > r0, "the path's region lies outside the " + imageW + " x " + imageH
                    + " pixel image");
            int w = largestPowerOfTwoAtMost(Math.min(settings.windowPx(), imageW));
            int h = largestPowerOfTwoAtMost(Math.min(settings.windowPx(), imageH));
            int x = centred(c0, c1, w, imageW);
            int y = centred(r0, r1, h, imageH);
            if (c1 - c0 > w || r1 - r0 > h) {
                int[] best = mostStructured(frames, c0, c1, r0, r1, w, h, baselineFirst, baselineLast, stimulus);
                x = best[0];
                y = best[1];
            }
            return new Window(x, y, w, h, stimulus);
        }

        /** Start of a window of {@code size} centred on [a, b), kept inside [0, limit). */
        private static int centred(int a, int b, int size, int limit) {
            int start = (a + b - size) / 2;
            return Math.max(0, Math.min(limit - size, start));
        }

        /**
         * The window position inside the region with the largest taper-weighted sum of squared central differences
         * of the mean of a few baseline frames, times the stimulus weight.
         */
        private static int[] mostStructured(FrameSource frames, int c0, int c1, int r0, int r1, int w, int h,
                int baselineFirst, int baselineLast, StimulusRegion stimulus) {
            int imageW = frames.width();
            int cw = c1 - c0;
            int ch = r1 - r0;
            double[] mean = new double[cw * ch];
            float[] rows = new float[ch * imageW];
            int count = Math.min(PLACEMENT_FRAMES, baselineLast - baselineFirst + 1);
            for (int k = 0; k < count; k++) {
                int f = baselineFirst + (int) ((long) k * (baselineLast - baselineFirst + 1) / count);
                frames.readRows(f, r0, ch, rows);
                for (int j = 0; j < ch; j++) {
                    for (int i = 0; i < cw; i++) {
                        mean[j * cw + i] += rows[j * imageW + c0 + i];
                    }
                }
            }
            double[] energy = new double[cw * ch];
            for (int j = 1; j < ch - 1; j++) {
                for (int i = 1; i < cw - 1; i++) {
                    double gx = mean[j * cw + i + 1] - mean[j * cw + i - 1];
                    double gy = mean[(j + 1) * cw + i] - mean[(j - 1) * cw + i];
                    double e = gx * gx + gy * gy;
                    double s = stimulus == null ? 1 : stimulus.weight(c0 + i + 0.5, r0 + j + 0.5);
                    energy[j * cw + i] = Double.isFinite(e) ? e * s : 0;
                }
            }
            double[] wx = tukey(w);
            double[] wy = tukey(h);
            int rangeX = Math.max(0, cw - w);
            int rangeY = Math.max(0, ch - h);
            int step = Math.max(1, (int) Math.ceil(Math.sqrt((rangeX + 1.0) * (rangeY + 1.0)
                    / PLACEMENT_CANDIDATES)));
            // the score is separable: filter each row by the x taper at every candidate x once, then each candidate
            // sums its rows by the y taper
            int[] xs = candidates(rangeX, step);
            int[] ys = candidates(rangeY, step);
            int spanX = Math.min(w, cw);
            int spanY = Math.min(h, ch);
            double[] filtered = new double[ch * xs.length];
            for (int r = 0; r < ch; r++) {
                for (int c = 0; c < xs.length; c++) {
                    int rowStart = r * cw + xs[c];
                    double sum = 0;
                    for (int i = 0; i < spanX; i++) {
                        sum += wx[i] * energy[rowStart + i];
                    }
                    filtered[r * xs.length + c] = sum;
                }
            }
            double bestScore = Double.NEGATIVE_INFINITY;
            int bestX = 0;
            int bestY = 0;
            for (int oy : ys) {
                for (int c = 0; c < xs.length; c++) {
                    double score = 0;
                    for (int j = 0; j < spanY; j++) {
                        score += wy[j] * filtered[(oy + j) * xs.length + c];
                    }
                    if (score > bestScore) {
                        bestScore = score;
                        bestX = xs[c];
                        bestY = oy;
                    }
                }
            }
            int x = cw > w ? c0 + bestX : centred(c0, c1, w, imageW);
            int y = ch > h ? r0 + bestY : centred(r0, r1, h, frames.height());
            return new int[] {x, y};
        }

        /** Candidate offsets 0, step, 2 step, ... with the last one, {@code last}, always included. */
        private static int[] candidates(int last, int step) {
            int n = last / step + 1 + (last % step == 0 ? 0 : 1);
            int[] out = new int[n];
            for (int k = 0; k < n; k++) {
                out[k] = Math.min(last, k * step);
            }
            return out;
        }

        /** Tukey window over n samples at (i + 1/2) / n, flat over the middle 1 - alpha. */
        static double[] tukey(int n) {
            double[] w = new double[n];
            for (int i = 0; i < n; i++) {
                double t = (i + 0.5) / n;
                double edge = Math.min(t, 1 - t);
                w[i] = edge >= TUKEY_ALPHA / 2 ? 1 : 0.5 * (1 - Math.cos(2 * Math.PI * edge / TUKEY_ALPHA));
            }
            return w;
        }

        static int nextPowerOfTwo(int n) {
            return n <= 1 ? 1 : Integer.highestOneBit(n - 1) << 1;
        }

        static int largestPowerOfTwoAtMost(int n) {
            return Integer.highestOneBit(n);
        }
    }
}
