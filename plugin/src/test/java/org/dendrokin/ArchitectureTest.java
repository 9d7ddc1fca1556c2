package org.dendrokin;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * The shape of the production code, checked on its sources: the layers (core below io below the front ends),
 * no program entry point but the command line's, files of a readable length, and a package-info in every
 * package. The rules are the ones each package-info states; this test is where they are enforced.
 *
 * <p>References are found in code only, comments and string literals removed: imports (static ones too) and
 * fully qualified names written inline ({@code org.dendrokin.io.Foo.bar()}), which an import scan alone misses.
 */
class ArchitectureTest {
    private static final Path MAIN = Path.of("src/main/java");
    private static final String ROOT = "org.dendrokin";
    private static final Set<String> FRONT_ENDS = Set.of(ROOT + ".cli", ROOT + ".command", ROOT + ".ij1");
    private static final String ENTRY_POINT = "org/dendrokin/cli/Main.java";
    private static final int MAX_LINES = 600;

    /**
     * Files over {@value #MAX_LINES} lines today, without the javadoc sentence saying why they must be one file,
     * which are being split as this is written (issue 12): remove each entry when its file is split or explains
     * itself. A file on this list that has become short enough fails the test, so the list cannot go stale.
     */
    private static final Set<String> LONG_FILES_BEING_SPLIT = Set.of();

    private static final Pattern REFERENCE = Pattern.compile("\\b" + Pattern.quote(ROOT)
            + "((?:\\.[a-z_][a-z0-9_]*)*)\\.(?:([A-Z]\\w*)|\\*)");
    private static final Pattern PACKAGE = Pattern.compile("^package\\s+([\\w.]+)\\s*;", Pattern.MULTILINE);
    private static final Pattern MAIN_METHOD = Pattern.compile(
            "\\bvoid\\s+main\\s*\\(\\s*(?:final\\s+)?String\\s*(?:\\[\\s*]|\\.\\.\\.)");
    private static final Pattern TOP_LEVEL_TYPE = Pattern.compile(
            "^(?:@\\w+(?:\\([^)]*\\))?\\s+)*(?:public\\s+|final\\s+|abstract\\s+|sealed\\s+|non-sealed\\s+)*"
                    + "(?:class|record|interface|enum|@interface)\\s", Pattern.MULTILINE);

    private static List<Source> sources;

    /** One production source file: where it is, its package, its text and its text without comments or strings. */
    private record Source(String path, String pkg, String text, String code) {
    }

    @BeforeAll
    static void readSources() throws IOException {
        sources = new ArrayList<>();
        try (Stream<Path> files = Files.walk(MAIN)) {
            for (Path f : files.filter(p -> p.toString().endsWith(".java")).sorted().toList()) {
                String text = Files.readString(f, StandardCharsets.UTF_8);
                String code = codeOnly(text);
                Matcher m = PACKAGE.matcher(code);
                String pkg = m.find() ? m.group(1) : "";
                sources.add(new Source(MAIN.relativize(f).toString().replace('\\', '/'), pkg, text, code));
            }
        }
        assertTrue(sources.size() > 100, "the production sources were found under " + MAIN.toAbsolutePath());
    }

    // ---- layers ----

    @Test
    void everyReferenceGoesDownTheLayersOrStaysInItsOwn() {
        List<String> offenders = new ArrayList<>();
        for (Source s : sources) {
            for (String target : references(s.code())) {
                String problem = layeringProblem(s.pkg(), packageOf(target), target);
                if (problem != null) {
                    offenders.add(s.path() + " refers to " + target + ": " + problem);
                }
            }
        }
        assertTrue(offenders.isEmpty(), "layering rules broken:\n" + String.join("\n", offenders));
    }

