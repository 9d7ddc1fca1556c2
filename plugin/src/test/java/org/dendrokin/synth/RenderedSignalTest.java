package org.dendrokin.synth;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The rendered movie against closed forms: on a straight dendrite along x, the image is the product of a
 * cross-section and 1 + dF/F0(x, t), so each pixel's relative change from a frame before the stimulus is the pixel
 * average of dF/F0 convolved with the point-spread function, whatever the cross-section, the band or the loading.
 */
class RenderedSignalTest {
    private static final NormalDistribution UNIT = new NormalDistribution(0, 1);

    @ParameterizedTest(name = "line period {0} s")
    @ValueSource(doubles = {0, 0.003})
    void relativeChangeIsTheBlurredPulseAveragedOverEachPixel(double linePeriodS) {
        double d = 0.6;
        double k = 0.05;
        double s0 = 1.0;
        double amplitude = 1.5;
        double psf = 0.2;
        SessionSpec spec = SessionSpec.clean(11)
                .withImaging(SessionSpec.Imaging.standard().withLinePeriod(linePeriodS))
                .withOptics(SessionSpec.Optics.sigma(psf))
                .withCamera(SessionSpec.Camera.noiseless(1000))
                .withSignal(new SessionSpec.GaussianPulse(d, k, s0, amplitude, 9.75, 0.5));
        SessionGenerator.Rendering r = SessionGenerator.render(spec);
        double px = spec.imaging().pixelSizeUm();
        double centreUm = r.truth().stimulus().xPx() * px;
        double offset = spec.camera().offsetCounts();
        int w = r.width();
        float[] before = r.expected()[r.plane(0, 0, 0)];
        double peakRest = 0;
        for (float v : before) {
            peakRest = Math.max(peakRest, v - offset);
        }
        double worst = 0;
        int checked = 0;
        for (int frame : new int[] {20, 25, 60, 140}) {
            float[] now = r.expected()[r.plane(0, 0, frame)];
            for (int j = 0; j < r.height(); j++) {
                double t = frame * spec.imaging().frameIntervalS() + j * linePeriodS;
                double tau = t - 9.75;
                double var = s0 * s0 + 2 * d * tau + psf * psf;
                double sd = Math.sqrt(var);
                for (int i = 0; i < w; i++) {
                    double rest = before[j * w + i] - offset;
                    if (rest < 0.2 * peakRest) {
                        continue;
                    }
                    double change = (now[j * w + i] - offset) / rest - 1;
                    // REF: Crank 1975 Gaussian pulse with first-order decay [published formula]; sheet s2.2, s2.3
                    // REF: a Gaussian convolved with a Gaussian adds variances [common practice]
                    double x0 = (i * px - centreUm) / sd;
                    double x1 = ((i + 1) * px - centreUm) / sd;
                    double expected = amplitude * s0 * Math.exp(-k * tau) * Math.sqrt(2 * Math.PI) / px
                            * (UNIT.cumulativeProbability(x1) - UNIT.cumulativeProbability(x0));
                    worst = Math.max(worst, Math.abs(change - expected));
                    checked++;
                }
            }
        }
        assertTrue(checked > 1000, "pixels checked: " + checked);
        // Error sources: the 2 x 2 samples per pixel (midpoint rule, about (h / sd)^2 / 24 = 4e-4 of the peak at
        // h = 0.1 um), the signal table (0.02 um steps) and float storage.
        assertEquals(0, worst, 1e-3 * amplitude, "largest error of dF/F0 (dimensionless)");
    }

    @Test
    void frontSpeedIsMcKeansOnTheRenderedFront() {
        double d = 0.5;
        double k = 1;
        double a = 0.2;
        SessionSpec spec = SessionSpec.clean(3)
                .withCamera(SessionSpec.Camera.noiseless(1000))
                .withSignal(new SessionSpec.NagumoFront(d, k, a, 1.0, 5));
        SessionGenerator.Rendering r = SessionGenerator.render(spec);
        double px = spec.imaging().pixelSizeUm();
        double offset = spec.camera().offsetCounts();
        int w = r.width();
        int row = r.height() / 2;
        float[] before = r.expected()[r.plane(0, 0, 0)];
        // Where dF/F0 crosses half the excited state along the axis row, at two times; the front starts left.
        double[] crossing = new double[2];
        // 42.75 pixels apart: not a whole number, so the two crossings do not share their interpolation error.
        int[] frames = {30, 87};
        for (int n = 0; n < 2; n++) {
            float[] now = r.expected()[r.plane(0, 0, frames[n])];
            // Before frame 0 the front's tail is already in the field: take the relative change against a front-free
            // rest level, the same everywhere on a straight even dendrite.
            double rest = (before[row * w + w - 20] - offset) * 1.0;
            double prev = Double.NaN;
            for (int i = 0; i < w; i++) {
                double u = (now[row * w + i] - offset) / rest - 1;
                if (i > 0 && prev >= 0.5 && u < 0.5) {
                    crossing[n] = (i - 0.5 + (prev - 0.5) / (prev - u)) * px;
                    break;
                }
                prev = u;
            }
        }
        // Linear interpolation between pixel centres moves a crossing by far less than 1e-4 um/s over 28.5 s.
        double speed = (crossing[1] - crossing[0]) / ((frames[1] - frames[0]) * spec.imaging().frameIntervalS());
        // REF: McKean 1970 Adv Math 4:209, c = sqrt(2 D k)(1/2 - a) [published formula]; sheet s5.2
        assertEquals(Math.sqrt(2 * d * k) * (0.5 - a), speed, 1e-4, "front speed (um/s)");
        assertEquals(Math.sqrt(2 * d * k) * (0.5 - a), r.truth().signal().frontSpeedUmPerS(), 1e-12,
                "front speed in the truth (um/s)");
    }
}
