package org.dendrokin.synth;

import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;

/**
 * Renders the planes of a {@link Scene}: for each frame, channel and slice, the fluorescence density of the moved
 * scene is sampled on a fine grid (oversampling x oversampling samples per pixel, plus padding for the blur),
 * convolved with the point-spread function (a sampled, normalised Gaussian, applied along rows, then columns),
 * averaged over each pixel's samples, scaled to counts, and the background, offset and noise added.
 *
 * <p>Densities, in um of projected thickness times relative loading: the shaft is a cylinder of radius r(s), seen
 * as the chord 2 sqrt(r^2 - d^2) at distance d from the axis, averaged exactly over the sample's width across the
 * axis; spine heads are spheres, averaged over 4 x 4 points per sample; necks are thin cylinders drawn as a
 * Gaussian line of the same mass per length. The signal channel multiplies the loading by 1 + dF/F0 (the shaft's
 * value at the sample's arc length, a head's own value, the mean of the two in the neck); the structural channel
 * has even loading and no signal. Frame f shows the scene moved by the motion's shift: the sample at image point
 * q shows the scene at q - shift, so no pixel is interpolated. With a raster line period each image row is
 * rendered at its own time. Not thread-safe (buffers are reused).
 */
final class Renderer {
    private static final int HEAD_SUBSAMPLES = 4;

    private final Scene scene;
    private final SessionSpec spec;
    private final int os;
    private final int pad;
    private final int fineW;
    private final int fineH;
    private final int outW;
    private final int outH;
    private final double hf;
    private final double hfUm;
    private final double r0;
    private final Map<Double, double[]> kernels = new HashMap<>();
    private final double[] density;
    private final double[] rowsBlurred;
    private final double[] fine;
    private final double[] signalTable;
    private final double tableS0;
    private double[] bgPlane;
    private final double[] bgKey = new double[3];

    Renderer(Scene scene) {
        this.scene = scene;
        this.spec = scene.spec;
        this.os = scene.os;
        this.pad = scene.pad;
        this.outW = scene.width * os;
        this.outH = scene.height * os;
        this.fineW = outW + 2 * pad;
        this.fineH = outH + 2 * pad;
        this.hf = 1.0 / os;
        this.hfUm = scene.px / os;
        this.r0 = spec.dendrite().radiusUm();
        this.density = new double[fineW * fineH];
        this.rowsBlurred = new double[fineH * outW];
        this.fine = new double[outH * outW];
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (float s : scene.mapArcUm) {
            if (!Float.isNaN(s)) {
                lo = Math.min(lo, s);
                hi = Math.max(hi, s);
            }
        }
        this.tableS0 = lo - 1;
        this.signalTable = new double[(int) Math.ceil((hi - lo + 2) / Scene.TABLE_STEP_UM) + 2];
    }

    /** Slice z's offset from the focal plane, um. */
    double sliceOffsetUm(int z) {
        return (z - (spec.imaging().zSlices() - 1) / 2.0) * spec.imaging().zStepUm();
    }

    /** The Gaussian sd (um) and weight of slice z. */
    double[] sliceBlur(int z) {
        double dz = sliceOffsetUm(z) / spec.optics().axialSigmaUm();
        return new double[] {spec.optics().psfSigmaUm() * Math.sqrt(1 + dz * dz), Math.exp(-dz * dz / 2)};
    }

    /**
     * The noise-free expected counts of one plane, row-major.
     *
     * @param frame   0-based time point
     * @param channel 0-based channel
     * @param slice   0-based slice
     */
    float[] expected(int frame, int channel, int slice) {
        SessionSpec.Role role = spec.channels().order().get(channel);
        double[] blur = sliceBlur(slice);
        double[] kernel = kernel(blur[0]);
        double frameTime = frame * spec.imaging().frameIntervalS();
        double linePeriod = spec.imaging().linePeriodS();
        int w = scene.width;
        int h = scene.height;
        float[] out = new float[w * h];
        if (linePeriod == 0) {
            renderRows(frame, frameTime, role, 0, fineH);
            blur(kernel, 0, outH);
            for (int j = 0; j < h; j++) {
                finishRow(out, j, frame, frameTime, role, blur);
            }
        } else {
            int radius = kernel.length / 2;
            for (int j = 0; j < h; j++) {
                double t = frameTime + j * linePeriod;
                int first = pad + j * os - radius;
                renderRows(frame, t, role, first, pad + (j + 1) * os + radius);
                blur(kernel, j * os, (j + 1) * os);
                finishRow(out, j, frame, t, role, blur);
            }
        }
        return out;
    }

