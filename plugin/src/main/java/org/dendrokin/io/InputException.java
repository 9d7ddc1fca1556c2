package org.dendrokin.io;

import java.nio.file.Path;

/**
 * Bad user data: a file that cannot be read or a value in it that cannot be used. The message is one
 * plain sentence naming the file and the problem; the CLI prints it and exits with status 2.
 */
public class InputException extends RuntimeException {
    private final transient Path file;

    public InputException(Path file, String problem) {
        super(sentence(file, problem));
        this.file = file;
    }

    public InputException(Path file, String problem, Throwable cause) {
        super(sentence(file, problem), cause);
        this.file = file;
    }

    /** The file at fault, or null when the problem is with the command line itself. */
    public Path file() {
        return file;
    }

    private static String sentence(Path file, String problem) {
        String p = problem.endsWith(".") ? problem : problem + ".";
        return file == null ? capitalise(p) : file + ": " + p;
    }

    private static String capitalise(String s) {
        return s.isEmpty() ? s : Character.toUpperCase(s.charAt(0)) + s.substring(1);
    }
}
