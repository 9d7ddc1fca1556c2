package org.dendrokin.io.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

import org.dendrokin.core.calib.DynamicRange;
import org.dendrokin.core.calib.FittedHill;
import org.dendrokin.core.calib.Hill;
import org.dendrokin.core.calib.MonotoneTable;
import org.dendrokin.core.calib.NoCalibration;
import org.dendrokin.core.calib.Ratio;
import org.dendrokin.core.calib.SingleWavelength;
import org.dendrokin.io.InputException;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

class CalibrationConfigTest {
    @TempDir
    Path dir;

    private CalibrationSetup parse(String block) {
        return CalibrationConfig.parse(JsonParser.parseString(block).getAsJsonObject(), dir.resolve("session.json"));
    }

    private InputException bad(String block) {
        return assertThrows(InputException.class, () -> parse(block));
    }

    @Test
    void readsEveryContractMethod() {
        assertInstanceOf(NoCalibration.class, parse("{\"method\": \"none\"}").calibration());
        CalibrationSetup sw = parse("{\"method\": \"single-wavelength\", \"kd_uM\": 0.345, \"f_min\": 100, "
                + "\"f_max\": 1000, \"kd_uM_sd\": 0.02}");
        assertInstanceOf(SingleWavelength.class, sw.calibration());
        // REF: GPT85 worked example, Kd 0.345 uM, Fmin 100, Fmax 1000, F 400 [published formula]; sheet s1.1
        assertEquals(0.1725, sw.calibration().concentrationMicromolar(400), 1e-12);
        assertEquals(0.02, sw.calibration().constants().get("kd_uM_sd"), 0.0);
        assertInstanceOf(DynamicRange.class, parse("{\"method\": \"dynamic-range\", \"kd_uM\": 0.345, \"rf\": 100, "
                + "\"resting_uM\": 0.05}").calibration());
        CalibrationSetup ratio = parse("{\"method\": \"ratio\", \"kd_uM\": 0.224, \"r_min\": 0.3, \"r_max\": 6, "
                + "\"beta\": 5, \"numerator_channel\": 2, \"denominator_channel\": 1}");
        assertInstanceOf(Ratio.class, ratio.calibration());
        assertEquals(2, ratio.channels().numerator());
        assertInstanceOf(Hill.class, parse("{\"method\": \"hill\", \"k_half_uM\": 0.144, \"n\": 2.9, \"f_min\": 1, "
                + "\"f_max\": 10}").calibration());
        CalibrationSetup limits = parse("{\"method\": \"none\", \"flag_saturation_above\": 0.7, "
                + "\"reject_saturation_above\": 0.9}");
        assertEquals(0.7, limits.limits().flagAbove(), 0.0);
        assertTrue(parse("{\"method\": \"hill\", \"k_half_uM\": 0.144, \"n\": 2.9, \"f_min\": 1, \"f_max\": 10, "
                + "\"kd\": 3}").warnings().get(0).contains("calibration.kd"), "unknown keys are reported");
    }

    @Test
    void namesTheFileAndKeyOfEachBadValue() {
        InputException e = bad("{\"method\": \"single-wavelength\", \"kd_uM\": 0.3, \"f_min\": 1000, \"f_max\": 100}");
        assertTrue(e.getMessage().contains("session.json") && e.getMessage().contains("calibration.f_max")
                && e.getMessage().contains("calibration.f_min"), e.getMessage());
        e = bad("{\"method\": \"single-wavelength\", \"kd_uM\": 0, \"f_min\": 100, \"f_max\": 1000}");
        assertTrue(e.getMessage().contains("calibration.kd_uM"), e.getMessage());
        e = bad("{\"method\": \"hill\", \"k_half_uM\": -1, \"n\": 2, \"f_min\": 1, \"f_max\": 10}");
        assertTrue(e.getMessage().contains("calibration.k_half_uM"), e.getMessage());
        e = bad("{\"method\": \"ratio\", \"kd_uM\": 0.2, \"r_min\": 0.3, \"r_max\": 6}");
        assertTrue(e.getMessage().contains("calibration.beta") && e.getMessage().contains("missing"), e.getMessage());
        e = bad("{\"method\": \"dynamic-range\", \"kd_uM\": 0.2, \"rf\": 0.5, \"resting_uM\": 0.05}");
        assertTrue(e.getMessage().contains("calibration.rf"), e.getMessage());
        e = bad("{\"method\": \"single-wavelength\", \"kd_uM\": \"big\", \"f_min\": 1, \"f_max\": 10}");
        assertTrue(e.getMessage().contains("calibration.kd_uM") && e.getMessage().contains("number"), e.getMessage());
        e = bad("{\"method\": \"magic\"}");
        assertTrue(e.getMessage().contains("calibration.method"), e.getMessage());
        assertEquals(1, e.getMessage().split("\n").length, "one line");
    }

