package org.dendrokin.core.spines;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

import org.dendrokin.core.Checks;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.core.preprocess.Robust;

/**
 * Finds spine heads beside the shaft in a reference image (the mean of the baseline frames, or of a structural
 * channel), in four steps.
 *
 * <ol>
 * <li>The surroundings a head is measured against. Every pixel within reach of the path gets its place relative
 * to the path (arc length of its nearest point, signed distance; {@link PathCoordinates}). The local background
 * B of a pixel is the median of the reference over the pixels on the same side of the path, in the same one-pixel
 * band of distance from it, and within {@value #BACKGROUND_HALF_LENGTH_UM} um along it. Spine heads fill a small
 * part of each such band, so the median follows the shaft's edge and the uneven background but not the heads.</li>
 * <li>A score per pixel: the mean of R = reference - B over a disc of the head radius, minus the median of R over
 * a ring from two to three head radii, which removes what is broader than a head (blobs of background, a
 * gradient) as a difference of a small and a large neighbourhood does in blob detection.</li>
 * <li>The threshold: the score's noise standard deviation is 1.4826 times its median absolute deviation over the
 * search zone (the pixels between the least and the largest distance from the path, not beyond its ends); a
 * head's score must exceed {@code thresholdSd} of them [common practice: a robust noise level and a fixed number
 * of standard deviations].</li>
 * <li>Heads: local maxima of the score above the threshold, taken in order of score, each at least a head
 * diameter from every head taken before; the centre is the centroid of the positive part of R within a head
 * radius and one pixel of the maximum, and must itself lie in the search zone. A maximum with a higher one farther
 * out on the same side, within a head diameter along the path, is the neck of that spine where it meets the shaft
 * (bright because the neck and the shaft's edge add up there), and is not taken.</li>
 * </ol>
 */
public final class SpineDetector {
    /** Half the length of path over which the local background of a pixel is the median, um. */
    static final double BACKGROUND_HALF_LENGTH_UM = 3.0;

    private SpineDetector() {
    }

    /**
     * What the detection found and how.
     *
     * @param sites        the heads, in order of their score (best first)
     * @param noiseSd      the score's noise standard deviation, the reference's grey values
     * @param threshold    the score a head had to exceed, grey values
     * @param minDistanceUm least distance of a head's centre from the path actually used, um
     * @param maxDistanceUm largest distance, um
     * @param warnings     plain sentences
     */
    public record Detection(List<SpineSite> sites, double noiseSd, double threshold, double minDistanceUm,
            double maxDistanceUm, List<String> warnings) {
        public Detection {
            sites = List.copyOf(sites);
            warnings = List.copyOf(warnings);
        }
    }