    // ---------------------------------------------------------------------------------------------------------
    // Density on the fine grid

    /** Fills density rows [rowFrom, rowTo) of the padded fine grid at time t. */
    private void renderRows(int frame, double t, SessionSpec.Role role, int rowFrom, int rowTo) {
        boolean signal = role == SessionSpec.Role.SIGNAL;
        if (signal) {
            scene.signal.profile(t, tableS0, Scene.TABLE_STEP_UM, signalTable);
        }
        double sx = scene.shiftXPx[frame];
        double sy = scene.shiftYPx[frame];
        for (int r = rowFrom; r < rowTo; r++) {
            Arrays.fill(density, r * fineW, (r + 1) * fineW, 0);
        }
        shaft(signal, sx, sy, rowFrom, rowTo);
        List<Scene.SpineGeometry> spines = scene.spines;
        for (int i = 0; i < spines.size(); i++) {
            Scene.SpineGeometry sp = spines.get(i);
            double bright = signal ? sp.brightness() * scene.loading(sp.axisUm()) : 1;
            double head = signal ? scene.headValue(i, t) : 0;
            double shaftAtBase = signal ? scene.signal.value(sp.axisUm(), t) : 0;
            double ex = sp.headX() - sp.neckX0();
            double ey = sp.headY() - sp.neckY0();
            double len = Math.hypot(ex, ey);
            double neckEndX = sp.headX() - ex / len * sp.headRadiusUm() / scene.px;
            double neckEndY = sp.headY() - ey / len * sp.headRadiusUm() / scene.px;
            neck(sp.neckX0() + sx, sp.neckY0() + sy, neckEndX + sx, neckEndY + sy,
                    bright * (1 + (shaftAtBase + head) / 2), rowFrom, rowTo);
            sphere(sp.headX() + sx, sp.headY() + sy, sp.headRadiusUm(), bright * (1 + head), rowFrom, rowTo);
        }
        if (scene.intruder != null) {
            double[] c = scene.intruder.centreAt(spec.intruder(), t, scene.px);
            sphere(c[0] + sx, c[1] + sy, spec.intruder().radiusUm(), spec.intruder().brightness(), rowFrom, rowTo);
        }
    }

    /** Image x (pixels) of fine column col of the padded grid. */
    private double fineX(int col) {
        return (col - pad + 0.5) * hf;
    }

    private double fineY(int row) {
        return (row - pad + 0.5) * hf;
    }

    private void shaft(boolean signal, double sx, double sy, int rowFrom, int rowTo) {
        float[] arc = scene.mapArcUm;
        float[] dist = scene.mapDistUm;
        int nx = scene.mapNx;
        double step = scene.mapStep;
        for (int r = rowFrom; r < rowTo; r++) {
            double my = (fineY(r) - sy - scene.mapY0) / step;
            int j = (int) Math.floor(my);
            if (j < 0 || j + 1 >= scene.mapNy) {
                continue;
            }
            double wy = my - j;
            for (int col = 0; col < fineW; col++) {
                double mx = (fineX(col) - sx - scene.mapX0) / step;
                int i = (int) Math.floor(mx);
                if (i < 0 || i + 1 >= nx) {
                    continue;
                }
                int k = j * nx + i;
                float a00 = arc[k];
                float a10 = arc[k + 1];
                float a01 = arc[k + nx];
                float a11 = arc[k + nx + 1];
                if (Float.isNaN(a00) || Float.isNaN(a10) || Float.isNaN(a01) || Float.isNaN(a11)) {
                    continue;
                }
                double wx = mx - i;
                double d = (1 - wy) * ((1 - wx) * dist[k] + wx * dist[k + 1])
                        + wy * ((1 - wx) * dist[k + nx] + wx * dist[k + nx + 1]);
                double s = (1 - wy) * ((1 - wx) * a00 + wx * a10) + wy * ((1 - wx) * a01 + wx * a11);
                double radius = scene.radiusUm(s);
                if (Math.abs(d) >= radius + hfUm / 2) {
                    continue;
                }
                double chord = chordAverage(d, radius, hfUm);
                double value = signal ? chord * scene.loading(s) * (1 + Scene.table(signalTable, s - tableS0))
                        : chord;
                density[r * fineW + col] += value;
            }
        }
    }

