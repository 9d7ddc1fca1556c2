package org.dendrokin.core.spines;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Locale;

import org.dendrokin.synth.Truth;
import org.junit.jupiter.api.Test;

/** Spine heads found in the reference image of realistic synthetic movies, against the generator's head centres. */
class SpineDetectorTest {
    @Test
    void headsAreFoundWithinAPixel() {
        int inZone = 0;
        int found = 0;
        int falsePositives = 0;
        int detected = 0;
        double squaredError = 0;
        double worst = 0;
        SpineSettings settings = SpineSettings.defaults();
        for (long seed = 1; seed <= 6; seed++) {
            SyntheticSpines s = SyntheticSpines.of(SyntheticSpines.fastSpec(seed), List.of());
            Truth t = s.truth();
            double px = t.movie().pixelSizeUm();
            SpineDetector.Detection d = SpineDetector.detect(s.inputs.referenceImage(), s.inputs.frames().width(),
                    s.inputs.frames().height(), s.inputs.path(), px, s.inputs.pathWidthUm(), settings);
            PathCoordinates pc = new PathCoordinates(s.inputs.path());
            detected += d.sites().size();
            for (SpineSite site : d.sites()) {
                boolean real = t.spines().stream().anyMatch(h -> Math.hypot(h.headXPx() - site.xPx(),
                        h.headYPx() - site.yPx()) * px < h.headRadiusUm() + 0.2);
                falsePositives += real ? 0 : 1;
            }
            for (Truth.Spine h : t.spines()) {
                double[] place = pc.locate(h.headXPx(), h.headYPx());
                double offUm = Math.abs(place[1]) * px;
                // Heads well inside the search zone (and the image) are the ones that must be found.
                if (place[2] != 0 || offUm < d.minDistanceUm() + 0.2 || offUm > d.maxDistanceUm() - 0.2
                        || h.headXPx() < 3 || h.headYPx() < 3 || h.headXPx() > s.inputs.frames().width() - 3
                        || h.headYPx() > s.inputs.frames().height() - 3) {
                    continue;
                }
                inZone++;
                double best = Double.POSITIVE_INFINITY;
                for (SpineSite site : d.sites()) {
                    best = Math.min(best, Math.hypot(site.xPx() - h.headXPx(), site.yPx() - h.headYPx()));
                }
                if (best * px < h.headRadiusUm()) {
                    found++;
                    squaredError += best * best;
                    worst = Math.max(worst, best);
                }
            }
        }
        double rms = Math.sqrt(squaredError / found);
        System.out.printf(Locale.ROOT, "spine detection: %d of %d heads in the zone found, rms position error %.2f px "
                + "(worst %.2f px); %d of %d detections not at a head%n", found, inZone, rms, worst, falsePositives,
                detected);
        // REF: centroid localisation of a blurred spot to well under a pixel at good signal to noise [common practice]
        assertTrue(rms < 1.0, "rms position error " + rms + " px");
        assertTrue(found >= 0.8 * inZone, found + " of " + inZone + " heads found");
        assertTrue(falsePositives <= 0.1 * detected, falsePositives + " of " + detected + " detections not at a head");
    }
}
