package org.dendrokin.core.path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class DendritePathTest {

    @Test
    void straightSegmentHasItsEuclideanLength() {
        DendritePath path = DendritePath.of(new double[] {1.5, 31.5}, new double[] {2.5, 42.5}, false);
        // REF: Pythagoras, 30-40-50 right triangle [common practice]
        assertEquals(50.0, path.lengthPx(), 1e-12, "length (px)");
    }

    @Test
    void polylineLengthIsTheSumOfItsSegments() {
        DendritePath path = DendritePath.of(new double[] {0, 3, 8}, new double[] {0, 4, 16}, false);
        // REF: 3-4-5 and 5-12-13 right triangles [common practice]
        assertEquals(18.0, path.lengthPx(), 1e-12, "length (px)");
    }

    @Test
    void circularArcApproachesRadiusTimesAngle() {
        double radius = 40;
        double angle = 2.0;  // rad
        for (int segments : new int[] {8, 64, 512}) {
            double[] x = new double[segments + 1];
            double[] y = new double[segments + 1];
            for (int i = 0; i <= segments; i++) {
                x[i] = 100 + radius * Math.cos(angle * i / segments);
                y[i] = 100 + radius * Math.sin(angle * i / segments);
            }
            double length = DendritePath.of(x, y, false).lengthPx();
            // REF: chord length 2 R sin(theta / 2) for each of N equal chords [common practice]
            assertEquals(segments * 2 * radius * Math.sin(angle / (2 * segments)), length, 1e-9, "chord sum (px)");
            // REF: arc length R theta; chords fall short by about R theta^3 / (24 N^2) [common practice]
            assertEquals(radius * angle, length, radius * Math.pow(angle, 3) / (20.0 * segments * segments),
                    "arc length (px), " + segments + " chords");
        }
    }

    @Test
    void resamplesAnLShapeAtExactArcPositions() {
        DendritePath path = DendritePath.of(new double[] {0.5, 10.5, 10.5}, new double[] {0.5, 0.5, 10.5}, false);
        double step = 0.75;
        ResampledPath r = path.resample(step);
        // REF: floor(L / step) + 1 samples at s = k step along the L, placed by hand [common practice]
        assertEquals(27, r.size(), "sample count");
        double[] x = r.xPx();
        double[] y = r.yPx();
        double[] arc = r.arcPx();
        for (int k = 0; k < r.size(); k++) {
            double s = k * step;
            assertEquals(s, arc[k], 1e-12, "arc position (px)");
            assertEquals(s <= 10 ? 0.5 + s : 10.5, x[k], 1e-12, "x of sample " + k);
            assertEquals(s <= 10 ? 0.5 : 0.5 + s - 10, y[k], 1e-12, "y of sample " + k);
        }
    }

    @Test
    void resampledSpacingIsUniformOnACurve() {
        int segments = 400;
        double radius = 30;
        double[] x = new double[segments + 1];
        double[] y = new double[segments + 1];
        for (int i = 0; i <= segments; i++) {
            x[i] = radius * Math.cos(Math.PI * i / segments);
            y[i] = radius * Math.sin(Math.PI * i / segments);
        }
        double step = 1.3;
        ResampledPath r = DendritePath.of(x, y, false).resample(step);
        double[] rx = r.xPx();
        double[] ry = r.yPx();
        for (int k = 1; k < r.size(); k++) {
            double chord = Math.hypot(rx[k] - rx[k - 1], ry[k] - ry[k - 1]);
            // REF: chord of arc length h on a circle of radius R is 2 R sin(h / 2R) [common practice]
            assertEquals(2 * radius * Math.sin(step / (2 * radius)), chord, 1e-4, "spacing (px) at sample " + k);
            assertEquals(radius, Math.hypot(rx[k], ry[k]), 1e-3, "sample " + k + " lies on the circle");
        }
    }

    @Test
    void tangentsFollowSegmentsAndBisectCorners() {
        DendritePath path = DendritePath.of(new double[] {0, 4, 4}, new double[] {0, 0, 4}, false);
        ResampledPath r = path.resample(1.0);
        double[] tx = r.tangentX();
        double[] ty = r.tangentY();
        double[] nx = r.normalX();
        double[] ny = r.normalY();
        // REF: unit direction of each segment; the corner's bisector (1, 1)/sqrt 2 [common practice]
        assertEquals(1.0, tx[1], 1e-12, "tangent x on the first leg");
        assertEquals(0.0, ty[1], 1e-12, "tangent y on the first leg");
        assertEquals(Math.sqrt(0.5), tx[4], 1e-12, "tangent x at the corner");
        assertEquals(Math.sqrt(0.5), ty[4], 1e-12, "tangent y at the corner");
        assertEquals(1.0, ty[6], 1e-12, "tangent y on the second leg");
        for (int k = 0; k < r.size(); k++) {
            assertEquals(0.0, tx[k] * nx[k] + ty[k] * ny[k], 1e-12, "normal is perpendicular at " + k);
            assertEquals(1.0, Math.hypot(nx[k], ny[k]), 1e-12, "normal has unit length at " + k);
        }
    }

    @Test
    void freehandSmoothingRemovesThePixelStaircase() {
        int steps = 60;
        double[] x = new double[2 * steps + 1];
        double[] y = new double[2 * steps + 1];
        for (int i = 0; i <= 2 * steps; i++) {
            x[i] = 0.5 + (i + 1) / 2;
            y[i] = 0.5 + i / 2;
        }
        DendritePath raw = DendritePath.of(x, y, false);
        DendritePath smooth = DendritePath.of(x, y, true);
        assertEquals(2.0 * steps, raw.lengthPx(), 1e-12, "staircase length (px)");
        // REF: (1,2,1)/4 has gain cos^2(w/2), zero at the Nyquist zigzag, so the staircase becomes the diagonal of
        // length sqrt(2) * steps [common practice]; end points stay put, which adds well under 1 %
        assertEquals(Math.sqrt(2) * steps, smooth.lengthPx(), 0.01 * Math.sqrt(2) * steps, "smoothed length (px)");
        assertEquals(0.5, smooth.xPx()[0], 0.0, "first vertex is kept");
        assertEquals(x[x.length - 1], smooth.xPx()[smooth.vertexCount() - 1], 0.0, "last vertex is kept");
    }

    @Test
    void rejectsPathsWithoutLength() {
        IllegalArgumentException single = assertThrows(IllegalArgumentException.class,
                () -> DendritePath.of(new double[] {3, 3, 3}, new double[] {4, 4, 4}, false));
        assertTrue(single.getMessage().contains("zero length"), single.getMessage());
        assertThrows(IllegalArgumentException.class,
                () -> DendritePath.of(new double[] {3}, new double[] {4}, false));
        assertThrows(IllegalArgumentException.class,
                () -> DendritePath.of(new double[] {3, Double.NaN}, new double[] {4, 5}, false));
    }

    @Test
    void pixelCentreOfImageJIsArrayIndex() {
        // REF: ImageJ's convention, pixel i covers [i, i+1) with centre i + 0.5 (our contract) [common practice]
        assertEquals(10.0, PixelConvention.toArrayIndex(10.5), 0.0, "centre of pixel 10");
        assertEquals(-0.5, PixelConvention.toArrayIndex(0.0), 0.0, "left border of the image");
        assertEquals(7.25, PixelConvention.toArrayIndex(PixelConvention.fromArrayIndex(7.25)), 0.0, "round trip");
    }

    @Test
    void aSpotBesideAnArcProjectsOntoItsNearestPoint() {
        // a quarter circle of radius 40 px about (50, 50), as a fine polyline, and a spot 3 px outside it at 30 deg
        int n = 400;
        double[] x = new double[n + 1];
        double[] y = new double[n + 1];
        for (int i = 0; i <= n; i++) {
            double a = Math.PI / 2 * i / n;
            x[i] = 50 + 40 * Math.cos(a);
            y[i] = 50 + 40 * Math.sin(a);
        }
        DendritePath path = DendritePath.of(x, y, false);
        double angle = Math.toRadians(30);
        DendritePath.Projection p = path.project(50 + 43 * Math.cos(angle), 50 + 43 * Math.sin(angle));
        // REF: the nearest point of a circle lies on the ray through the centre; arc length = radius x angle [common practice]
        assertEquals(40 * angle, p.arcLengthPx(), 0.01, "arc length to the nearest point, px");
        assertEquals(3.0, p.offPathPx(), 0.01, "distance off the path, px");
        // beyond the last vertex, along its direction, the nearest point is the end itself
        DendritePath.Projection end = path.project(50 - 5, 90);
        assertEquals(path.lengthPx(), end.arcLengthPx(), 1e-9);
        assertEquals(5.0, end.offPathPx(), 1e-9);
    }
}
