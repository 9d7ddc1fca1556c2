package org.dendrokin.io.calib;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The shipped calibrated session is exactly what its generator writes. */
class CalibratedSessionGeneratorTest {
    private static final Path SHIPPED = Path.of("..", "test-images", "calibrated-session");

    @Test
    void regeneratesTheShippedSessionByteForByte(@TempDir Path dir) throws IOException {
        CalibratedSessionGenerator.write(dir);
        for (String f : new String[] {"session.json", "standards.csv", "dendrite.roi", "dendrite.tif"}) {
            assertArrayEquals(Files.readAllBytes(SHIPPED.resolve(f)), Files.readAllBytes(dir.resolve(f)), f);
        }
    }

    @Test
    void truthRestsThenPeaksAtTheReleaseSite() {
        // REF: Gaussian plane source with decay, peak M / sqrt(2 pi s0^2) at tau = 0 [published formula: Crank 1975]; sheet s2.2, s2.3
        assertEquals(0.06 + 3.0, CalibratedSessionGenerator.concentrationMicromolar(12, 1.0), 1e-12);
        assertEquals(0.06, CalibratedSessionGenerator.concentrationMicromolar(12, 0.5), 0.0);
    }
}
