package org.dendrokin.io;

import java.io.IOException;
import java.io.InputStream;
import java.util.Properties;

/** The tool's version, read from the build's own properties file ("unknown" outside a build). */
public final class ToolVersion {
    private ToolVersion() {
    }

    public static String get() {
        try (InputStream in = ToolVersion.class.getResourceAsStream("/org/dendrokin/version.properties")) {
            if (in == null) {
                return "unknown";
            }
            Properties p = new Properties();
            p.load(in);
            return p.getProperty("version", "unknown");
        } catch (IOException e) {
            return "unknown";
        }
    }
}