    /**
     * Mean of the chord 2 sqrt(r^2 - x^2) over x in [d - width/2, d + width/2] (0 outside |x| < r), from its
     * antiderivative r^2 G(x / r), G(u) = u sqrt(1 - u^2) + asin(u).
     */
    static double chordAverage(double d, double r, double width) {
        return r * r * (antiderivative((d + width / 2) / r) - antiderivative((d - width / 2) / r)) / width;
    }

    /** G on [-1, 1], tabulated (linear interpolation; error below 1e-6 of G(1) = pi / 2). */
    private static final double[] G_TABLE = new double[8193];

    static {
        for (int i = 0; i < G_TABLE.length; i++) {
            double u = -1 + 2.0 * i / (G_TABLE.length - 1);
            G_TABLE[i] = u * Math.sqrt(Math.max(0, 1 - u * u)) + Math.asin(u);
        }
    }

    private static double antiderivative(double u) {
        if (u <= -1) {
            return -Math.PI / 2;
        }
        if (u >= 1) {
            return Math.PI / 2;
        }
        double p = (u + 1) / 2 * (G_TABLE.length - 1);
        int i = Math.min(G_TABLE.length - 2, (int) p);
        double w = p - i;
        return (1 - w) * G_TABLE[i] + w * G_TABLE[i + 1];
    }

    /** Adds a sphere of radius rUm centred at (cx, cy) pixels: projected chord times {@code factor}. */
    private void sphere(double cx, double cy, double rUm, double factor, int rowFrom, int rowTo) {
        double rPx = rUm / scene.px;
        int c0 = Math.max(0, (int) Math.floor((cx - rPx) / hf + pad - 1));
        int c1 = Math.min(fineW - 1, (int) Math.ceil((cx + rPx) / hf + pad + 1));
        int r0i = Math.max(rowFrom, (int) Math.floor((cy - rPx) / hf + pad - 1));
        int r1i = Math.min(rowTo - 1, (int) Math.ceil((cy + rPx) / hf + pad + 1));
        int n = HEAD_SUBSAMPLES;
        double r2 = rUm * rUm;
        for (int r = r0i; r <= r1i; r++) {
            for (int col = c0; col <= c1; col++) {
                double sum = 0;
                for (int b = 0; b < n; b++) {
                    double y = fineY(r) + ((b + 0.5) / n - 0.5) * hf;
                    double dy = (y - cy) * scene.px;
                    for (int a = 0; a < n; a++) {
                        double x = fineX(col) + ((a + 0.5) / n - 0.5) * hf;
                        double dx = (x - cx) * scene.px;
                        double q = r2 - dx * dx - dy * dy;
                        if (q > 0) {
                            sum += 2 * Math.sqrt(q);
                        }
                    }
                }
                density[r * fineW + col] += factor * sum / (n * n);
            }
        }
    }

