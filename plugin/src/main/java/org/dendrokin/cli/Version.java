package org.dendrokin.cli;

import org.dendrokin.io.ToolVersion;

import picocli.CommandLine;

/** The tool's version, read from the build's own properties file. */
public final class Version {
    private Version() {
    }

    public static String get() {
        return ToolVersion.get();
    }

    /** Supplies {@code --version} to picocli. */
    public static final class Provider implements CommandLine.IVersionProvider {
        @Override
        public String[] getVersion() {
            return new String[] {"dendrokin " + get()};
        }
    }
}