    /**
     * @param reference    row-major reference image, {@code width * height} values. Not modified.
     * @param width        image width, pixels
     * @param height       image height, pixels
     * @param path         the dendrite's path, ImageJ pixel coordinates
     * @param pixelSizeUm  pixel size, um
     * @param pathWidthUm  width of the shaft's band, um; heads are looked for beyond half of it
     * @param settings     distances, head radius and threshold
     */
    public static Detection detect(float[] reference, int width, int height, DendritePath path, double pixelSizeUm,
            double pathWidthUm, SpineSettings settings) {
        Checks.require(reference.length == width * height, "the reference image has " + reference.length
                + " pixels, expected " + width + " x " + height);
        Checks.positiveFinite(pixelSizeUm, "pixel size (um)");
        List<String> warnings = new ArrayList<>();
        double minUm = Math.max(settings.minDistanceUm(), pathWidthUm / 2);
        double maxUm = settings.maxDistanceUm();
        if (!(maxUm > minUm)) {
            warnings.add(String.format(Locale.ROOT, "No spine heads were looked for: the band of the shaft (%.3g um "
                    + "wide) reaches beyond the largest distance from the path (%.3g um).", pathWidthUm, maxUm));
            return new Detection(List.of(), Double.NaN, Double.NaN, minUm, maxUm, warnings);
        }
        double minPx = minUm / pixelSizeUm;
        double maxPx = maxUm / pixelSizeUm;
        double headPx = Math.max(settings.headRadiusUm() / pixelSizeUm, 1.0);
        int[][] disc = offsets(0, headPx);
        int[][] ring = offsets(2 * headPx, 3 * headPx);
        int[][] centroidDisc = offsets(0, headPx + 1);
        double reachPx = maxPx + 3 * headPx + 1;

        Area area = Area.around(path, width, height, reachPx);
        int n = area.size();
        double[] value = new double[n];
        for (int a = 0; a < n; a++) {
            value[a] = reference[area.pixel[a]];
        }
        double[] residual = residualToBackground(area, value, BACKGROUND_HALF_LENGTH_UM / pixelSizeUm);

        double[] score = new double[n];
        double[] ringValues = new double[ring.length];
        for (int a = 0; a < n; a++) {
            score[a] = Double.NaN;
            int col = area.pixel[a] % width;
            int row = area.pixel[a] / width;
            double sum = 0;
            int count = 0;
            for (int[] o : disc) {
                int b = area.at(col + o[0], row + o[1]);
                if (b >= 0 && Double.isFinite(residual[b])) {
                    sum += residual[b];
                    count++;
                }
            }
            int ringCount = 0;
            for (int[] o : ring) {
                int b = area.at(col + o[0], row + o[1]);
                if (b >= 0 && Double.isFinite(residual[b])) {
                    ringValues[ringCount++] = residual[b];
                }
            }
            if (2 * count >= disc.length && 2 * ringCount >= ring.length) {
                score[a] = sum / count - Robust.median(Arrays.copyOf(ringValues, ringCount));
            }
        }

        List<Integer> zone = new ArrayList<>();
        for (int a = 0; a < n; a++) {
            double d = Math.abs(area.signed[a]);
            if (d >= minPx && d <= maxPx && !area.atEnd[a] && Double.isFinite(score[a])) {
                zone.add(a);
            }
        }
        if (zone.size() < 10) {
            warnings.add("No spine heads were looked for: fewer than 10 pixels of the image lie between "
                    + Numbers.text(minUm) + " and " + Numbers.text(maxUm) + " um from the path.");
            return new Detection(List.of(), Double.NaN, Double.NaN, minUm, maxUm, warnings);
        }
        double[] zoneScores = zone.stream().mapToDouble(a -> score[a]).toArray();
        double noise = Robust.madSd(zoneScores);
        double threshold = settings.thresholdSd() * noise;
        if (!(noise > 0)) {
            warnings.add("No spine heads were looked for: the reference image is flat beside the path.");
            return new Detection(List.of(), noise, threshold, minUm, maxUm, warnings);
        }

        List<Integer> maxima = new ArrayList<>();
        for (int a : zone) {
            if (score[a] > threshold && isLocalMaximum(area, score, a, width)) {
                maxima.add(a);
            }
        }
        maxima.sort(Comparator.comparingDouble((Integer a) -> -score[a]));
        double separation = 2 * settings.headRadiusUm() / pixelSizeUm;
        PathCoordinates coordinates = area.coordinates;
        List<SpineSite> sites = new ArrayList<>();
        for (int a : maxima) {
            if (onNeckOfBrighter(area, score, maxima, a, separation)) {
                continue;
            }
            double[] centre = centroid(area, residual, a, width, centroidDisc);
            double[] place = coordinates.locate(centre[0], centre[1]);
            double d = Math.abs(place[1]);
            if (d < minPx || d > maxPx || place[2] != 0) {
                continue;
            }
            boolean apart = true;
            for (SpineSite s : sites) {
                if (Math.hypot(s.xPx() - centre[0], s.yPx() - centre[1]) < separation) {
                    apart = false;
                    break;
                }
            }
            if (apart) {
                sites.add(new SpineSite(centre[0], centre[1], Double.NaN, "", SpineSite.Source.DETECTED,
                        score[a] / noise));
            }
        }
        if (sites.isEmpty()) {
            warnings.add(String.format(Locale.ROOT, "No spine heads were found between %s and %s um from the path "
                    + "(none stood %s noise standard deviations above its surroundings).", Numbers.text(minUm),
                    Numbers.text(maxUm), Numbers.text(settings.thresholdSd())));
        }
        return new Detection(sites, noise, threshold, minUm, maxUm, warnings);
    }

