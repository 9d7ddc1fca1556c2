package org.dendrokin.bench;

import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Comparator;
import java.util.Locale;
import java.util.stream.Stream;

import org.dendrokin.core.Progress;
import org.dendrokin.io.batch.BatchOptions;
import org.dendrokin.io.batch.BatchOutcome;
import org.dendrokin.io.batch.BatchRunner;
import org.dendrokin.io.batch.DemoStudy;
import org.dendrokin.io.batch.SessionAnalyzers;
import org.dendrokin.io.batch.SessionFolder;

/**
 * Benchmark (run by hand, not a test): analyses every session under STUDY once per thread count, each time
 * into a fresh output folder with every session forced, after a warm-up pass over 6 small demo sessions of
 * its own (in OUT_BASE/warm-up-study; skipped with --no-warm-up), and prints wall time,
 * sessions per second, the peak Java heap (sum of the heap pools' peaks, reset before each pass), the peaks of
 * the process's anonymous and file-backed resident memory during the pass (RssAnon, RssFile, sampled every
 * 50 ms; file-backed pages are movie pages mapped from the page cache, which the system can drop at any time)
 * and the process's peak resident memory so far (VmHWM).
 *
 * <p>Usage: {@code java -cp "$(bench/test-classpath.sh)" org.dendrokin.bench.BatchBenchmark STUDY OUT_BASE
 * THREADS... [--no-warm-up]} (a main beside the tests: it is not shipped)
 */
public final class BatchBenchmark {
    private BatchBenchmark() {
    }

    public static void main(String[] args) throws IOException {
        if (args.length < 3) {
            System.err.println("usage: BatchBenchmark STUDY OUT_BASE THREADS...");
            System.exit(2);
        }
        Path study = Path.of(args[0]);
        Path base = Path.of(args[1]);
        int sessions = SessionFolder.discover(study, base).size();
        System.out.printf(Locale.ROOT, "%d sessions under %s; %d processors; max heap %d MB%n", sessions, study,
                Runtime.getRuntime().availableProcessors(), Runtime.getRuntime().maxMemory() >> 20);
        boolean warm = !"--no-warm-up".equals(args[args.length - 1]);
        int last = warm ? args.length : args.length - 1;
        if (warm) {
            Path warmStudy = base.resolve("warm-up-study");
            deleteTree(warmStudy);
            DemoStudy.write(warmStudy, 6, 128, 64, 100, 1L);
            pass(warmStudy, base.resolve("warm-up"), 2, 6, "warm-up");
        }
        for (int i = 2; i < last; i++) {
            int threads = Integer.parseInt(args[i]);
            pass(study, base.resolve("threads-" + threads), threads, sessions, threads + " thread(s)");
        }
    }

    private static void pass(Path study, Path out, int threads, int sessions, String label) throws IOException {
        deleteTree(out);
        Files.createDirectories(out);
        System.gc();
        for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
            pool.resetPeakUsage();
        }
        long[] peakRss = new long[2];  // anonymous, file-backed (kB), sampled every 50 ms
        Thread sampler = new Thread(() -> {
            while (!Thread.currentThread().isInterrupted()) {
                long[] now = rss();
                peakRss[0] = Math.max(peakRss[0], now[0]);
                peakRss[1] = Math.max(peakRss[1], now[1]);
                try {
                    Thread.sleep(50);
                } catch (InterruptedException e) {
                    return;
                }
            }
        });
        sampler.setDaemon(true);
        sampler.start();
        long t0 = System.nanoTime();
        BatchOutcome o = BatchRunner.run(BatchOptions.of(study, out, threads).withForce(true),
                SessionAnalyzers.standard(), Progress.NONE, s -> { });
        double seconds = (System.nanoTime() - t0) * 1e-9;
        sampler.interrupt();
        long peak = 0;
        for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
            if (pool.getType() == MemoryType.HEAP && pool.getPeakUsage() != null) {
                peak += pool.getPeakUsage().getUsed();
            }
        }
        System.out.printf(Locale.ROOT, "%-12s %d analysed, %d failed: %.2f s, %.2f sessions/s, peak heap %d MB, "
                        + "peak anonymous RSS %d MB, peak file-backed RSS %d MB (mapped movie pages), "
                        + "process peak RSS so far %s%n", label, o.analysed(), o.failed(), seconds, sessions / seconds,
                peak >> 20, peakRss[0] >> 10, peakRss[1] >> 10, vmHwm());
    }

    /** Deletes {@code dir} and everything in it, if it exists. */
    private static void deleteTree(Path dir) throws IOException {
        if (!Files.exists(dir)) {
            return;
        }
        try (Stream<Path> all = Files.walk(dir)) {
            for (Path p : all.sorted(Comparator.reverseOrder()).toList()) {
                Files.delete(p);
            }
        }
    }

    /** RssAnon and RssFile of this process, kB (0 where /proc is not there). */
    private static long[] rss() {
        long[] out = new long[2];
        try {
            for (String line : Files.readAllLines(Path.of("/proc/self/status"))) {
                if (line.startsWith("RssAnon:")) {
                    out[0] = Long.parseLong(line.replaceAll("[^0-9]", ""));
                } else if (line.startsWith("RssFile:")) {
                    out[1] = Long.parseLong(line.replaceAll("[^0-9]", ""));
                }
            }
        } catch (IOException | RuntimeException e) {
            return out;
        }
        return out;
    }

    private static String vmHwm() {
        try {
            for (String line : Files.readAllLines(Path.of("/proc/self/status"))) {
                if (line.startsWith("VmHWM:")) {
                    return line.substring(6).trim();
                }
            }
        } catch (IOException | RuntimeException e) {
            return "n/a";
        }
        return "n/a";
    }
}
