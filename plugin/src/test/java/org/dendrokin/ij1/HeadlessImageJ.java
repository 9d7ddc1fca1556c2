package org.dendrokin.ij1;

import java.awt.HeadlessException;
import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.Hashtable;
import java.util.LinkedHashMap;
import java.util.Map;

import ij.IJ;
import ij.Menus;

/**
 * ImageJ 1.x without a display, with our menu commands registered the way ImageJ registers them from a
 * jar in its plugins folder: label to {@code class("argument")}, read from our own plugins.config.
 */
final class HeadlessImageJ {
    private HeadlessImageJ() {
    }

    /** Our plugins.config entries, label to class with argument; separators left out. */
    static Map<String, String> entries() {
        Map<String, String> entries = new LinkedHashMap<>();
        try (InputStream in = HeadlessImageJ.class.getResourceAsStream("/plugins.config")) {
            BufferedReader r = new BufferedReader(new InputStreamReader(in, StandardCharsets.UTF_8));
            for (String line = r.readLine(); line != null; line = r.readLine()) {
                line = line.trim();
                if (line.isEmpty() || line.startsWith("#")) {
                    continue;
                }
                int q1 = line.indexOf('"');
                int q2 = line.indexOf('"', q1 + 1);
                String label = line.substring(q1 + 1, q2);
                if (!label.equals("-")) {
                    entries.put(label, line.substring(line.indexOf(',', q2) + 1).trim());
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return entries;
    }

    /** Starts ImageJ's command table (headless) and adds our commands to it. */
    @SuppressWarnings("unchecked")
    static synchronized void start() {
        System.setProperty("java.awt.headless", "true");
        if (Menus.getCommands() == null) {
            try {
                IJ.run("Close All");
            } catch (HeadlessException expected) {
                // ImageJ builds its command table, then fails at the first AWT menu; the table is what we need
            }
        }
        Hashtable<String, String> table = Menus.getCommands();
        table.putAll(entries());
    }
}
