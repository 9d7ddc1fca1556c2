package org.dendrokin.synth;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Random;
import java.util.SplittableRandom;

import org.apache.commons.math3.analysis.interpolation.SplineInterpolator;
import org.apache.commons.math3.analysis.polynomials.PolynomialSplineFunction;

/**
 * Everything about one synthetic session that does not change with time: the dendrite's axis, radius and loading,
 * the spines, the drawn path, the stimulus, the background, the motion of every frame, the signal field, and a
 * fine map of (arc length, signed distance) from the axis used to render the shaft. Coordinates are image pixels
 * (pixel i covers [i, i+1)); arc lengths and radii are um. Each random part draws from its own stream of the
 * master seed.
 */
final class Scene {
    /** Map nodes per fine render sample along each axis; 2 puts every fine sample of an unshifted frame on a node. */
    private static final int MAP_PER_FINE = 2;
    /** Arc-length step of the radius, loading and signal tables, um. */
    static final double TABLE_STEP_UM = 0.02;
    /** Time points per frame interval at which the kick's PDE and the spine heads are stored. */
    static final int TIME_STEPS_PER_FRAME = 8;
    /** Room left for motion between the drawn path's ends and the image's edges, um. */
    private static final double MOTION_ALLOWANCE_UM = 1.0;

    final SessionSpec spec;
    final int width;
    final int height;
    final double px;
    final int os;
    /** Fine samples of padding beyond each image edge, enough for the widest blur kernel. */
    final int pad;
    final double tiltDeg;
    final Polyline axis;
    final double axisLengthUm;
    final double[] radiusTable;
    final double[] loadingTable;
    final double maxRadiusUm;
    final Polyline drawn;
    final double[] drawnAxisRangeUm;
    final double stimulusAxisUm;
    final double[] stimulusPx;
    /** The second pulse's place on the axis (um) and in the image (pixels), or NaN and null for one stimulus. */
    final double secondAxisUm;
    final double[] secondPx;
    final List<SpineGeometry> spines;
    final IntruderGeometry intruder;
    final double[][] blobs;
    final double[] gradient;
    final double[] shiftXPx;
    final double[] shiftYPx;
    final double[] timeGrid;
    final SignalField signal;
    final double[][] headSeries;
    /** The map: origin (pixels), spacing (pixels), size, and per node the arc length (um) and signed distance (um). */
    final double mapX0;
    final double mapY0;
    final double mapStep;
    final int mapNx;
    final int mapNy;
    final float[] mapArcUm;
    final float[] mapDistUm;

    /** A spine: base on the axis, neck from the shaft's surface, head. Positions in pixels of the unshifted scene. */
    record SpineGeometry(double axisUm, int side, double neckX0, double neckY0, double headX, double headY,
            double headRadiusUm, double neckLengthUm, double brightness, double tauNeckS, boolean stimulated) {
    }

    /** The moving bright head: its path in the unshifted scene, pixels. */
    record IntruderGeometry(double axisUm, double baseX, double baseY, double dirX, double dirY) {
        double[] centreAt(SessionSpec.Intruder settings, double tS, double px) {
            double u = Math.max(0, Math.min(1, (tS - settings.startTimeS()) / (settings.endTimeS()
                    - settings.startTimeS())));
            double offUm = settings.startOffsetUm() + u * (settings.endOffsetUm() - settings.startOffsetUm());
            return new double[] {baseX + dirX * offUm / px, baseY + dirY * offUm / px};
        }
    }