    /**
     * Why a reference from package {@code from} to package {@code to} (class {@code target}) breaks a rule, or
     * null. Layers: core (0) below io (1) below the front ends (2); within core, the base package imports nothing
     * and core.analysis is imported by no other core package; within io, the toolkit (io.text, io.json) imports
     * only InputException and itself; front ends import no other front end.
     */
    static String layeringProblem(String from, String to, String target) {
        if (to.equals(from)) {
            return null;
        }
        int fromLayer = layer(from);
        int toLayer = layer(to);
        if (toLayer > fromLayer) {
            return "a lower layer (" + layerName(fromLayer) + ") may not use a higher one (" + layerName(toLayer) + ")";
        }
        if (fromLayer == 2 && toLayer == 2 && !topPackage(from).equals(topPackage(to))) {
            return "a front end may not use another front end";
        }
        if (from.equals(ROOT + ".core") && !to.equals(from)) {
            return "the core base package imports no other package";
        }
        boolean intoAnalysis = sameOrInside(to, ROOT + ".core.analysis");
        if (intoAnalysis && fromLayer == 0 && !sameOrInside(from, ROOT + ".core.analysis")) {
            return "core.analysis sits on top of core: no other core package may use it";
        }
        if (sameOrInside(from, ROOT + ".io.text") && !target.equals(ROOT + ".io.InputException")) {
            return "the io.text toolkit uses only InputException";
        }
        if (sameOrInside(from, ROOT + ".io.json") && !target.equals(ROOT + ".io.InputException")
                && !sameOrInside(to, ROOT + ".io.text")) {
            return "the io.json toolkit uses only InputException and io.text";
        }
        return null;
    }

    private static int layer(String pkg) {
        if (sameOrInside(pkg, ROOT + ".core")) {
            return 0;
        }
        if (sameOrInside(pkg, ROOT + ".io")) {
            return 1;
        }
        return 2;
    }

    private static String layerName(int layer) {
        return switch (layer) {
            case 0 -> "core";
            case 1 -> "io";
            default -> "a front end";
        };
    }

    private static String topPackage(String pkg) {
        String rest = pkg.length() > ROOT.length() ? pkg.substring(ROOT.length() + 1) : "";
        int dot = rest.indexOf('.');
        return dot < 0 ? rest : rest.substring(0, dot);
    }

    private static boolean sameOrInside(String pkg, String parent) {
        return pkg.equals(parent) || pkg.startsWith(parent + ".");
    }

    @Test
    void theFrontEndsAreTheOnesThePackageInfosName() {
        Set<String> top = new TreeSet<>();
        for (Source s : sources) {
            if (s.pkg().startsWith(ROOT + ".") && layer(s.pkg()) == 2) {
                top.add(ROOT + "." + topPackage(s.pkg()));
            }
        }
        assertEquals(new TreeSet<>(FRONT_ENDS), top, "every package outside core and io is a known front end");
    }

    // ---- entry points, file length, package-info ----

    @Test
    void theOnlyMainMethodIsTheCommandLines() {
        List<String> mains = new ArrayList<>();
        for (Source s : sources) {
            if (MAIN_METHOD.matcher(s.code()).find()) {
                mains.add(s.path());
            }
        }
        assertEquals(List.of(ENTRY_POINT), mains, "benchmarks and generators belong beside the tests");
    }

    @Test
    void aLongFileSaysWhyItIsOneFile() {
        List<String> offenders = new ArrayList<>();
        for (Source s : sources) {
            long lines = s.text().lines().count();
            boolean listed = LONG_FILES_BEING_SPLIT.contains(s.path());
            if (lines > MAX_LINES && !listed && !classJavadoc(s.text()).toLowerCase().contains("one file")) {
                offenders.add(s.path() + ": " + lines + " lines, and its class javadoc does not say why it must be "
                        + "one file");
            }
            if (listed && lines <= MAX_LINES) {
                offenders.add(s.path() + ": " + lines + " lines now; take it off LONG_FILES_BEING_SPLIT");
            }
        }
        assertTrue(offenders.isEmpty(), String.join("\n", offenders));
    }

    @Test
    void everyPackageSaysWhatItOwnsAndMayImport() {
        Set<String> packages = new TreeSet<>();
        Set<String> documented = new TreeSet<>();
        for (Source s : sources) {
            packages.add(s.pkg());
            if (s.path().endsWith("/package-info.java")) {
                documented.add(s.pkg());
                assertTrue(s.text().trim().startsWith("/**") && s.text().toLowerCase().contains("import"),
                        s.path() + " has a javadoc stating what the package may import");
            }
        }
        packages.removeAll(documented);
        assertTrue(packages.isEmpty(), "packages without a package-info.java (two or three sentences: what the "
                + "package owns and which packages it may import): " + packages);
    }

    // ---- the scanner itself ----

