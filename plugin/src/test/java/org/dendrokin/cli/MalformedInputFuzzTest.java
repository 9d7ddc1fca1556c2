package org.dendrokin.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.FutureTask;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;

import org.dendrokin.io.demo.DemoSessionGenerator;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Seeded mutations of a small valid session (its TIFF movie, its .roi path, a path CSV, its session.json) and of
 * model files, each run through the command line's entry point exactly as a user would run it: every case must end
 * with exit status 0, or with exit status 2 and exactly one line on stderr naming a file of the case; never another
 * status, a stack trace, an out-of-memory error or a run longer than {@link #LIMIT_S} s (a hang). The test class runs
 * in its own JVM with a small heap (see the surefire executions in plugin/pom.xml), so that a header claiming a
 * huge image shows as an out-of-memory error instead of passing on a large heap.
 *
 * <p>The TIFF is mutated through its structure as well as byte by byte: directory entries (width, height, bits,
 * compression, strip offsets and counts, predictor, sample format, ...) set to awkward values, the ImageJ description
 * (frames, channels, frame interval) edited in place, and the file cut short. The .roi file is mutated through its
 * header fields (type, bounds, vertex count, options, the second header's offsets) and byte by byte.
 */
@Tag("small-heap")
@Tag("slow")
class MalformedInputFuzzTest {
    /**
     * Seconds a case may take: the valid session takes well under one, and the longest simulation a model file may
     * ask for (Simulation.MAX_STEPS on a small grid) about two minutes.
     */
    private static final long LIMIT_S = 180;
    private static final DemoSessionGenerator.Scenario TINY = new DemoSessionGenerator.Scenario(32, 12, 12, 0.5, 0.5,
            1.75, 6.0, 1.0, 0.1, 1.0, 1.5, 600, 100, 200, 3, 7L);
    private static final String SESSION = """
            {"movie": "dendrite.tif", "path": "%s", "path_width_um": 1.0, "pixel_size_um": 0.5,
             "frame_interval_s": 0.5, "stimulus": {"time_s": 1.75, "position_um": 6.0}, "baseline_frames": [0, 2],
             "background": {"value": 100}, "models": ["diffusion-decay"], "bleach_correction": true,
             "calibration": {"method": "%s"%s}, "fit": {"profiles": false}}
            """;
    private static final String[] MODELS = {"""
            {"model": "diffusion-decay", "parameters": {"D": 1.0, "k": 0.5},
             "domain": {"length_um": 10, "dx_um": 0.5, "boundary": "no-flux"},
             "time": {"duration_s": 1, "output_interval_s": 0.25},
             "stimuli": [{"kind": "pulse", "time_s": 0.1, "position_um": 5, "width_um": 1, "amount": 1}]}
            """, """
            {"model": "nagumo", "parameters": {"D": 1.0, "k": 2.0, "a": 0.2},
             "domain": {"length_um": 10, "dx_um": 0.25}, "time": {"duration_s": 1, "output_interval_s": 0.25},
             "stimuli": [{"kind": "pulse", "time_s": 0.1, "position_um": 3, "width_um": 2, "amount": 1.5}],
             "solver": {"step_factor": 0.5}, "output": {"dx_um": 0.5}}
            """, """
            {"model": "network",
             "network": {"species": [{"name": "A", "D_um2_per_s": 1, "initial": 0.1}, {"name": "B", "D_um2_per_s": 0}],
                         "reactions": [{"reactants": {"A": 1}, "products": {"B": 1}, "k": 1, "kr": 0.5}]},
             "domain": {"length_um": 5, "dx_um": 0.5}, "time": {"duration_s": 0.5, "output_interval_s": 0.1},
             "stimuli": [{"kind": "pulse", "time_s": 0.1, "position_um": 2, "width_um": 1, "amount": 1}]}
            """};
    private static final String[] SINGLE_WAVELENGTH = {"single-wavelength",
        ", \"kd_uM\": 0.35, \"f_min\": 50, \"f_max\": 9000"};
    /** Pieces a text mutation inserts: punctuation, odd numbers and values of the wrong kind. */
    private static final String[] PIECES = {"{", "}", "[", "]", ",", ":", "\"", "\n", "-", "e", ".", "0", "1e999",
        "-1e-999", "NaN", "null", "true", "\"x\"", "[]", "{}", "-0", "1e308", "2147483648", "\uFEFF", "\u0000",
        "0.5", "-5", "x,y", "1e12", "Infinity", "\"ratio\"", "\"nagumo\"", "\"dendrite.tif\"", "\"../\""};
    private static final String[] NUMBERS = {"0", "-1", "1e300", "-1e300", "1e-300", "3.5", "1e9", "2147483648",
        "\"1\"", "null", "true", "[]", "{}", "0.0001", "100000", "500", "1e12", "39", "5.5", "11"};

    @TempDir
    static Path dir;
    static byte[] tiff;
    static byte[] roi;
    static String csv;

    @BeforeAll
    static void makeValidSession() throws IOException {
        Path good = dir.resolve("good");
        DemoSessionGenerator.write(good, TINY);
        tiff = Files.readAllBytes(good.resolve("dendrite.tif"));
        roi = Files.readAllBytes(good.resolve("dendrite.roi"));
        double[][] v = DemoSessionGenerator.pathVertices(TINY);
        StringBuilder b = new StringBuilder("x,y\n");
        for (int i = 0; i < v[0].length; i++) {
            b.append(String.format(Locale.ROOT, "%.3f,%.3f%n", v[0][i] + 0.5, v[1][i] + 0.5));
        }
        csv = b.toString();
        // The unmutated inputs are analysed: the mutants start from files the tool accepts.
        int n = -1;
        for (String path : new String[] {"dendrite.roi", "path.csv"}) {
            for (String[] calibration : new String[][] {{"none", ""}, SINGLE_WAVELENGTH}) {
                assertEquals(Main.OK, check(session("valid", n--, tiff, roi, csv, session(path, calibration[0],
                        calibration[1]))), "the valid session with " + path + " and " + calibration[0]);
            }
        }
        for (String model : MODELS) {
            assertEquals(Main.OK, check(model(n--, model)), "the valid model " + model);
        }
    }

    /** One case: what was mutated, the folder holding its files, and the command line to run. */
    private record Case(String what, int number, Path session, String[] args) {
    }

    /**
     * 1000 cases times {@code fuzz.scale}: 3000 in the build (plugin/pom.xml; about a minute and a half on 2 cores,
     * an accepted case being a whole analysis with its pictures, so the class is tagged slow); {@code -Dfuzz.scale=1}
     * on the Maven command line runs 1000 with another seed, and {@code -Dfuzz.case=N} runs case N alone (see
     * DEVELOPERS.md).
     */
    @Test
    void mutatedInputsAreAnalysedOrRefusedInOneSentence() {
        int scale = Integer.getInteger("dendrokin.fuzz.scale", 1);
        int only = Integer.getInteger("dendrokin.fuzz.case", -1);
        fuzz(20261207L + scale - 1, only, 250 * scale, 150 * scale, 125 * scale, 250 * scale, 225 * scale);
    }

    /**
     * Runs the given numbers of mutants of each kind (or only case {@code only}, if not negative), each in a fresh
     * folder, and checks every outcome. Case n's mutation draws from a generator seeded with (seed, n), so a failing
     * case reproduces alone.
     */
    private static void fuzz(long seed, int only, int tiffs, int rois, int csvs, int sessions, int models) {
        int[] statuses = new int[3];
        int total = tiffs + rois + csvs + sessions + models;
        for (int n = Math.max(only, 0); n < (only < 0 ? total : only + 1); n++) {
            Random random = new Random(seed * 1_000_003L + n);  // fixed seed: a failure must reproduce
            Case c;
            if (n < tiffs) {
                c = session("tiff", n, mutateTiff(tiff, random), roi, null, session("dendrite.roi", "none", ""));
            } else if (n < tiffs + rois) {
                c = session("roi", n, tiff, mutateBytes(roi, random, ROI_FIELDS), null, session("dendrite.roi", "none",
                        ""));
            } else if (n < tiffs + rois + csvs) {
                c = session("csv", n, tiff, null, mutateText(csv, random, 1 + random.nextInt(3)), session("path.csv",
                        "none", ""));
            } else if (n < tiffs + rois + csvs + sessions) {
                String valid = random.nextBoolean() ? session("dendrite.roi", "none", "")
                        : session("dendrite.roi", SINGLE_WAVELENGTH[0], SINGLE_WAVELENGTH[1]);
                c = session("json", n, tiff, roi, null, mutateJson(valid, random));
            } else {
                c = model(n, mutateJson(MODELS[random.nextInt(MODELS.length)], random));
            }
            statuses[check(c)] += 1;
        }
        if (only < 0) {
            assertTrue(statuses[0] > total / 20 && statuses[2] > total / 10, "the mutations both keep and break"
                    + " inputs: " + statuses[0] + " analysed, " + statuses[2] + " refused");
        }
    }

    private static String session(String path, String method, String calibration) {
        return String.format(Locale.ROOT, SESSION, path, method, calibration);
    }

    private static Case session(String kind, int n, byte[] movie, byte[] pathRoi, String pathCsv, String json) {
        Path s = dir.resolve(name(n) + "-" + kind);
        write(s.resolve("dendrite.tif"), movie);
        if (pathRoi != null) {
            write(s.resolve("dendrite.roi"), pathRoi);
        }
        if (pathCsv != null) {
            write(s.resolve("path.csv"), pathCsv.getBytes(StandardCharsets.UTF_8));
        }
        write(s.resolve("session.json"), json.getBytes(StandardCharsets.UTF_8));
        Path out = dir.resolve(name(n) + "-out");
        return new Case(kind, n, s, new String[] {"analyze", s.toString(), "--out", out.toString()});
    }

    private static Case model(int n, String json) {
        Path s = dir.resolve(name(n) + "-model");
        Path file = s.resolve("model.json");
        write(file, json.getBytes(StandardCharsets.UTF_8));
        Path out = s.resolve("out");
        return new Case("model", n, s, new String[] {"simulate", file.toString(), "--out", out.toString()});
    }

    /** The folder name of case n; the unmutated inputs get negative numbers. */
    private static String name(int n) {
        return n < 0 ? "valid" + -n : String.format(Locale.ROOT, "case%05d", n);
    }

    private static void write(Path file, byte[] bytes) {
        try {
            Files.createDirectories(file.getParent());
            Files.write(file, bytes);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /**
     * Runs one case on a thread of its own and checks its outcome; returns the exit status. Whatever the case prints
     * past the command line's own streams (a library writing to System.out or System.err) fails it too: a user would
     * see it. The case's folders are removed afterwards; a failing case's files are first copied to
     * target/fuzz-failures.
     */
    private static int check(Case c) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        ByteArrayOutputStream stray = new ByteArrayOutputStream();
        FutureTask<Integer> task = new FutureTask<>(() -> Main.run(c.args(), new PrintStream(out, true,
                StandardCharsets.UTF_8), new PrintStream(err, true, StandardCharsets.UTF_8)));
        PrintStream systemOut = System.out;
        PrintStream systemErr = System.err;
        PrintStream strayStream = new PrintStream(stray, true, StandardCharsets.UTF_8);
        System.setOut(strayStream);
        System.setErr(strayStream);
        Thread t = new Thread(task, "fuzz-case");
        t.setDaemon(true);
        t.start();
        int status;
        try {
            status = task.get(LIMIT_S, TimeUnit.SECONDS);
        } catch (TimeoutException e) {
            t.interrupt();
            throw new AssertionError(keep(c) + " did not end within " + LIMIT_S + " s");
        } catch (ExecutionException e) {
            throw new AssertionError(keep(c) + " threw " + e.getCause(), e.getCause());
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new AssertionError("interrupted", e);
        } finally {
            System.setOut(systemOut);
            System.setErr(systemErr);
        }
        String text = err.toString(StandardCharsets.UTF_8);
        if (text.contains("Exception") || text.contains("\tat ") || text.contains("Internal error")) {
            fail(keep(c) + " printed an exception (status " + status + "):\n" + text);
        }
        if (stray.size() > 0) {
            fail(keep(c) + " printed past the command line's streams (status " + status + "):\n"
                    + stray.toString(StandardCharsets.UTF_8));
        }
        if (status == Main.BAD_INPUT) {
            List<String> lines = text.lines().filter(l -> !l.isBlank()).toList();
            if (lines.size() != 1 || !lines.get(0).startsWith(c.session().toString())) {
                fail(keep(c) + ": exit 2 needs one line on stderr naming a file of the case, got:\n" + text);
            }
        } else if (status != Main.OK) {
            fail(keep(c) + " ended with status " + status + ":\n" + text);
        }
        deleteTree(c.session());
        deleteTree(Path.of(c.args()[3]));
        return status;
    }

    /** Copies a failing case's inputs to target/fuzz-failures (the temporary folder goes) and describes it. */
    private static String keep(Case c) {
        Path kept = Path.of("target", "fuzz-failures", c.session().getFileName().toString()).toAbsolutePath();
        try (Stream<Path> files = Files.list(c.session())) {
            Files.createDirectories(kept);
            for (Path f : files.filter(Files::isRegularFile).toList()) {
                Files.copy(f, kept.resolve(f.getFileName()), StandardCopyOption.REPLACE_EXISTING);
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        String rerun = c.number() < 0 ? "an unmutated input" : "-Dfuzz.case=" + c.number() + " reruns it";
        return "case " + c.session().getFileName() + " (" + c.what() + "; " + rerun + "; files copied to " + kept + ")";
    }

    private static void deleteTree(Path p) {
        if (!Files.exists(p)) {
            return;
        }
        try (Stream<Path> walk = Files.walk(p)) {
            for (Path q : walk.sorted(Comparator.reverseOrder()).toList()) {
                Files.delete(q);
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    // ---- TIFF mutations

    /** TIFF tags worth setting to awkward values (TIFF 6.0 and ImageJ's own). */
    private static final int[] TAGS = {254, 256, 257, 258, 259, 262, 270, 273, 277, 278, 279, 282, 283, 284, 296, 317,
        322, 323, 324, 325, 339};
    private static final long[] AWKWARD = {0, 1, 2, 3, 4, 5, 7, 8, 16, 32, 64, 255, 256, 32773, 65535, 100_000,
        0x7fffffffL, 0x80000000L, 0xffffffffL};

    private static byte[] mutateTiff(byte[] valid, Random random) {
        byte[] b = valid.clone();
        ByteOrder order = b[0] == 'I' ? ByteOrder.LITTLE_ENDIAN : ByteOrder.BIG_ENDIAN;
        ByteBuffer buf = ByteBuffer.wrap(b).order(order);
        List<Integer> entries = entries(buf);
        int edits = 1 + random.nextInt(3);
        for (int e = 0; e < edits; e++) {
            switch (random.nextInt(6)) {
                case 0 -> {
                    // an entry of a wanted tag (the first image's most often) gets an awkward value or count
                    int at = pick(buf, entries, random);
                    int type = buf.getShort(at + 2) & 0xffff;
                    long value = random.nextInt(4) == 0 ? random.nextInt(b.length + 16)
                            : AWKWARD[random.nextInt(AWKWARD.length)];
                    if (random.nextInt(5) == 0) {
                        buf.putInt(at + 4, (int) value);
                    } else if (type == 3) {
                        buf.putShort(at + 8, (short) value);
                    } else {
                        buf.putInt(at + 8, (int) value);
                    }
                }
                case 1 -> {
                    // the entry's type changed (SHORT, LONG, RATIONAL, ASCII, an unknown one)
                    int at = pick(buf, entries, random);
                    int[] types = {1, 2, 3, 4, 5, 11, 12, 0, 99};
                    buf.putShort(at + 2, (short) types[random.nextInt(types.length)]);
                }
                case 2 -> editDescription(buf, entries, random);
                case 3, 4 -> {
                    // a byte in the header or the directories (where a change alters the layout; a flipped pixel of
                    // a 16-bit movie is just another valid value): replaced, or one bit flipped
                    int[] hot = hotBytes(buf, entries);
                    int at = hot[random.nextInt(hot.length)];
                    b[at] = random.nextBoolean() ? (byte) random.nextInt(256) : (byte) (b[at] ^ 1 << random.nextInt(8));
                }
                default -> {
                    return Arrays.copyOf(b, random.nextInt(b.length));
                }
            }
        }
        return b;
    }

    /** Offsets of every 12-byte directory entry of every image, following the chain of directories. */
    private static List<Integer> entries(ByteBuffer buf) {
        List<Integer> out = new ArrayList<>();
        long ifd = buf.getInt(4) & 0xffffffffL;
        int guard = 0;
        while (ifd > 0 && ifd + 2 <= buf.capacity() && guard++ < 10_000) {
            int count = buf.getShort((int) ifd) & 0xffff;
            for (int i = 0; i < count && ifd + 2 + 12L * (i + 1) <= buf.capacity(); i++) {
                out.add((int) ifd + 2 + 12 * i);
            }
            long next = ifd + 2 + 12L * count;
            ifd = next + 4 <= buf.capacity() ? buf.getInt((int) next) & 0xffffffffL : 0;
        }
        return out;
    }

    /** An entry whose tag is one of {@link #TAGS}, from the first image three times in four. */
    private static int pick(ByteBuffer buf, List<Integer> entries, Random random) {
        int firstCount = buf.getShort(buf.getInt(4)) & 0xffff;
        List<Integer> pool = random.nextInt(4) > 0 ? entries.subList(0, Math.min(firstCount, entries.size())) : entries;
        int wanted = TAGS[random.nextInt(TAGS.length)];
        for (int at : pool) {
            if ((buf.getShort(at) & 0xffff) == wanted) {
                return at;
            }
        }
        return pool.get(random.nextInt(pool.size()));
    }

    /** Rewrites digits of ImageJ's description in place: frames, channels, slices, interval, spacing. */
    private static void editDescription(ByteBuffer buf, List<Integer> entries, Random random) {
        for (int at : entries) {
            if ((buf.getShort(at) & 0xffff) == 270) {
                int count = buf.getInt(at + 4);
                int offset = count <= 4 ? at + 8 : buf.getInt(at + 8);
                if (offset < 0 || count < 0 || (long) offset + count > buf.capacity()) {
                    return;
                }
                String text = new String(buf.array(), offset, count, StandardCharsets.ISO_8859_1);
                Matcher m = Pattern.compile("=([-0-9.]+)").matcher(text);
                List<int[]> values = new ArrayList<>();
                while (m.find()) {
                    values.add(new int[] {m.start(1), m.end(1)});
                }
                if (values.isEmpty()) {
                    return;
                }
                int[] v = values.get(random.nextInt(values.size()));
                String[] fills = {"9", "0", "-", ".", "1", "5"};
                for (int i = v[0]; i < v[1]; i++) {
                    if (random.nextBoolean()) {
                        buf.put(offset + i, fills[random.nextInt(fills.length)].getBytes(StandardCharsets.US_ASCII)[0]);
                    }
                }
                return;
            }
        }
    }

    /** The header, the directories and their out-of-line values (everything but the pixels). */
    private static int[] hotBytes(ByteBuffer buf, List<Integer> entries) {
        List<Integer> hot = new ArrayList<>();
        for (int i = 0; i < 8; i++) {
            hot.add(i);
        }
        for (int at : entries) {
            for (int i = 0; i < 12; i++) {
                hot.add(at + i);
            }
        }
        return hot.stream().mapToInt(Integer::intValue).toArray();
    }

    // ---- ROI mutations

    /** Header fields of an ImageJ .roi file: {offset, width in bytes}, big-endian (ImageJ's RoiDecoder). */
    private static final int[][] ROI_FIELDS = {{4, 2}, {6, 1}, {8, 2}, {10, 2}, {12, 2}, {14, 2}, {16, 2}, {18, 4},
        {22, 4}, {26, 4}, {30, 4}, {34, 2}, {36, 4}, {48, 2}, {50, 2}, {52, 1}, {53, 1}, {54, 2}, {56, 4}, {60, 4}};

    /** Header fields set to awkward values, bytes flipped, the file cut short. */
    private static byte[] mutateBytes(byte[] valid, Random random, int[][] fields) {
        byte[] b = valid.clone();
        ByteBuffer buf = ByteBuffer.wrap(b).order(ByteOrder.BIG_ENDIAN);
        int edits = 1 + random.nextInt(3);
        for (int e = 0; e < edits; e++) {
            switch (random.nextInt(4)) {
                case 0, 1 -> {
                    int[] f = fields[random.nextInt(fields.length)];
                    long value = random.nextInt(4) == 0 ? random.nextInt(b.length + 16)
                            : AWKWARD[random.nextInt(AWKWARD.length)];
                    switch (f[1]) {
                        case 1 -> buf.put(f[0], (byte) value);
                        case 2 -> buf.putShort(f[0], (short) value);
                        default -> buf.putInt(f[0], random.nextBoolean() ? (int) value
                                : Float.floatToIntBits(new float[] {1e12f, -1e30f, Float.NaN, 1e-30f, 3.4e38f,
                                    -5f}[random.nextInt(6)]));
                    }
                }
                case 2 -> b[random.nextInt(b.length)] ^= (byte) (1 << random.nextInt(8));
                default -> {
                    return Arrays.copyOf(b, random.nextInt(b.length));
                }
            }
        }
        return b;
    }

    // ---- text mutations (path CSV, session.json, model files)

    /** Strings a JSON mutation puts in place of another string value: names of methods, models, kinds, files. */
    private static final String[] STRINGS = {"\"none\"", "\"ratio\"", "\"hill\"", "\"single-wavelength\"",
        "\"dynamic-range\"", "\"nagumo\"", "\"network\"", "\"fisher-kpp\"", "\"pulse\"", "\"clamp\"",
        "\"\"", "\"dendrite.tif\"", "\"dendrite.roi\"", "\"session.json\"", "\"../good/dendrite.tif\"",
        "\"x\"", "\"aic\"", "\"bic\"", "\"periodic\"", "\"fixed\""};

    /**
     * JSON edits that keep the syntax most of the time (the JSON readers' own fuzz covers broken syntax): numbers and
     * strings replaced by extreme or unexpected values, a key-value pair removed, and now and then a text edit.
     */
    private static String mutateJson(String text, Random random) {
        StringBuilder b = new StringBuilder(text);
        int edits = 1 + random.nextInt(2);
        for (int e = 0; e < edits; e++) {
            int kind = random.nextInt(20);
            if (kind < 10) {
                replaceNumber(b, random);
            } else if (kind < 14) {
                replaceMatch(b, random, "(?<=[:\\[,]\\s{0,3})\"[^\"]*\"(?!\\s*:)", STRINGS);
            } else if (kind < 16) {
                replaceMatch(b, random, "\"[a-z_0-9]+\"\\s*:\\s*(-?[0-9.e+]+|\"[^\"]*\"|true|false)\\s*,\\s*",
                        new String[] {""});
            } else {
                b.replace(0, b.length(), mutateText(b.toString(), random, 1));
            }
        }
        return b.toString();
    }

    /** Replaces one match of {@code regex} in the text with one of {@code values}. */
    private static void replaceMatch(StringBuilder b, Random random, String regex, String[] values) {
        List<int[]> found = new ArrayList<>();
        Matcher m = Pattern.compile(regex).matcher(b);
        while (m.find()) {
            found.add(new int[] {m.start(), m.end()});
        }
        if (!found.isEmpty()) {
            int[] f = found.get(random.nextInt(found.size()));
            b.replace(f[0], f[1], values[random.nextInt(values.length)]);
        }
    }

    private static String mutateText(String text, Random random, int edits) {
        StringBuilder b = new StringBuilder(text);
        for (int e = 0; e < edits && b.length() > 0; e++) {
            int at = random.nextInt(b.length());
            switch (random.nextInt(7)) {
                case 0 -> b.deleteCharAt(at);
                case 1 -> b.insert(at, PIECES[random.nextInt(PIECES.length)]);
                case 2 -> b.setLength(at);
                case 3, 4 -> replaceNumber(b, random);
                case 5 -> {
                    int end = Math.min(b.length(), at + 1 + random.nextInt(40));
                    b.insert(end, b.substring(at, end));
                }
                default -> {
                    int end = Math.min(b.length(), at + 1 + random.nextInt(20));
                    b.delete(at, end);
                }
            }
        }
        return b.toString();
    }

    /** Replaces one number in the text with an extreme or wrong value, keeping the syntax valid most of the time. */
    private static void replaceNumber(StringBuilder b, Random random) {
        List<int[]> numbers = new ArrayList<>();
        Matcher m = Pattern.compile("-?\\d+(\\.\\d+)?").matcher(b);
        while (m.find()) {
            numbers.add(new int[] {m.start(), m.end()});
        }
        if (numbers.isEmpty()) {
            return;
        }
        int[] n = numbers.get(random.nextInt(numbers.size()));
        b.replace(n[0], n[1], NUMBERS[random.nextInt(NUMBERS.length)]);
    }
}