    /**
     * True when a higher-scoring maximum lies farther from the path on the same side, within a head diameter along
     * it: then this one is that head's neck where it meets the shaft, not a head of its own.
     */
    private static boolean onNeckOfBrighter(Area area, double[] score, List<Integer> maxima, int a,
            double diameterPx) {
        for (int b : maxima) {
            if (score[b] > score[a] && Math.signum(area.signed[b]) == Math.signum(area.signed[a])
                    && Math.abs(area.signed[b]) > Math.abs(area.signed[a])
                    && Math.abs(area.arc[b] - area.arc[a]) <= diameterPx) {
                return true;
            }
        }
        return false;
    }

    /** Integer offsets (dx, dy) with rMin <= |(dx, dy)| <= rMax, pixels; the centre alone when rMax < 1. */
    static int[][] offsets(double rMin, double rMax) {
        List<int[]> out = new ArrayList<>();
        int r = (int) Math.ceil(rMax);
        for (int dy = -r; dy <= r; dy++) {
            for (int dx = -r; dx <= r; dx++) {
                double d = Math.hypot(dx, dy);
                if (d >= rMin - 1e-9 && d <= rMax + 1e-9) {
                    out.add(new int[] {dx, dy});
                }
            }
        }
        return out.toArray(new int[0][]);
    }

    /** True when no pixel of the 8-neighbourhood has a higher score (ties go to the lower pixel index). */
    private static boolean isLocalMaximum(Area area, double[] score, int a, int width) {
        int col = area.pixel[a] % width;
        int row = area.pixel[a] / width;
        for (int dy = -1; dy <= 1; dy++) {
            for (int dx = -1; dx <= 1; dx++) {
                if (dx == 0 && dy == 0) {
                    continue;
                }
                int b = area.at(col + dx, row + dy);
                if (b >= 0 && Double.isFinite(score[b])
                        && (score[b] > score[a] || score[b] == score[a] && area.pixel[b] < area.pixel[a])) {
                    return false;
                }
            }
        }
        return true;
    }

    /** Centroid (ImageJ pixel coordinates) of the positive residual around area pixel a; its centre if none. */
    private static double[] centroid(Area area, double[] residual, int a, int width, int[][] disc) {
        int col = area.pixel[a] % width;
        int row = area.pixel[a] / width;
        double sw = 0;
        double sx = 0;
        double sy = 0;
        for (int[] o : disc) {
            int b = area.at(col + o[0], row + o[1]);
            if (b >= 0 && residual[b] > 0) {
                sw += residual[b];
                sx += residual[b] * (col + o[0] + 0.5);
                sy += residual[b] * (row + o[1] + 0.5);
            }
        }
        return sw > 0 ? new double[] {sx / sw, sy / sw} : new double[] {col + 0.5, row + 0.5};
    }

    /**
     * R = value - B, B the median of the values on the same side, in the same one-pixel band of distance and within
     * {@code halfLengthPx} along the path.
     */
    private static double[] residualToBackground(Area area, double[] value, double halfLengthPx) {
        int n = area.size();
        double[] residual = new double[n];
        Arrays.fill(residual, Double.NaN);
        Map<Long, List<Integer>> bands = new HashMap<>();
        for (int a = 0; a < n; a++) {
            if (!Double.isFinite(value[a])) {
                continue;
            }
            long band = (long) Math.floor(Math.abs(area.signed[a])) * 2 + (area.signed[a] < 0 ? 1 : 0);
            bands.computeIfAbsent(band, k -> new ArrayList<>()).add(a);
        }
        double[] window = new double[n];
        for (List<Integer> members : bands.values()) {
            members.sort(Comparator.comparingDouble(a -> area.arc[a]));
            int size = members.size();
            int lo = 0;
            int hi = 0;
            for (int i = 0; i < size; i++) {
                double s = area.arc[members.get(i)];
                while (area.arc[members.get(lo)] < s - halfLengthPx) {
                    lo++;
                }
                while (hi + 1 < size && area.arc[members.get(hi + 1)] <= s + halfLengthPx) {
                    hi++;
                }
                int count = hi - lo + 1;
                for (int j = 0; j < count; j++) {
                    window[j] = value[members.get(lo + j)];
                }
                Arrays.sort(window, 0, count);
                double median = count % 2 == 1 ? window[count / 2]
                        : 0.5 * (window[count / 2 - 1] + window[count / 2]);
                int a = members.get(i);
                residual[a] = value[a] - median;
            }
        }
        return residual;
    }

