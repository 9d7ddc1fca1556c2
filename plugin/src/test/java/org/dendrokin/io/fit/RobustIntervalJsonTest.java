package org.dendrokin.io.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Random;

import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.DiffusionDecayPulse;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.units.Unit;
import org.dendrokin.io.session.ResultsJson;
import org.junit.jupiter.api.Test;

import com.google.gson.JsonElement;
import com.google.gson.JsonObject;

/** results.json says which method made each interval, why, and what the weights assumed. */
class RobustIntervalJsonTest {
    @Test
    void correlatedResidualsGiveARobustIntervalWithItsReasonAndTheModelBasedOnesBeside() {
        int nx = 60;
        int nt = 120;
        double[] x = new double[nx];
        double[] t = new double[nt];
        for (int i = 0; i < nx; i++) {
            x[i] = 0.5 * i;
        }
        for (int i = 0; i < nt; i++) {
            t[i] = 0.25 * i;
        }
        DiffusionDecayPulse m = new DiffusionDecayPulse(x, t, 3, 15, null, Unit.DF_F0);
        double[] v = new double[m.size()];
        m.evaluate(m.pack(0.5, 0.05, 2, 15, 1, 0.1, 3), v, null);
        // noise correlated along the path, as interpolation along a drawn line makes it
        Random random = new Random(33);
        for (int f = 0; f < nt; f++) {
            double e = random.nextGaussian();
            for (int c = 0; c < nx; c++) {
                e = 0.7 * e + Math.sqrt(1 - 0.49) * random.nextGaussian();
                v[f * nx + c] += 0.03 * e;
            }
        }
        KymographFits.Outcome o = KymographFits.fit(new Kymograph(x, t, v, "dF/F0"),
                KymographFits.Setup.of(3, 15).withModels(List.of(DiffusionDecayPulse.NAME)), Progress.NONE);
        JsonObject f = ResultsJson.fits(o).get(0);
        JsonObject d = f.getAsJsonObject("parameters").getAsJsonObject("D");
        assertEquals("robust-profile", d.get("ci_method").getAsString(), d.toString());
        assertTrue(d.get("ci_note").getAsString().contains("Bartlett"), d.toString());
        boolean profileBeside = false;
        for (JsonElement e : d.getAsJsonArray("other_intervals")) {
            profileBeside |= e.getAsJsonObject().get("ci_method").getAsString().equals("profile-likelihood");
        }
        assertTrue(profileBeside, "the profile interval is kept beside: " + d);
        JsonObject noise = f.getAsJsonObject("noise_model");
        assertFalse(noise.get("signal_dependent").getAsBoolean(), noise.toString());
        assertFalse(noise.get("description").getAsString().isBlank());
    }
}
