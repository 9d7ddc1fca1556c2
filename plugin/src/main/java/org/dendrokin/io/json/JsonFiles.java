package org.dendrokin.io.json;

import java.io.IOException;
import java.io.StringReader;
import java.nio.file.Path;
import java.util.HashSet;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import org.dendrokin.io.InputException;
import org.dendrokin.io.text.TextFiles;

import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParseException;
import com.google.gson.JsonParser;
import com.google.gson.Strictness;
import com.google.gson.stream.JsonReader;
import com.google.gson.stream.JsonToken;

/**
 * Reads the JSON files users write (session.json, model files, calibration files) and the records the tool
 * keeps for itself, all by one set of rules, so that a file is accepted or refused the same way wherever it
 * is read. Parsing is Gson's, in strict mode (RFC 8259): no comments, no trailing commas, no single quotes,
 * no unquoted names, no NaN or Infinity. On top of that a file must hold exactly one object, with nothing
 * after it, and no object in it may give the same key twice (Gson would keep the last one silently, so a
 * setting the user thinks is in force could be overridden further down). A UTF-8 byte-order mark at the
 * start is accepted and ignored. Every refusal is an {@link InputException} naming the file, and the line or
 * key at fault, in one sentence. Unknown keys are not judged here: each reader decides (warn or refuse),
 * through {@link JsonFields}.
 */
public final class JsonFiles {
    private static final Pattern WHERE = Pattern.compile("line (\\d+) column (\\d+) path (\\S+)");
    private static final Pattern NOT_A_NUMBER = Pattern.compile("-?(NaN|Infinity)\\b");

    private JsonFiles() {
    }

    /**
     * Reads {@code file} and returns its object.
     *
     * @param file     the file, named in every error
     * @param contents what the object holds, to complete "must hold one JSON object {...} with ...", e.g.
     *                 "the session's settings"
     * @throws InputException when the file cannot be read or breaks a rule above
     */
    public static JsonObject readObject(Path file, String contents) {
        return parseObject(file, TextFiles.read(file), contents);
    }

    /** Reads {@code file} as {@link #readObject} does, wrapped for typed access. */
    public static JsonFields readFields(Path file, String contents) {
        return JsonFields.of(file, readObject(file, contents));
    }

    /**
     * Parses {@code text} by the rules above.
     *
     * @param file     names the text in errors (it is not read)
     * @param text     the file's content; a leading byte-order mark is ignored
     * @param contents what the object holds, as for {@link #readObject}
     */
    public static JsonObject parseObject(Path file, String text, String contents) {
        String body = TextFiles.withoutByteOrderMark(text);
        String expected = "must hold one JSON object {...} with " + contents;
        if (body.isBlank()) {
            throw new InputException(file, "is empty; it " + expected);
        }
        JsonElement root;
        try (JsonReader reader = strictReader(body)) {
            root = parseOne(file, reader, body);
            if (!root.isJsonObject()) {
                throw new InputException(file, expected);
            }
            refuseTrailingText(file, reader);
        } catch (IOException e) {
            throw new InputException(file, "cannot be read (" + e.getMessage() + ")", e);
        }
        refuseDuplicateKeys(file, body);
        return root.getAsJsonObject();
    }

    private static JsonReader strictReader(String text) {
        JsonReader reader = new JsonReader(new StringReader(text));
        reader.setStrictness(Strictness.STRICT);
        return reader;
    }

    private static JsonElement parseOne(Path file, JsonReader reader, String text) {
        try {
            return JsonParser.parseReader(reader);
        } catch (JsonParseException e) {
            throw syntaxError(file, e, text);
        }
    }

    /** One sentence for a syntax error: the line, and a likely cause. */
    private static InputException syntaxError(Path file, JsonParseException e, String text) {
        String message = messageChain(e);
        Matcher where = WHERE.matcher(message);
        String line = where.find() ? where.group(1) : null;
        String at = line == null ? "somewhere" : "line " + line;
        if (message.contains("End of input")) {
            return new InputException(file, "is not valid JSON: it ends too early (" + at
                    + "); a closing brace or bracket is probably missing", e);
        }
        if (line != null) {
            // Gson stops at the first character of a literal it does not accept: is it NaN or Infinity?
            String lineText = text.lines().skip(Integer.parseInt(line) - 1L).findFirst().orElse("");
            int column = Integer.parseInt(where.group(2)) - 1;
            Matcher literal = NOT_A_NUMBER.matcher(lineText);
            if (column < lineText.length() && literal.find(column) && literal.start() == column) {
                return new InputException(file, "is not valid JSON: " + keyPhrase(where.group(3)) + "holds "
                        + literal.group() + " at " + at + ", which JSON does not allow; write a number", e);
            }
        }
        if (message.contains("Nesting limit")) {
            return new InputException(file, "is not valid JSON for this tool: its lists and objects are nested too "
                    + "deeply (" + at + ")", e);
        }
        return new InputException(file, "is not valid JSON: the problem is at " + at
                + " (check for a missing comma or quote, a trailing comma, or a comment)", e);
    }

    private static String keyPhrase(String path) {
        String key = JsonFields.keyOfPath(path);
        return key.isEmpty() ? "" : "key \"" + key + "\" ";
    }

    private static String messageChain(Throwable e) {
        StringBuilder b = new StringBuilder();
        for (Throwable t = e; t != null; t = t.getCause()) {
            b.append(t.getMessage()).append(' ');
        }
        return b.toString();
    }

    private static void refuseTrailingText(Path file, JsonReader reader) throws IOException {
        try {
            if (reader.peek() == JsonToken.END_DOCUMENT) {
                return;
            }
        } catch (IOException | IllegalStateException e) {
            // strict mode refuses a second value with a syntax error: the same refusal as below
        }
        Matcher where = WHERE.matcher(reader.toString());
        String at = where.find() ? " (line " + where.group(1) + ")" : "";
        throw new InputException(file, "has text after the end of its JSON object" + at
                + "; a file holds one object {...} and nothing after it");
    }

    /**
     * Walks the text once more, object by object, and refuses the first key given twice in one object. The
     * text is already known to be valid JSON, so only the names are looked at; values are skipped.
     */
    private static void refuseDuplicateKeys(Path file, String text) {
        try (JsonReader reader = strictReader(text)) {
            walk(file, reader);
        } catch (IOException | IllegalStateException e) {
            throw new IllegalStateException("text that parsed as JSON failed the second reading", e);
        }
    }

    private static void walk(Path file, JsonReader reader) throws IOException {
        JsonToken token = reader.peek();
        if (token == JsonToken.BEGIN_OBJECT) {
            reader.beginObject();
            Set<String> seen = new HashSet<>();
            while (reader.hasNext()) {
                String name = reader.nextName();
                if (!seen.add(name)) {
                    Matcher where = WHERE.matcher(reader.toString());
                    String line = where.find() ? " (the second time at line " + where.group(1) + ")" : "";
                    throw new InputException(file, "key \"" + JsonFields.keyOfPath(reader.getPath())
                            + "\" is given twice in the same object" + line + "; keep only the one you mean");
                }
                walk(file, reader);
            }
            reader.endObject();
        } else if (token == JsonToken.BEGIN_ARRAY) {
            reader.beginArray();
            while (reader.hasNext()) {
                walk(file, reader);
            }
            reader.endArray();
        } else {
            reader.skipValue();
        }
    }
}