    /** Adds a neck from (x0, y0) to (x1, y1) pixels: a Gaussian line of mass pi r_n^2 per um, times {@code factor}. */
    private void neck(double x0, double y0, double x1, double y1, double factor, int rowFrom, int rowTo) {
        double rn = spec.spines().neckRadiusUm();
        double sigma = Math.max(rn / 2, hfUm / 2);
        double peak = Math.PI * rn * rn / (Math.sqrt(2 * Math.PI) * sigma) * factor;
        double reachPx = 4 * sigma / scene.px;
        double ex = x1 - x0;
        double ey = y1 - y0;
        double len2 = ex * ex + ey * ey;
        if (len2 <= 0) {
            return;
        }
        int c0 = Math.max(0, (int) Math.floor((Math.min(x0, x1) - reachPx) / hf + pad - 1));
        int c1 = Math.min(fineW - 1, (int) Math.ceil((Math.max(x0, x1) + reachPx) / hf + pad + 1));
        int ra = Math.max(rowFrom, (int) Math.floor((Math.min(y0, y1) - reachPx) / hf + pad - 1));
        int rb = Math.min(rowTo - 1, (int) Math.ceil((Math.max(y0, y1) + reachPx) / hf + pad + 1));
        for (int r = ra; r <= rb; r++) {
            double y = fineY(r);
            for (int col = c0; col <= c1; col++) {
                double x = fineX(col);
                double u = ((x - x0) * ex + (y - y0) * ey) / len2;
                if (u < 0 || u > 1) {
                    continue;
                }
                double dx = (x - x0 - u * ex) * scene.px;
                double dy = (y - y0 - u * ey) * scene.px;
                double d2 = dx * dx + dy * dy;
                if (d2 < 16 * sigma * sigma) {
                    density[r * fineW + col] += peak * Math.exp(-d2 / (2 * sigma * sigma));
                }
            }
        }
    }

    // ---------------------------------------------------------------------------------------------------------
    // Blur and binning

    /** A sampled Gaussian of sd sigmaUm on the fine grid, normalised to sum 1; {1} for no blur. */
    double[] kernel(double sigmaUm) {
        return kernels.computeIfAbsent(sigmaUm, s -> {
            if (s == 0) {
                return new double[] {1};
            }
            double sf = s / hfUm;
            int radius = Math.min(pad, (int) Math.ceil(4 * sf));
            double[] k = new double[2 * radius + 1];
            double sum = 0;
            for (int i = -radius; i <= radius; i++) {
                k[i + radius] = Math.exp(-i * i / (2 * sf * sf));
                sum += k[i + radius];
            }
            for (int i = 0; i < k.length; i++) {
                k[i] /= sum;
            }
            return k;
        });
    }

    /** Blurs the density into {@link #fine} for output fine rows [outFrom, outTo). */
    private void blur(double[] k, int outFrom, int outTo) {
        int radius = k.length / 2;
        int rowFirst = outFrom + pad - radius;
        int rowLast = outTo - 1 + pad + radius;
        for (int r = rowFirst; r <= rowLast; r++) {
            int base = r * fineW + pad;
            int dst = r * outW;
            if (zeroRow(r)) {
                Arrays.fill(rowsBlurred, dst, dst + outW, 0);
                continue;
            }
            for (int c = 0; c < outW; c++) {
                double sum = 0;
                int src = base + c - radius;
                for (int i = 0; i < k.length; i++) {
                    sum += k[i] * density[src + i];
                }
                rowsBlurred[dst + c] = sum;
            }
        }
        for (int r = outFrom; r < outTo; r++) {
            int dst = r * outW;
            Arrays.fill(fine, dst, dst + outW, 0);
            int srcRow = r + pad - radius;
            for (int i = 0; i < k.length; i++) {
                if (zeroRow(srcRow + i)) {
                    continue;
                }
                double weight = k[i];
                int src = (srcRow + i) * outW;
                for (int c = 0; c < outW; c++) {
                    fine[dst + c] += weight * rowsBlurred[src + c];
                }
            }
        }
    }

    /** True if density row r of the padded grid is empty (most rows away from the dendrite are). */
    private boolean zeroRow(int r) {
        int end = (r + 1) * fineW;
        for (int i = r * fineW; i < end; i++) {
            if (density[i] != 0) {
                return false;
            }
        }
        return true;
    }