    Scene(SessionSpec spec) {
        this.spec = spec;
        SessionSpec.Imaging im = spec.imaging();
        this.width = im.widthPx();
        this.height = im.heightPx();
        this.px = im.pixelSizeUm();
        this.os = im.oversampling();
        this.pad = (int) Math.ceil(4 * maxBlurSigmaUm(spec) / (px / os));

        this.shiftXPx = new double[im.frames()];
        this.shiftYPx = new double[im.frames()];
        motion(spec, stream("motion"), shiftXPx, shiftYPx);
        double maxShift = 0;
        for (int f = 0; f < im.frames(); f++) {
            maxShift = Math.max(maxShift, Math.hypot(shiftXPx[f], shiftYPx[f]));
        }

        SessionSpec.Dendrite dend = spec.dendrite();
        Random curveRandom = new Random(stream("curve").nextLong());
        this.tiltDeg = Double.isNaN(dend.tiltDeg()) ? -8 + 16 * curveRandom.nextDouble() : dend.tiltDeg();
        this.axis = axisCurve(dend, curveRandom);
        this.axisLengthUm = axis.length() * px;
        SmoothField radiusField = new SmoothField(new Random(stream("radius").nextLong()), dend.correlationUm());
        SmoothField loadingField = new SmoothField(new Random(stream("loading").nextLong()),
                spec.loading().correlationUm());
        int nTable = (int) Math.ceil(axisLengthUm / TABLE_STEP_UM) + 2;
        radiusTable = new double[nTable];
        loadingTable = new double[nTable];
        double maxR = 0;
        double sdLoad = spec.loading().sd();
        for (int i = 0; i < nTable; i++) {
            double s = i * TABLE_STEP_UM;
            radiusTable[i] = dend.radiusUm() * Math.max(0.4, 1 + dend.radiusCv() * radiusField.value(s));
            loadingTable[i] = Math.exp(sdLoad * loadingField.value(s) - sdLoad * sdLoad / 2);
            maxR = Math.max(maxR, radiusTable[i]);
        }
        this.maxRadiusUm = maxR;

        // The stretch of the axis that stays inside the image with room for the band, the blur and 1 um of motion
        // (fixed, so that the same seed draws the same path with or without motion).
        double marginPx = (spec.path().widthUm() / 2 + MOTION_ALLOWANCE_UM) / px + 2 + pad / (double) os;
        double[] usable = usableStretch(marginPx);
        this.drawn = drawnPath(spec.path(), usable, stream("path"));
        this.drawnAxisRangeUm = new double[] {axis.nearest(drawn.x(0), drawn.y(0))[0] * px,
                axis.nearest(drawn.x(drawn.size() - 1), drawn.y(drawn.size() - 1))[0] * px};

        double fraction = 0;
        if (spec.signal() instanceof SessionSpec.GaussianPulse p) {
            fraction = p.positionFraction();
        } else if (spec.signal() instanceof SessionSpec.PulsePair pair) {
            fraction = pair.first().positionFraction();
        } else if (spec.signal() instanceof SessionSpec.NagumoKick k) {
            fraction = k.positionFraction();
        }
        this.stimulusAxisUm = drawnAxisRangeUm[0] + fraction * (drawnAxisRangeUm[1] - drawnAxisRangeUm[0]);
        this.stimulusPx = axis.point(stimulusAxisUm / px);
        if (spec.signal() instanceof SessionSpec.PulsePair pair) {
            this.secondAxisUm = drawnAxisRangeUm[0]
                    + pair.second().positionFraction() * (drawnAxisRangeUm[1] - drawnAxisRangeUm[0]);
            this.secondPx = axis.point(secondAxisUm / px);
        } else {
            this.secondAxisUm = Double.NaN;
            this.secondPx = null;
        }

        this.spines = spines(spec.spines(), stream("spines"));
        this.intruder = spec.intruder().enabled() ? intruder(spec.intruder(), stream("intruder")) : null;
        SplittableRandom bg = stream("background");
        this.blobs = new double[spec.background().blobs()][];
        for (int b = 0; b < blobs.length; b++) {
            double[] c = spec.background().blobCounts();
            double[] sd = spec.background().blobSdUm();
            blobs[b] = new double[] {width * bg.nextDouble(), height * bg.nextDouble(),
                    c[0] + (c[1] - c[0]) * bg.nextDouble(), sd[0] + (sd[1] - sd[0]) * bg.nextDouble()};
        }
        double angle = 2 * Math.PI * bg.nextDouble();
        this.gradient = new double[] {Math.cos(angle), Math.sin(angle)};

        int steps = im.frames() * TIME_STEPS_PER_FRAME;
        this.timeGrid = new double[steps + 1];
        for (int j = 0; j <= steps; j++) {
            timeGrid[j] = j * im.frameIntervalS() / TIME_STEPS_PER_FRAME;
        }

        // The map covers the image, the blur's padding and the largest shift.
        this.mapStep = 1.0 / (os * MAP_PER_FINE);
        double extent = pad / (double) os + maxShift + 1;
        int marginNodes = (int) Math.ceil(extent / mapStep);
        this.mapX0 = -marginNodes * mapStep;
        this.mapY0 = -marginNodes * mapStep;
        this.mapNx = width * os * MAP_PER_FINE + 2 * marginNodes + 1;
        this.mapNy = height * os * MAP_PER_FINE + 2 * marginNodes + 1;
        this.mapArcUm = new float[mapNx * mapNy];
        this.mapDistUm = new float[mapNx * mapNy];
        buildMap();

        double sLo = Double.POSITIVE_INFINITY;
        double sHi = Double.NEGATIVE_INFINITY;
        for (float s : mapArcUm) {
            if (!Float.isNaN(s)) {
                sLo = Math.min(sLo, s);
                sHi = Math.max(sHi, s);
            }
        }
        for (SpineGeometry sp : spines) {
            if (sp.axisUm() > sLo - 5 && sp.axisUm() < sHi + 5) {
                sLo = Math.min(sLo, sp.axisUm());
                sHi = Math.max(sHi, sp.axisUm());
            }
        }
        this.signal = signalField(spec.signal(), Math.max(0, sLo - 1), Math.min(axisLengthUm, sHi + 1));
        this.headSeries = new double[spines.size()][];
        for (int i = 0; i < spines.size(); i++) {
            headSeries[i] = headSeries(spines.get(i));
        }
    }

