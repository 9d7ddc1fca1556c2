package org.dendrokin.io.text;

import java.io.BufferedReader;
import java.io.IOException;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;

import org.dendrokin.io.InputException;

/**
 * Reads the text files users give (JSON, CSV) as UTF-8. A byte-order mark at the start is dropped: editors on
 * Windows write one, it is invisible, and refusing a file for it would only puzzle (it is not part of the
 * content; RFC 8259 section 8.1 allows a parser to ignore it).
 */
public final class TextFiles {
    /** The byte-order mark as it reads in UTF-8 text. */
    public static final char BYTE_ORDER_MARK = '\uFEFF';

    private TextFiles() {
    }

    /**
     * The whole file as text, without a leading byte-order mark.
     *
     * @throws InputException naming the file when it does not exist, cannot be read or is not UTF-8 text
     */
    public static String read(Path file) {
        try {
            return withoutByteOrderMark(Files.readString(file, StandardCharsets.UTF_8));
        } catch (NoSuchFileException e) {
            throw new InputException(file, "does not exist", e);
        } catch (CharacterCodingException e) {
            throw new InputException(file, "is not UTF-8 text; save it as plain text in UTF-8", e);
        } catch (IOException e) {
            throw new InputException(file, "cannot be read (" + e.getMessage() + ")", e);
        }
    }

    /** A reader of the file as UTF-8 that skips a leading byte-order mark; the caller closes it. */
    public static BufferedReader open(Path file) throws IOException {
        BufferedReader reader = Files.newBufferedReader(file, StandardCharsets.UTF_8);
        try {
            reader.mark(1);
            int first = reader.read();
            if (first != BYTE_ORDER_MARK) {
                reader.reset();
            }
            return reader;
        } catch (IOException | RuntimeException e) {
            reader.close();
            throw e;
        }
    }

    /** {@code text} without a leading byte-order mark. */
    public static String withoutByteOrderMark(String text) {
        return !text.isEmpty() && text.charAt(0) == BYTE_ORDER_MARK ? text.substring(1) : text;
    }
}