    /** Bins output row j, scales it to counts and adds the background and offset. */
    private void finishRow(float[] out, int j, int frame, double t, SessionSpec.Role role, double[] blur) {
        boolean signal = role == SessionSpec.Role.SIGNAL;
        double rest = signal ? spec.camera().restCounts() : spec.channels().structuralCounts();
        double bleach = signal ? spec.bleaching().remaining(t) : Math.exp(-t / spec.channels().structuralBleachS());
        double scale = rest / (2 * r0) * bleach * blur[1] / (os * os);
        double offset = spec.camera().offsetCounts();
        double bgFactor = spec.background().bleachesWithDye() ? spec.bleaching().remaining(t) : 1;
        for (int i = 0; i < scene.width; i++) {
            double sum = 0;
            for (int b = 0; b < os; b++) {
                int row = (j * os + b) * outW + i * os;
                for (int a = 0; a < os; a++) {
                    sum += fine[row + a];
                }
            }
            double bg = backgroundPlane(frame, blur[0])[j * scene.width + i];
            out[j * scene.width + i] = (float) (offset + scale * sum + bgFactor * bg);
        }
    }

    /** The background of every pixel for a frame's shift and a blur; kept while neither changes. */
    private double[] backgroundPlane(int frame, double sigmaUm) {
        double sx = scene.shiftXPx[frame];
        double sy = scene.shiftYPx[frame];
        if (bgPlane == null || sx != bgKey[0] || sy != bgKey[1] || sigmaUm != bgKey[2]) {
            bgPlane = new double[scene.width * scene.height];
            for (int j = 0; j < scene.height; j++) {
                for (int i = 0; i < scene.width; i++) {
                    bgPlane[j * scene.width + i] = background(i + 0.5 - sx, j + 0.5 - sy, sigmaUm);
                }
            }
            bgKey[0] = sx;
            bgKey[1] = sy;
            bgKey[2] = sigmaUm;
        }
        return bgPlane;
    }

    /**
     * The background at scene point (x, y) pixels after a Gaussian blur of sd sigmaUm: the even level, the gradient
     * (unchanged by a blur) and the blobs (a Gaussian of variance v blurred by one of variance s^2 is a Gaussian of
     * variance v + s^2 with peak scaled by v / (v + s^2) in two dimensions).
     */
    double background(double x, double y, double sigmaUm) {
        SessionSpec.Background b = spec.background();
        double value = b.autofluorescenceCounts();
        value += b.gradientCounts() * ((x - scene.width / 2.0) * scene.gradient[0]
                + (y - scene.height / 2.0) * scene.gradient[1]) / scene.width;
        double s2 = sigmaUm * sigmaUm;
        for (double[] blob : scene.blobs) {
            double v = blob[3] * blob[3];
            double dx = (x - blob[0]) * scene.px;
            double dy = (y - blob[1]) * scene.px;
            value += blob[2] * v / (v + s2) * Math.exp(-(dx * dx + dy * dy) / (2 * (v + s2)));
        }
        return value;
    }

    // ---------------------------------------------------------------------------------------------------------
    // Noise

    /**
     * Records one plane: offset + N / gain + read noise, N ~ Poisson((expected - offset) gain) electrons (or exactly
     * (expected - offset) gain without shot noise), rounded and clipped to 0..65535.
     */
    short[] record(float[] expected, SplittableRandom random) {
        SessionSpec.Camera cam = spec.camera();
        short[] out = new short[expected.length];
        for (int i = 0; i < expected.length; i++) {
            double electrons = Math.max(0, (expected[i] - cam.offsetCounts()) * cam.gainElectronsPerCount());
            double n = cam.shotNoise() ? PoissonSampler.sample(random, electrons) : electrons;
            double counts = cam.offsetCounts() + n / cam.gainElectronsPerCount();
            if (cam.readNoiseCounts() > 0) {
                counts += cam.readNoiseCounts() * random.nextGaussian();
            }
            out[i] = (short) Math.max(0, Math.min(65535, Math.round(counts)));
        }
        return out;
    }
}