    /** An independent random stream per part of the scene, from the master seed and the part's name. */
    SplittableRandom stream(String part) {
        long h = spec.seed() * 0x9E3779B97F4A7C15L;
        for (char c : part.toCharArray()) {
            h = (h ^ c) * 0xBF58476D1CE4E5B9L;
            h ^= h >>> 31;
        }
        return new SplittableRandom(h);
    }

    static double maxBlurSigmaUm(SessionSpec spec) {
        double sigma = spec.optics().psfSigmaUm();
        int z = spec.imaging().zSlices();
        double farthest = (z - 1) / 2.0 * spec.imaging().zStepUm();
        double ratio = farthest / spec.optics().axialSigmaUm();
        return sigma * Math.sqrt(1 + ratio * ratio);
    }

    // ---------------------------------------------------------------------------------------------------------
    // Tables along the axis

    double radiusUm(double sUm) {
        return table(radiusTable, sUm);
    }

    double loading(double sUm) {
        return table(loadingTable, sUm);
    }

    static double table(double[] t, double sUm) {
        double p = sUm / TABLE_STEP_UM;
        if (p <= 0) {
            return t[0];
        }
        int i = (int) p;
        if (i >= t.length - 1) {
            return t[t.length - 1];
        }
        double w = p - i;
        return (1 - w) * t[i] + w * t[i + 1];
    }

    // ---------------------------------------------------------------------------------------------------------
    // Motion

    private static void motion(SessionSpec spec, SplittableRandom random, double[] sx, double[] sy) {
        SessionSpec.Motion m = spec.motion();
        double px = spec.imaging().pixelSizeUm();
        int n = sx.length;
        for (int f = 0; f < n; f++) {
            double u = n > 1 ? f / (n - 1.0) : 0;
            double x = m.driftXUm() * u;
            double y = m.driftYUm() * u;
            if (m.jumpFrame() >= 0 && f >= m.jumpFrame()) {
                x += m.jumpXUm();
                y += m.jumpYUm();
            }
            if (m.jitterSdUm() > 0) {
                x += m.jitterSdUm() * random.nextGaussian();
                y += m.jitterSdUm() * random.nextGaussian();
            }
            sx[f] = x / px;
            sy[f] = y / px;
        }
    }

    // ---------------------------------------------------------------------------------------------------------
    // The axis

    private Polyline axisCurve(SessionSpec.Dendrite d, Random random) {
        double theta = Math.toRadians(tiltDeg);
        double dx = Math.cos(theta);
        double dy = Math.sin(theta);
        // Past both edges by 10 um, so the dendrite goes on beyond the field.
        double half = width / 2.0 / Math.max(0.5, Math.abs(dx)) + 10 / px;
        int n = d.controlPoints();
        double[] u = new double[n];
        double[] cx = new double[n];
        double[] cy = new double[n];
        for (int i = 0; i < n; i++) {
            u[i] = i;
            double along = -half + 2 * half * i / (n - 1.0);
            double side = d.bendUm() / px * (2 * random.nextDouble() - 1);
            cx[i] = width / 2.0 + along * dx - side * dy;
            cy[i] = height / 2.0 + along * dy + side * dx;
        }
        SplineInterpolator interpolator = new SplineInterpolator();
        PolynomialSplineFunction fx = interpolator.interpolate(u, cx);
        PolynomialSplineFunction fy = interpolator.interpolate(u, cy);
        int samples = (int) Math.ceil(2 * half / 0.1) + 1;
        double[] x = new double[samples];
        double[] y = new double[samples];
        for (int i = 0; i < samples; i++) {
            double t = (n - 1) * i / (samples - 1.0);
            x[i] = fx.value(t);
            y[i] = fy.value(t);
        }
        return new Polyline(x, y);
    }