    /** The pixels within reach of a path, each with its arc length and signed distance (pixels). */
    static final class Area {
        final PathCoordinates coordinates;
        final int width;
        final int height;
        final int[] pixel;
        final double[] arc;
        final double[] signed;
        final boolean[] atEnd;
        /** Area index of each pixel of the bounding box [c0, c1] x [r0, r1], or -1. */
        private final int[] index;
        private final int c0;
        private final int r0;
        private final int boxWidth;
        private final int boxHeight;

        private Area(PathCoordinates coordinates, int width, int height, int[] pixel, double[] arc, double[] signed,
                boolean[] atEnd, int[] index, int[] box) {
            this.coordinates = coordinates;
            this.width = width;
            this.height = height;
            this.pixel = pixel;
            this.arc = arc;
            this.signed = signed;
            this.atEnd = atEnd;
            this.index = index;
            this.c0 = box[0];
            this.r0 = box[1];
            this.boxWidth = box[2];
            this.boxHeight = box[3];
        }

        static Area around(DendritePath path, int width, int height, double reachPx) {
            PathCoordinates pc = new PathCoordinates(path);
            double[] xs = path.xPx();
            double[] ys = path.yPx();
            int c0 = Math.max(0, (int) Math.floor(Arrays.stream(xs).min().getAsDouble() - reachPx));
            int c1 = Math.min(width - 1, (int) Math.ceil(Arrays.stream(xs).max().getAsDouble() + reachPx));
            int r0 = Math.max(0, (int) Math.floor(Arrays.stream(ys).min().getAsDouble() - reachPx));
            int r1 = Math.min(height - 1, (int) Math.ceil(Arrays.stream(ys).max().getAsDouble() + reachPx));
            int boxWidth = Math.max(0, c1 - c0 + 1);
            int boxHeight = Math.max(0, r1 - r0 + 1);
            int[] index = new int[boxWidth * boxHeight];
            Arrays.fill(index, -1);
            List<double[]> found = new ArrayList<>();
            for (int row = r0; row <= r1; row++) {
                for (int col = c0; col <= c1; col++) {
                    double[] place = pc.locate(col + 0.5, row + 0.5);
                    if (Math.abs(place[1]) <= reachPx) {
                        found.add(new double[] {row * (double) width + col, place[0], place[1], place[2]});
                    }
                }
            }
            int n = found.size();
            int[] pixel = new int[n];
            double[] arc = new double[n];
            double[] signed = new double[n];
            boolean[] atEnd = new boolean[n];
            for (int a = 0; a < n; a++) {
                double[] f = found.get(a);
                pixel[a] = (int) f[0];
                arc[a] = f[1];
                signed[a] = f[2];
                atEnd[a] = f[3] != 0;
                index[(pixel[a] / width - r0) * boxWidth + pixel[a] % width - c0] = a;
            }
            return new Area(pc, width, height, pixel, arc, signed, atEnd, index,
                    new int[] {c0, r0, boxWidth, boxHeight});
        }

        int size() {
            return pixel.length;
        }

        /** The area index of pixel (col, row), or -1 outside the image or the area. */
        int at(int col, int row) {
            int i = col - c0;
            int j = row - r0;
            if (i < 0 || j < 0 || i >= boxWidth || j >= boxHeight) {
                return -1;
            }
            return index[j * boxWidth + i];
        }
    }

    /** Numbers in sentences: three significant digits. */
    private static final class Numbers {
        static String text(double v) {
            return String.format(Locale.ROOT, "%.3g", v);
        }
    }
}
