package org.dendrokin.io;

import java.nio.file.Path;
import java.util.Locale;

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
        String p = oneLine(problem.endsWith(".") ? problem : problem + ".");
        return file == null ? capitalise(p) : oneLine(file.toString()) + ": " + p;
    }

    /**
     * Control characters written as escapes (a line break as backslash-n, others as backslash-u and four hex
     * digits), so that a line break inside a value or key quoted from a file cannot split the sentence.
     */
    private static String oneLine(String s) {
        StringBuilder b = null;
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (Character.isISOControl(c)) {
                if (b == null) {
                    b = new StringBuilder(s.length() + 8).append(s, 0, i);
                }
                switch (c) {
                    case '\n' -> b.append("\\n");
                    case '\r' -> b.append("\\r");
                    case '\t' -> b.append("\\t");
                    default -> b.append(String.format(Locale.ROOT, "\\u%04x", (int) c));
                }
            } else if (b != null) {
                b.append(c);
            }
        }
        return b == null ? s : b.toString();
    }

    private static String capitalise(String s) {
        return s.isEmpty() ? s : Character.toUpperCase(s.charAt(0)) + s.substring(1);
    }
}