    /** The longest stretch of the axis (arc lengths in pixels) whose points lie at least marginPx inside the image. */
    private double[] usableStretch(double marginPx) {
        double best0 = 0;
        double best1 = 0;
        double start = Double.NaN;
        double step = 0.25;
        for (double s = 0; s <= axis.length(); s += step) {
            double[] p = axis.point(s);
            boolean inside = p[0] >= marginPx && p[0] <= width - marginPx && p[1] >= marginPx
                    && p[1] <= height - marginPx;
            if (inside && Double.isNaN(start)) {
                start = s;
            }
            if ((!inside || s + step > axis.length()) && !Double.isNaN(start)) {
                if (s - start > best1 - best0) {
                    best0 = start;
                    best1 = s;
                }
                start = Double.NaN;
            }
        }
        if (best1 - best0 < 10 / px) {
            throw new IllegalStateException("the dendrite stays inside the image for less than 10 um; make the image "
                    + "larger or the dendrite straighter (seed " + spec.seed() + ")");
        }
        return new double[] {best0, best1};
    }

    /** Tightest radius of curvature of the axis inside the image, um, from turning angles over 1-pixel steps. */
    double minCurvatureRadiusUm() {
        double best = Double.POSITIVE_INFINITY;
        double step = 1;
        for (double s = step; s + step <= axis.length(); s += step) {
            double[] p = axis.point(s);
            if (p[0] < 0 || p[0] > width || p[1] < 0 || p[1] > height) {
                continue;
            }
            double[] t0 = axis.tangent(s - step);
            double[] t1 = axis.tangent(s + step);
            double turn = Math.abs(Math.atan2(t0[0] * t1[1] - t0[1] * t1[0], t0[0] * t1[0] + t0[1] * t1[1]));
            if (turn > 0) {
                best = Math.min(best, 2 * step / turn * px);
            }
        }
        return best;
    }

    // ---------------------------------------------------------------------------------------------------------
    // The drawn path

    private Polyline drawnPath(SessionSpec.DrawnPath p, double[] usable, SplittableRandom random) {
        double inset = p.endInsetUm() / px;
        double s0 = usable[0] + inset;
        double s1 = usable[1] - inset;
        double sdPx = p.offsetSdUm() / px;
        List<double[]> points = new ArrayList<>();
        if (p.style() == SessionSpec.PathStyle.POLYLINE) {
            int n = p.vertices();
            double spacing = (s1 - s0) / (n - 1);
            for (int i = 0; i < n; i++) {
                double s = s0 + i * spacing;
                if (i > 0 && i < n - 1) {
                    s += spacing * 0.25 * (2 * random.nextDouble() - 1);
                }
                double off = sdPx * Math.max(-3, Math.min(3, random.nextGaussian()));
                double[] q = axis.point(s);
                double[] nrm = axis.normal(s);
                points.add(new double[] {q[0] + off * nrm[0], q[1] + off * nrm[1]});
            }
        } else {
            // A hand's wobble: smooth, of the given sd; vertices at whole ImageJ coordinates, as the mouse gives them.
            SmoothField wobble = new SmoothField(new Random(random.nextLong()), 1.5 / px);
            for (double s = s0; s <= s1; s += 1) {
                double off = sdPx * wobble.value(s);
                double[] q = axis.point(s);
                double[] nrm = axis.normal(s);
                double rx = Math.round(q[0] + off * nrm[0] - 0.5) + 0.5;
                double ry = Math.round(q[1] + off * nrm[1] - 0.5) + 0.5;
                double[] last = points.isEmpty() ? null : points.get(points.size() - 1);
                if (last == null || last[0] != rx || last[1] != ry) {
                    points.add(new double[] {rx, ry});
                }
            }
        }
        double[] x = new double[points.size()];
        double[] y = new double[points.size()];
        for (int i = 0; i < x.length; i++) {
            x[i] = points.get(i)[0];
            y[i] = points.get(i)[1];
        }
        return new Polyline(x, y);
    }

