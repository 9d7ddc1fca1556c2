package org.dendrokin.synth;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/** Rigid motion: the scene is moved before rendering, so the image moves with it exactly. */
class MotionTest {
    @Test
    void wholePixelShiftMovesEveryPixel() {
        SessionSpec still = SessionSpec.realistic(9).withCamera(SessionSpec.Camera.noiseless(800))
                .withImaging(SessionSpec.Imaging.standard().withFrames(40));
        double px = still.imaging().pixelSizeUm();
        SessionSpec moved = still.withMotion(new SessionSpec.Motion(0, 0, 0, 3 * px, -2 * px, 0));
        SessionGenerator.Rendering a = SessionGenerator.render(still);
        SessionGenerator.Rendering b = SessionGenerator.render(moved);
        assertArrayEquals(a.truth().path().xPx(), b.truth().path().xPx(), 0,
                "the drawn path does not depend on motion");
        int w = a.width();
        double worst = 0;
        for (int f : new int[] {0, 19, 25, 39}) {
            float[] ea = a.expected()[a.plane(0, 0, f)];
            float[] eb = b.expected()[b.plane(0, 0, f)];
            for (int j = 0; j < a.height() - 2; j++) {
                for (int i = 3; i < w; i++) {
                    float before = ea[(j + 2) * w + i - 3];
                    worst = Math.max(worst, Math.abs(eb[j * w + i] - before) / before);
                }
            }
        }
        // Identity, not an approximation: the moved scene is sampled at the same scene points. Float storage only.
        assertEquals(0, worst, 1e-6, "largest relative difference of the moved image");
    }

    @Test
    void subPixelShiftMovesTheDendritesCentreByTheRecordedShift() {
        for (double tilt : new double[] {0, 90}) {
            SessionSpec spec = SessionSpec.clean(5)
                    .withImaging(SessionSpec.Imaging.standard().withSize(96, 96).withFrames(30))
                    .withDendrite(new SessionSpec.Dendrite(3, 0, tilt, 0.6, 0, 5))
                    .withOptics(SessionSpec.Optics.sigma(0.17))
                    .withCamera(SessionSpec.Camera.noiseless(800))
                    .withMotion(new SessionSpec.Motion(0.3, -0.2, 12, 0.05, 0.11, 0.08));
            SessionGenerator.Rendering r = SessionGenerator.render(spec);
            double offset = spec.camera().offsetCounts();
            int w = r.width();
            int h = r.height();
            boolean across = tilt == 0;
            double worst = 0;
            for (int f = 0; f < r.frames(); f++) {
                // Before the stimulus the dendrite's cross-section is the same everywhere along it.
                if (f * spec.imaging().frameIntervalS() >= spec.signal().timeS()) {
                    break;
                }
                float[] e = r.expected()[r.plane(0, 0, f)];
                double shift = across ? r.truth().motion().shiftYPx()[f] : r.truth().motion().shiftXPx()[f];
                for (int line = 20; line < 76; line += 5) {
                    double sum = 0;
                    double moment = 0;
                    for (int q = 0; q < (across ? h : w); q++) {
                        double v = (across ? e[q * w + line] : e[line * w + q]) - offset;
                        sum += v;
                        moment += v * (q + 0.5);
                    }
                    worst = Math.max(worst, Math.abs(moment / sum - (48 + shift)));
                }
            }
            // The centroid of a symmetric cross-section is its centre; 2 x 2 samples per pixel of a profile blurred
            // to sd 0.17 um resolve it to far below a hundredth of a pixel.
            assertEquals(0, worst, 0.002, "largest centroid error (pixels), tilt " + tilt);
        }
    }

    @Test
    void recordedShiftsAreTheDriftTheJumpAndTheJitter() {
        SessionSpec.Motion m = new SessionSpec.Motion(0.8, -0.4, 70, 0.3, 0.1, 0.05);
        SessionSpec spec = SessionSpec.realistic(4).withMotion(m).withCamera(SessionSpec.Camera.noiseless(800));
        Truth.Motion t = SessionGenerator.render(spec).truth().motion();
        double px = spec.imaging().pixelSizeUm();
        int frames = spec.imaging().frames();
        double sumSq = 0;
        for (int f = 0; f < frames; f++) {
            double u = f / (frames - 1.0);
            double jx = t.shiftXPx()[f] * px - (m.driftXUm() * u + (f >= 70 ? m.jumpXUm() : 0));
            double jy = t.shiftYPx()[f] * px - (m.driftYUm() * u + (f >= 70 ? m.jumpYUm() : 0));
            sumSq += jx * jx + jy * jy;
        }
        // What is left is the jitter: 2 x 150 Gaussian draws of sd 0.05 um; its sd within 5 standard errors.
        double sd = Math.sqrt(sumSq / (2 * frames));
        assertEquals(m.jitterSdUm(), sd, 5 * m.jitterSdUm() / Math.sqrt(4 * frames), "jitter sd (um)");
    }
}
