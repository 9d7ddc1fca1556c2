package org.dendrokin.core;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Pattern;
import java.util.stream.Stream;

import org.junit.jupiter.api.Test;

/** The core computes; it never touches ImageJ, SciJava, a window, a file or the terminal. */
class CoreStaysPureTest {
    private static final Pattern FORBIDDEN = Pattern.compile(
            "import\\s+(ij\\.|org\\.scijava\\.|java\\.awt|javax\\.swing|java\\.nio\\.file\\.Files|java\\.io\\.File)"
                    + "|System\\.(out|err)|printStackTrace");

    @Test
    void coreSourcesUseNoUiFileOrPrinting() throws IOException {
        Path core = Path.of("src/main/java/org/dendrokin/core");
        List<String> offenders = new ArrayList<>();
        try (Stream<Path> files = Files.walk(core)) {
            for (Path f : files.filter(p -> p.toString().endsWith(".java")).toList()) {
                List<String> lines = Files.readAllLines(f);
                for (int i = 0; i < lines.size(); i++) {
                    if (FORBIDDEN.matcher(lines.get(i)).find()) {
                        offenders.add(f + ":" + (i + 1) + ": " + lines.get(i).trim());
                    }
                }
            }
        }
        assertTrue(Files.isDirectory(core), "core package folder exists");
        assertTrue(offenders.isEmpty(), "core must stay free of UI, files and printing:\n" + String.join("\n", offenders));
    }
}
