package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import ij.ImagePlus;
import ij.ImageStack;
import ij.measure.Calibration;
import ij.measure.Measurements;
import ij.process.FloatProcessor;
import ij.process.ImageStatistics;

import org.dendrokin.core.kymo.Kymograph;
import org.junit.jupiter.api.Test;

class KymographImageTest {
    private static Kymograph sample() {
        double[] d = {2.0, 2.5, 3.0, 3.5};
        double[] t = {0.0, 0.2, 0.4};
        double[] v = {1, 2, 3, 4, 5, Double.NaN, 7, 8, 9, 10, 11, 12};
        return new Kymograph(d, t, v, "dF/F0");
    }

    @Test
    void imageJReadsDistanceTimeAndUnitsFromTheCalibration() {
        ImagePlus image = KymographImage.toImage(sample(), "k");
        Calibration cal = image.getCalibration();
        assertEquals(32, image.getBitDepth());
        // REF: ImageJ's Calibration.getX/getY, the values its cursor read-out and measurements show [common practice]
        assertEquals(3.0, cal.getX(2), 1e-12, "distance of column 2, um");
        assertEquals(0.4, cal.getY(2), 1e-12, "time of row 2, s");
        assertEquals("µm", cal.getXUnit());
        assertEquals("s", cal.getYUnit());
        assertEquals("dF/F0", cal.getValueUnit());
    }

    @Test
    void imageJsOwnMeanLeavesTheNaNSampleOut() {
        ImagePlus image = KymographImage.toImage(sample(), "k");
        ImageStatistics stats = image.getStatistics(Measurements.MEAN);
        // REF: ImageJ's ImageStatistics of a 32-bit image skips NaN [common practice]; mean of 1..12 without 6
        assertEquals((78.0 - 6.0) / 11.0, stats.mean, 1e-6, "mean signal");
    }

    @Test
    void roundTripKeepsGridValuesAndUnit() {
        Kymograph k = sample();
        Kymograph back = KymographImage.fromImage(KymographImage.toImage(k, "k"));
        assertArrayEquals(k.distancesUm(), back.distancesUm(), 1e-12, "distances, um");
        assertArrayEquals(k.timesS(), back.timesS(), 1e-12, "times, s");
        assertArrayEquals(k.values(), back.values(), 1e-6, "values");
        assertEquals("dF/F0", back.signalUnit());
    }

    @Test
    void aStackOrAnUncalibratedImageIsNotAKymograph() {
        ImageStack stack = new ImageStack(3, 3);
        stack.addSlice(new FloatProcessor(3, 3));
        stack.addSlice(new FloatProcessor(3, 3));
        assertThrows(IllegalArgumentException.class, () -> KymographImage.fromImage(new ImagePlus("s", stack)));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> KymographImage.fromImage(new ImagePlus("plain", new FloatProcessor(3, 3))));
        assertEquals(true, e.getMessage().contains("Image > Properties"), e.getMessage());
    }
}