    @Test
    void theScannerSeesImportsAndInlineNamesButNotCommentsOrStrings() {
        String code = codeOnly("""
                package org.dendrokin.io.x;
                import org.dendrokin.core.kymo.Kymograph;
                import static org.dendrokin.io.text.Html.esc;
                import org.dendrokin.io.plot.*;
                /** {@link org.dendrokin.ij1.Display} in a comment */
                class A {
                    // org.dendrokin.command.Commands in a line comment
                    String s = "org.dendrokin.cli.Main \\" still a string";
                    String block = \"""
                            org.dendrokin.cli.Version
                            \""";
                    char c = '"';
                    Object v = org.dendrokin.cli.Version.get();
                }
                """);
        assertEquals(Set.of(ROOT + ".core.kymo.Kymograph", ROOT + ".io.text.Html", ROOT + ".io.plot.*",
                ROOT + ".cli.Version"), references(code));
        assertEquals("a lower layer (io) may not use a higher one (a front end)",
                layeringProblem(ROOT + ".io.x", ROOT + ".cli", ROOT + ".cli.Version"));
        assertEquals("a front end may not use another front end",
                layeringProblem(ROOT + ".ij1", ROOT + ".cli", ROOT + ".cli.Version"));
        assertEquals("a lower layer (core) may not use a higher one (io)",
                layeringProblem(ROOT + ".core.fit", ROOT + ".io", ROOT + ".io.InputException"));
        assertEquals("core.analysis sits on top of core: no other core package may use it",
                layeringProblem(ROOT + ".core.fit", ROOT + ".core.analysis", ROOT + ".core.analysis.Result"));
        assertEquals("the io.json toolkit uses only InputException and io.text",
                layeringProblem(ROOT + ".io.json", ROOT + ".io", ROOT + ".io.AtomicFiles"));
        assertEquals(null, layeringProblem(ROOT + ".io.json", ROOT + ".io", ROOT + ".io.InputException"));
        assertEquals(null, layeringProblem(ROOT + ".core.analysis", ROOT + ".core.fit", ROOT + ".core.fit.FitResult"));
        assertTrue(MAIN_METHOD.matcher(codeOnly("class B { public static void main(final String... a) { } }")).find());
        assertTrue(classJavadoc("/** Kept as one file because X. */\npublic final class C {\n}").contains("one file"));
    }

    /** Every Dendrokin class named in {@code code} (fully qualified), or {@code package.*} for a wildcard import. */
    static Set<String> references(String code) {
        Set<String> out = new TreeSet<>();
        Matcher m = REFERENCE.matcher(code);
        while (m.find()) {
            out.add(ROOT + m.group(1) + "." + (m.group(2) == null ? "*" : m.group(2)));
        }
        return out;
    }

    private static String packageOf(String target) {
        return target.substring(0, target.lastIndexOf('.'));
    }

    /** The javadoc right before the first top-level type declaration, or "" when there is none. */
    static String classJavadoc(String text) {
        Matcher m = TOP_LEVEL_TYPE.matcher(text);
        if (!m.find()) {
            return "";
        }
        String before = text.substring(0, m.start());
        int open = before.lastIndexOf("/**");
        int close = before.lastIndexOf("*/");
        return open >= 0 && close > open && before.substring(close + 2).isBlank() ? before.substring(open, close) : "";
    }

    /**
     * The text with comments, string literals (text blocks too) and character literals blanked out, line breaks
     * kept, so that what remains is code.
     */
    static String codeOnly(String text) {
        StringBuilder out = new StringBuilder(text.length());
        int i = 0;
        int n = text.length();
        while (i < n) {
            char c = text.charAt(i);
            if (text.startsWith("//", i)) {
                while (i < n && text.charAt(i) != '\n') {
                    i++;
                }
            } else if (text.startsWith("/*", i)) {
                int end = text.indexOf("*/", i + 2);
                end = end < 0 ? n : end + 2;
                keepLineBreaks(out, text, i, end);
                i = end;
            } else if (text.startsWith("\"\"\"", i)) {
                int end = text.indexOf("\"\"\"", i + 3);
                while (end > 0 && text.charAt(end - 1) == '\\') {
                    end = text.indexOf("\"\"\"", end + 1);
                }
                end = end < 0 ? n : end + 3;
                keepLineBreaks(out, text, i, end);
                out.append("\"\"");
                i = end;
            } else if (c == '"' || c == '\'') {
                int j = i + 1;
                while (j < n && text.charAt(j) != c && text.charAt(j) != '\n') {
                    j += text.charAt(j) == '\\' ? 2 : 1;
                }
                out.append(c).append(c);
                i = Math.min(j + 1, n);
            } else {
                out.append(c);
                i++;
            }
        }
        return out.toString();
    }

    private static void keepLineBreaks(StringBuilder out, String text, int from, int to) {
        for (int k = from; k < to; k++) {
            if (text.charAt(k) == '\n') {
                out.append('\n');
            }
        }
    }
}
