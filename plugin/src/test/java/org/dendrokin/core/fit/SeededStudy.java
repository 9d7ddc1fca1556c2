package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;

/**
 * Seeded studies for the global-fit tests: sessions whose kymographs are the closed-form diffusion-decay pulse
 * (Crank 1975) with a shared D and k, each session with its own amplitude, width, baseline and noise level, plus
 * Gaussian noise. Invented numbers, for tests only; every random number comes from the study's seed.
 */
final class SeededStudy {
    static final int POSITIONS = 40;
    static final int FRAMES = 50;
    static final double DX_UM = 0.5;
    static final double DT_S = 0.5;
    static final double T0_S = 4.75;
    static final double X0_UM = 10;

    /** One session with its truth. */
    record Made(GlobalFit.Session session, Kymograph kymograph, double amplitude, double noiseSd) {
    }

    private SeededStudy() {
    }

    /**
     * Sessions with shared D and k.
     *
     * @param snrLow  smallest peak-to-noise ratio (peak amplitude over noise SD)
     * @param snrHigh largest; each session's is log-uniform in between
     */
    static List<Made> sessions(int count, double d, double k, double snrLow, double snrHigh, String prefix,
                               long seed) {
        return sessions(count, d, k, 0, snrLow, snrHigh, prefix, seed);
    }

    /**
     * Sessions whose D differs from cell to cell: each session's D is d exp(spread z), z standard normal.
     *
     * @param dSpread SD of ln D between sessions (0 for a D shared exactly)
     */
    static List<Made> sessions(int count, double d, double k, double dSpread, double snrLow, double snrHigh,
                               String prefix, long seed) {
        Random r = new Random(seed);
        List<Made> out = new ArrayList<>();
        for (int i = 0; i < count; i++) {
            double noise = 0.02 * Math.exp(0.5 * r.nextGaussian());
            double snr = snrLow * Math.exp(r.nextDouble() * Math.log(snrHigh / snrLow));
            double amplitude = snr * noise;
            double width = 1.0 + 0.3 * r.nextDouble();
            double baseline = 0.1 * r.nextGaussian();
            double own = d * Math.exp(dSpread * r.nextGaussian());
            Kymograph kymo = Synthetic.pulse(POSITIONS, FRAMES, DX_UM, DT_S, own, k, amplitude, X0_UM, width, baseline,
                    T0_S, noise, r.nextLong());
            // starting values a few tens of percent off, as a user's own per-session fits or guesses would be
            Map<String, Double> start = Map.of("D", d * Math.exp(0.3 * r.nextGaussian()),
                    "k", k * Math.exp(0.3 * r.nextGaussian()), "amplitude", amplitude * (1 + 0.2 * r.nextGaussian()),
                    "width", width * Math.exp(0.2 * r.nextGaussian()), "baseline", baseline + noise * r.nextGaussian());
            out.add(new Made(new GlobalFit.Session(prefix + i, kymo, T0_S, X0_UM, null, false, false, start), kymo,
                    amplitude, noise));
        }
        return out;
    }

    static List<GlobalFit.Session> only(List<Made> made) {
        return made.stream().map(Made::session).toList();
    }

    /** Each session fitted alone by the project's per-session fitter, as an analysis of that session would. */
    static List<FitResult> ownFits(List<Made> made) {
        List<FitResult> fits = new ArrayList<>();
        for (Made m : made) {
            KymographFits.Setup setup = KymographFits.Setup.of(T0_S, X0_UM)
                    .withModels(List.of(DiffusionDecayPulse.NAME));
            setup = setup.withOptions(setup.options().withProfiles(false));
            fits.add(KymographFits.fit(m.kymograph(), setup, Progress.NONE).fit(DiffusionDecayPulse.NAME)
                    .orElseThrow());
        }
        return fits;
    }
}
