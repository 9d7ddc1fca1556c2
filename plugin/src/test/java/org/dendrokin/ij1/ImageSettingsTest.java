package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import ij.ImagePlus;
import ij.measure.Calibration;
import ij.process.ByteProcessor;

import org.junit.jupiter.api.Test;

class ImageSettingsTest {
    @Test
    void convertsImageJLengthAndTimeUnitsToMicrometresAndSeconds() {
        ImagePlus image = new ImagePlus("t", new ByteProcessor(4, 4));
        Calibration cal = image.getCalibration();
        cal.pixelWidth = 160;
        cal.pixelHeight = 160;
        cal.setUnit("nm");
        cal.frameInterval = 250;
        cal.setTimeUnit("ms");
        ImageSettings s = ImageSettings.of(image);
        // REF: SI prefixes, 1 nm = 1e-3 um and 1 ms = 1e-3 s [common practice]
        assertEquals(0.16, s.pixelSizeUm(), 1e-12, "pixel size, um");
        assertEquals(0.25, s.frameIntervalS(), 1e-12, "frame interval, s");
    }

    @Test
    void imageJsMicronSpellingIsMicrometres() {
        ImagePlus image = new ImagePlus("t", new ByteProcessor(4, 4));
        Calibration cal = image.getCalibration();
        cal.pixelWidth = 0.2;
        cal.pixelHeight = 0.2;
        cal.setUnit("micron");
        cal.frameInterval = 2;
        cal.setTimeUnit("min");
        ImageSettings s = ImageSettings.of(image);
        assertEquals(0.2, s.pixelSizeUm(), 1e-12, "pixel size, um");
        assertEquals(120, s.frameIntervalS(), 1e-12, "frame interval, s");
    }

    @Test
    void anUncalibratedImageKnowsNeither() {
        ImageSettings s = ImageSettings.of(new ImagePlus("t", new ByteProcessor(4, 4)));
        assertTrue(Double.isNaN(s.pixelSizeUm()), "pixel size unknown");
        assertTrue(Double.isNaN(s.frameIntervalS()), "frame interval unknown");
    }
}