    // ---------------------------------------------------------------------------------------------------------
    // Spines and the intruder

    /** Where a spine leaves the axis. */
    private record Base(double axisUm, int side, boolean stimulated) {
    }

    private List<SpineGeometry> spines(SessionSpec.Spines s, SplittableRandom random) {
        List<Base> bases = new ArrayList<>();
        if (s.perUm() > 0) {
            double pos = -Math.log(1 - random.nextDouble()) / s.perUm();
            while (pos < axisLengthUm) {
                bases.add(new Base(pos, random.nextBoolean() ? 1 : -1, false));
                pos += -Math.log(1 - random.nextDouble()) / s.perUm();
            }
        }
        int stimulatedSide = random.nextBoolean() ? 1 : -1;
        if (s.stimulatedSpine() && s.perUm() > 0) {
            bases.removeIf(b -> b.side() == stimulatedSide && Math.abs(b.axisUm() - stimulusAxisUm) < s.minGapUm());
            bases.add(new Base(stimulusAxisUm, stimulatedSide, true));
        }
        bases.sort(Comparator.comparingDouble(Base::axisUm));
        List<SpineGeometry> out = new ArrayList<>();
        double[] lastOnSide = {Double.NEGATIVE_INFINITY, Double.NEGATIVE_INFINITY};
        for (Base b : bases) {
            int sideIndex = b.side() > 0 ? 0 : 1;
            // Draw every spine's properties even if it is dropped, so that the others do not depend on the gap rule.
            double[] hr = s.headRadiusUm();
            double[] nl = s.neckLengthUm();
            double[] br = s.brightness();
            double[] tau = s.tauNeckS();
            double head = hr[0] + (hr[1] - hr[0]) * random.nextDouble();
            double neck = nl[0] + (nl[1] - nl[0]) * random.nextDouble();
            double bright = br[0] + (br[1] - br[0]) * random.nextDouble();
            double tauNeck = tau[0] * Math.pow(tau[1] / tau[0], random.nextDouble());
            double tilt = Math.toRadians(25) * (2 * random.nextDouble() - 1);
            if (!b.stimulated() && b.axisUm() - lastOnSide[sideIndex] < s.minGapUm()) {
                continue;
            }
            lastOnSide[sideIndex] = b.axisUm();
            double sPx = b.axisUm() / px;
            double[] q = axis.point(sPx);
            double[] nrm = axis.normal(sPx);
            double[] tan = axis.tangent(sPx);
            double ex = b.side() * (nrm[0] * Math.cos(tilt) + tan[0] * Math.sin(tilt));
            double ey = b.side() * (nrm[1] * Math.cos(tilt) + tan[1] * Math.sin(tilt));
            double r = radiusUm(b.axisUm());
            out.add(new SpineGeometry(b.axisUm(), b.side(), q[0] + ex * r / px, q[1] + ey * r / px,
                    q[0] + ex * (r + neck + head) / px, q[1] + ey * (r + neck + head) / px, head, neck, bright,
                    tauNeck, b.stimulated()));
        }
        return List.copyOf(out);
    }

    private IntruderGeometry intruder(SessionSpec.Intruder in, SplittableRandom random) {
        double sUm = drawnAxisRangeUm[0] + in.positionFraction() * (drawnAxisRangeUm[1] - drawnAxisRangeUm[0]);
        int side = random.nextBoolean() ? 1 : -1;
        double[] q = axis.point(sUm / px);
        double[] nrm = axis.normal(sUm / px);
        return new IntruderGeometry(sUm, q[0], q[1], side * nrm[0], side * nrm[1]);
    }

    // ---------------------------------------------------------------------------------------------------------
    // The shaft map

