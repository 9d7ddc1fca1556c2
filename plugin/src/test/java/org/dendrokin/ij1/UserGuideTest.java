package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.Map;

import ij.IJ;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

class UserGuideTest {
    @BeforeAll
    static void imagej() {
        HeadlessImageJ.start();
    }

    @Test
    void everyChapterOfTheContentsPageIsInTheJar() {
        Map<String, String> chapters = UserGuide.chapters();
        assertEquals("README.md", chapters.get("Contents"));
        assertTrue(chapters.containsValue("benchmarks.md"), "chapters found: " + chapters);
        chapters.values().forEach(f -> assertNotNull(UserGuide.page(f), f));
    }

    @Test
    void aboutRunsFromItsMenuLabelWithoutADisplay() {
        String printed = captureStdout(() -> IJ.run("About Dendrokin"));
        assertTrue(printed.contains("Dendrokin " + org.dendrokin.cli.Version.get()), printed);
    }

    @Test
    void guideChapterIsChosenByItsOptionKey() {
        String printed = captureStdout(() -> IJ.run("User Guide...", "chapter=Contents"));
        assertTrue(printed.contains("# Dendrokin user guide"), printed);
    }

    static String captureStdout(Runnable r) {
        PrintStream old = System.out;
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        System.setOut(new PrintStream(bytes, true, StandardCharsets.UTF_8));
        try {
            r.run();
        } finally {
            System.setOut(old);
        }
        return bytes.toString(StandardCharsets.UTF_8);
    }
}
