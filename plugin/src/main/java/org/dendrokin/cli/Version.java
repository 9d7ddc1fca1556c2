package org.dendrokin.cli;

import java.io.IOException;
import java.io.InputStream;
import java.util.Properties;

import picocli.CommandLine;

/** The tool's version, read from the build's own properties file. */
public final class Version {
    private Version() {
    }

    public static String get() {
        try (InputStream in = Version.class.getResourceAsStream("/org/dendrokin/version.properties")) {
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

    /** Supplies {@code --version} to picocli. */
    public static final class Provider implements CommandLine.IVersionProvider {
        @Override
        public String[] getVersion() {
            return new String[] {"dendrokin " + get()};
        }
    }
}