    private void buildMap() {
        Arrays.fill(mapArcUm, Float.NaN);
        Arrays.fill(mapDistUm, Float.NaN);
        double[] best = new double[mapNx * mapNy];
        Arrays.fill(best, Double.POSITIVE_INFINITY);
        double reach = maxRadiusUm / px + 2 * mapStep;
        for (int i = 0; i + 1 < axis.size(); i++) {
            double x0 = axis.x(i);
            double y0 = axis.y(i);
            double ex = axis.x(i + 1) - x0;
            double ey = axis.y(i + 1) - y0;
            double len2 = ex * ex + ey * ey;
            double len = Math.sqrt(len2);
            int ia = (int) Math.floor((Math.min(x0, x0 + ex) - reach - mapX0) / mapStep);
            int ib = (int) Math.ceil((Math.max(x0, x0 + ex) + reach - mapX0) / mapStep);
            int ja = (int) Math.floor((Math.min(y0, y0 + ey) - reach - mapY0) / mapStep);
            int jb = (int) Math.ceil((Math.max(y0, y0 + ey) + reach - mapY0) / mapStep);
            ia = Math.max(0, ia);
            ja = Math.max(0, ja);
            ib = Math.min(mapNx - 1, ib);
            jb = Math.min(mapNy - 1, jb);
            for (int j = ja; j <= jb; j++) {
                double py = mapY0 + j * mapStep;
                for (int k = ia; k <= ib; k++) {
                    double pxx = mapX0 + k * mapStep;
                    double u = Math.max(0, Math.min(1, ((pxx - x0) * ex + (py - y0) * ey) / len2));
                    double qx = pxx - (x0 + u * ex);
                    double qy = py - (y0 + u * ey);
                    double dist = Math.sqrt(qx * qx + qy * qy);
                    int idx = j * mapNx + k;
                    if (dist < best[idx] && dist <= reach) {
                        best[idx] = dist;
                        double cross = ex * (py - y0) - ey * (pxx - x0);
                        mapArcUm[idx] = (float) ((axis.arcAt(i) + u * len) * px);
                        mapDistUm[idx] = (float) ((cross >= 0 ? dist : -dist) * px);
                    }
                }
            }
        }
    }

    // ---------------------------------------------------------------------------------------------------------
    // Signals

    private SignalField signalField(SessionSpec.Signal s, double sLoUm, double sHiUm) {
        if (s instanceof SessionSpec.GaussianPulse p) {
            return new SignalField.Pulse(p.dUm2PerS(), p.kPerS(), p.sigma0Um(), p.amplitude(), p.timeS(),
                    stimulusAxisUm);
        }
        if (s instanceof SessionSpec.PulsePair pair) {
            SessionSpec.GaussianPulse a = pair.first();
            SessionSpec.GaussianPulse b = pair.second();
            SignalField one = new SignalField.Pulse(a.dUm2PerS(), a.kPerS(), a.sigma0Um(), a.amplitude(), a.timeS(),
                    stimulusAxisUm);
            SignalField two = new SignalField.Pulse(b.dUm2PerS(), b.kPerS(), b.sigma0Um(), b.amplitude(), b.timeS(),
                    secondAxisUm);
            return (sUm, tS) -> one.value(sUm, tS) + two.value(sUm, tS);
        }
        if (s instanceof SessionSpec.NagumoFront f) {
            return new SignalField.Front(f.dUm2PerS(), f.kPerS(), f.a(), f.amplitude(), f.timeS(),
                    drawnAxisRangeUm[0]);
        }
        return new SignalField.Kick((SessionSpec.NagumoKick) s, stimulusAxisUm, sLoUm, sHiUm, timeGrid);
    }

    /** The signal's own decay rate, used inside spine heads too (0 for the bistable models). */
    double headDecayPerS() {
        if (spec.signal() instanceof SessionSpec.PulsePair pair) {
            return pair.first().kPerS();
        }
        return spec.signal() instanceof SessionSpec.GaussianPulse p ? p.kPerS() : 0;
    }

    private double[] headSeries(SpineGeometry sp) {
        double kick = sp.stimulated() ? spec.spines().stimulatedHeadDeltaF() : 0;
        if (!spec.spines().carrySignal()) {
            return new double[timeGrid.length];
        }
        return HeadExchange.integrate(t -> signal.value(sp.axisUm(), t), sp.tauNeckS(), headDecayPerS(),
                spec.signal().timeS(), kick, timeGrid);
    }

    /** A head's dF/F0 at time t, linear between the stored times. */
    double headValue(int spine, double tS) {
        double[] series = headSeries[spine];
        double p = tS / timeGrid[1];
        if (p <= 0) {
            return series[0];
        }
        int i = (int) p;
        if (i >= series.length - 1) {
            return series[series.length - 1];
        }
        double w = p - i;
        return (1 - w) * series[i] + w * series[i + 1];
    }
}