    @Test
    void standardsFromATableOrACalibrationFile() throws IOException {
        StringBuilder csv = new StringBuilder("concentration_uM,intensity\n");
        double[] levels = {0, 0.025, 0.05, 0.1, 0.2, 0.4, 0.8, 1.6, 100};
        for (double c : levels) {
            double f = 1 + 9 * Math.pow(c, 2.9) / (Math.pow(c, 2.9) + Math.pow(0.144, 2.9));
            csv.append(c).append(',').append(f).append('\n');
        }
        Files.writeString(dir.resolve("standards.csv"), csv);
        CalibrationSetup fitted = parse("{\"method\": \"standards\", \"table\": \"standards.csv\"}");
        assertInstanceOf(FittedHill.class, fitted.calibration());
        assertEquals("standards.csv", fitted.sourceFile());
        // REF: noiseless Hill standards give K back [common practice]; sheet s1.7
        assertEquals(0.144, ((FittedHill) fitted.calibration()).curve().kHalfMicromolar(), 1e-6);
        assertInstanceOf(MonotoneTable.class,
                parse("{\"method\": \"standards\", \"table\": \"standards.csv\", \"monotone\": true}").calibration());

        Path table = dir.resolve("standards.csv");
        CalibrationBuilder.Built built = CalibrationBuilder.fromStandards(StandardsCsv.read(table),
                false, dir.resolve("standards.csv"), "standards.csv", null);
        CalibrationFile.write(built.json(), dir.resolve("calibration.json"));
        CalibrationSetup fromFile = parse("{\"method\": \"standards\", \"file\": \"calibration.json\"}");
        assertEquals(built.calibration().concentrationMicromolar(5.0),
                fromFile.calibration().concentrationMicromolar(5.0), 1e-12, "same curve after a save and load");
        assertNotNull(((FittedHill) fromFile.calibration()).covariance(), "covariance kept");
        assertEquals(built.calibration().concentrationSdMicromolar(5.0),
                fromFile.calibration().concentrationSdMicromolar(5.0), 1e-15, "same uncertainty after a save and load");
    }

    @Test
    void badTablesNameTheTableAndLine() throws IOException {
        Files.writeString(dir.resolve("few.csv"), "concentration_uM,intensity\n0,1\n0.1,4\n1,9\n");
        InputException e = bad("{\"method\": \"standards\", \"table\": \"few.csv\"}");
        assertTrue(e.getMessage().contains("few.csv") && e.getMessage().contains("at least 5"), e.getMessage());
        Files.writeString(dir.resolve("bumpy.csv"), "concentration_uM,intensity\n0,1\n1,5\n2,4\n3,9\n4,9.5\n");
        e = bad("{\"method\": \"standards\", \"table\": \"bumpy.csv\", \"monotone\": true}");
        assertTrue(e.getMessage().contains("bumpy.csv") && e.getMessage().contains("not monotone")
                && e.getMessage().contains("calibration.monotone"), e.getMessage());
        Files.writeString(dir.resolve("typo.csv"), "concentration_uM,intensity\n# a comment\n0,1\n0.1,x\n");
        e = assertThrows(InputException.class, () -> StandardsCsv.read(dir.resolve("typo.csv")));
        assertTrue(e.getMessage().contains("typo.csv") && e.getMessage().contains("line 4")
                && e.getMessage().contains("intensity"), e.getMessage());
        Files.writeString(dir.resolve("header.csv"), "c,F\n0,1\n");
        e = assertThrows(InputException.class, () -> StandardsCsv.read(dir.resolve("header.csv")));
        assertTrue(e.getMessage().contains("line 1") && e.getMessage().contains("concentration_uM"), e.getMessage());
    }

    @Test
    void aMissingTableOrFileNamesTheKey() {
        InputException e = bad("{\"method\": \"standards\", \"table\": \"absent.csv\"}");
        assertTrue(e.getMessage().contains("session.json") && e.getMessage().contains("calibration.table")
                && e.getMessage().contains("absent.csv"), e.getMessage());
        e = bad("{\"method\": \"file\", \"file\": \"absent.json\"}");
        assertTrue(e.getMessage().contains("calibration.file") && e.getMessage().contains("absent.json"),
                e.getMessage());
    }

    @Test
    void aBrokenCalibrationFileNamesItsKey() throws IOException {
        Files.writeString(dir.resolve("calibration.json"), "{\"dendrokin_calibration\": 1, \"method\": \"standards\", "
                + "\"form\": \"hill\", \"constants\": {\"f_min\": 1, \"f_max\": 10, \"n\": 2}}");
        InputException e = bad("{\"method\": \"standards\", \"file\": \"calibration.json\"}");
        assertTrue(e.getMessage().contains("calibration.json") && e.getMessage().contains("constants.k_half_uM"),
                e.getMessage());
        JsonObject none = null;
        assertInstanceOf(NoCalibration.class, CalibrationConfig.parse(none, dir.resolve("session.json")).calibration());
    }
}
