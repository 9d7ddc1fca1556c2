package org.dendrokin.ij1;

import java.util.Locale;

import ij.ImagePlus;
import ij.measure.Calibration;

/**
 * What an image's ImageJ calibration says about pixel size and frame interval, converted to um and s.
 * A value is NaN when the image does not know it (uncalibrated pixels, no frame interval), so that the
 * dialog can ask for it instead of silently assuming 1.
 *
 * @param pixelSizeUm   width of one pixel, um (NaN if unknown or not square)
 * @param frameIntervalS time between frames, s (NaN if unknown)
 * @param valueUnit      unit of the pixel values as ImageJ knows it ("" if none)
 */
public record ImageSettings(double pixelSizeUm, double frameIntervalS, String valueUnit) {

    /** Reads the calibration of {@code image}. */
    public static ImageSettings of(ImagePlus image) {
        Calibration cal = image.getCalibration();
        double size = Double.NaN;
        if (cal.scaled() && Math.abs(cal.pixelWidth - cal.pixelHeight) <= 1e-6 * cal.pixelWidth) {
            size = cal.pixelWidth * metresPerUnit(cal.getXUnit()) / 1e-6;
        }
        double interval = Double.NaN;
        if (cal.frameInterval > 0) {
            interval = cal.frameInterval * secondsPerUnit(cal.getTimeUnit());
        }
        String value = cal.getValueUnit();
        return new ImageSettings(size, interval, value == null || value.equals("Gray Value") ? "" : value);
    }

    /** Metres in one of ImageJ's length units; NaN for "pixel" and for units it does not recognise. */
    static double metresPerUnit(String unit) {
        String u = unit == null ? "" : unit.trim().toLowerCase(Locale.ROOT);
        return switch (u) {
            case "um", "µm", "μm", "micron", "microns", "micrometer", "micrometers", "micrometre", "micrometres" -> 1e-6;
            case "nm", "nanometer", "nanometers", "nanometre", "nanometres" -> 1e-9;
            case "mm", "millimeter", "millimeters", "millimetre", "millimetres" -> 1e-3;
            case "cm", "centimeter", "centimeters", "centimetre", "centimetres" -> 1e-2;
            case "m", "meter", "meters", "metre", "metres" -> 1.0;
            default -> Double.NaN;
        };
    }

    /** Seconds in one of ImageJ's time units; NaN for units it does not recognise (e.g. "frame"). */
    static double secondsPerUnit(String unit) {
        String u = unit == null ? "" : unit.trim().toLowerCase(Locale.ROOT);
        return switch (u) {
            case "s", "sec", "secs", "second", "seconds" -> 1.0;
            case "ms", "msec", "millisecond", "milliseconds" -> 1e-3;
            case "us", "µs", "μs", "microsecond", "microseconds" -> 1e-6;
            case "min", "mins", "minute", "minutes" -> 60.0;
            case "h", "hr", "hour", "hours" -> 3600.0;
            default -> Double.NaN;
        };
    }
}
