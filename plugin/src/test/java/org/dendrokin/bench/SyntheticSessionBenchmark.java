package org.dendrokin.bench;

import java.util.Arrays;
import java.util.Locale;
import java.util.Map;

import org.dendrokin.synth.CoverageHarness;
import org.dendrokin.synth.SessionGenerator;
import org.dendrokin.synth.SessionSpec;

/**
 * How long the synthetic session generator takes to render one session in memory (not a test; see
 * bench/coverage/README.md): for each scenario, three warm-up renders, then {@code repeats} timed ones of
 * different seeds on one thread. Prints the median and the best time per scenario.
 * <p>
 * Usage: SyntheticSessionBenchmark [repeats]
 */
public final class SyntheticSessionBenchmark {
    private SyntheticSessionBenchmark() {
    }

    public static void main(String[] args) {
        int repeats = args.length > 0 ? Integer.parseInt(args[0]) : 10;
        Map<String, CoverageHarness.Scenario> scenarios = CoverageHarness.scenarios();
        for (String name : new String[] {"clean", "realistic", "drift", "two-channel"}) {
            time(name, seed -> scenarios.get(name).specs().apply(seed), repeats);
        }
        time("nagumo-kick", seed -> SessionSpec.realistic(seed).withSignal(SessionSpec.NagumoKick.typical()),
                repeats);
        time("raster 2 ms/line", seed -> SessionSpec.realistic(seed).withImaging(
                SessionSpec.Imaging.standard().withLinePeriod(0.002)), repeats);
    }

    private static void time(String name, java.util.function.LongFunction<SessionSpec> specs, int repeats) {
        for (int i = 0; i < 3; i++) {
            SessionGenerator.render(specs.apply(1000 + i));
        }
        double[] seconds = new double[repeats];
        for (int i = 0; i < repeats; i++) {
            SessionSpec spec = specs.apply(i + 1);
            long start = System.nanoTime();
            SessionGenerator.render(spec);
            seconds[i] = (System.nanoTime() - start) / 1e9;
        }
        Arrays.sort(seconds);
        SessionSpec.Imaging im = specs.apply(1).imaging();
        System.out.printf(Locale.ROOT, "%-18s %d x %d x %d, %d channel(s): median %.3f s, best %.3f s%n", name,
                im.widthPx(), im.heightPx(), im.frames(), specs.apply(1).channels().order().size(),
                seconds[repeats / 2], seconds[0]);
    }
}
