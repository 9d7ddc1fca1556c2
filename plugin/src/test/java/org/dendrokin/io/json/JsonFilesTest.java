package org.dendrokin.io.json;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Set;
import java.util.stream.Stream;

import org.dendrokin.io.InputException;
import org.dendrokin.io.model.ModelFile;
import org.dendrokin.io.session.SessionConfig;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonObject;

/** The one JSON reader: which files it accepts, and that every refusal names the file and the line or key. */
class JsonFilesTest {
    private static final Path FILE = Path.of("session.json");

    @TempDir
    Path dir;

    private static JsonObject parse(String text) {
        return JsonFiles.parseObject(FILE, text, "the settings");
    }

    private static String refusal(String text) {
        String message = assertThrows(InputException.class, () -> parse(text), text).getMessage();
        assertTrue(message.startsWith(FILE + ": "), "names the file first: " + message);
        assertEquals(1, message.lines().count(), "one line: " + message);
        return message;
    }

    @Test
    void aKeyGivenTwiceInOneObjectIsRefusedWithItsFullKeyAndLine() {
        // REF: RFC 8259 section 4, "The names within an object SHOULD be unique" [published standard]
        String top = refusal("{\"movie\": \"a.tif\",\n \"movie\": \"b.tif\"}");
        assertTrue(top.contains("key \"movie\"") && top.contains("twice") && top.contains("line 2"), top);
        String nested = refusal("{\"stimulus\": {\"time_s\": 1,\n\n \"time_s\": 2}}");
        assertTrue(nested.contains("key \"stimulus.time_s\"") && nested.contains("line 3"), nested);
        String inList = refusal("{\"stimuli\": [{\"kind\": \"pulse\"}, {\"kind\": \"pulse\", \"kind\": \"clamp\"}]}");
        assertTrue(inList.contains("key \"stimuli[1].kind\""), inList);
        JsonObject sameNameElsewhere = parse("{\"a\": {\"x\": 1}, \"b\": {\"x\": 2}, \"c\": [{\"x\": 3}, {\"x\": 4}]}");
        assertEquals(2, sameNameElsewhere.getAsJsonObject("b").get("x").getAsInt(), "one name in several objects");
    }

    @Test
    void aByteOrderMarkIsIgnored() throws IOException {
        // REF: RFC 8259 section 8.1, parsers MAY ignore a byte order mark [published standard]
        assertEquals(1, parse("\uFEFF{\"a\": 1}").get("a").getAsInt());
        Path file = dir.resolve("bom.json");
        byte[] body = "{\"path_width_um\": 2.5}".getBytes(StandardCharsets.UTF_8);
        byte[] withMark = new byte[body.length + 3];
        withMark[0] = (byte) 0xEF;
        withMark[1] = (byte) 0xBB;
        withMark[2] = (byte) 0xBF;
        System.arraycopy(body, 0, withMark, 3, body.length);
        Files.write(file, withMark);
        assertEquals(2.5, JsonFiles.readObject(file, "the settings").get("path_width_um").getAsDouble(), 0.0);
        assertEquals(2.5, SessionConfig.parse(file, Files.readString(file)).pathWidthUm(), 0.0, "session.json too");
    }

    @Test
    void textAfterTheObjectIsRefusedButTrailingWhitespaceIsNot() {
        String garbage = refusal("{\"a\": 1}\n}");
        assertTrue(garbage.contains("text after the end") && garbage.contains("line 2"), garbage);
        assertTrue(refusal("{\"a\": 1}{\"b\": 2}").contains("text after the end"), "a second object");
        assertTrue(refusal("{\"a\": 1} x").contains("text after the end"), "a stray word");
        assertEquals(1, parse("{\"a\": 1}\n\n  \t\n").get("a").getAsInt(), "whitespace after the object");
    }

    @Test
    void notANumberAndInfinityAreRefusedNamingTheKey() {
        // REF: RFC 8259 section 6, "Numeric values that cannot be represented ... (such as Infinity and NaN)
        // are not permitted" [published standard]
        String nan = refusal("{\"stimulus\": {\n \"time_s\": NaN}}");
        assertTrue(nan.contains("key \"stimulus.time_s\"") && nan.contains("NaN") && nan.contains("line 2"), nan);
        String infinity = refusal("{\"pixel_size_um\": -Infinity}");
        assertTrue(infinity.contains("key \"pixel_size_um\"") && infinity.contains("-Infinity"), infinity);
    }

    @Test
    void nonStandardJsonIsRefusedWithItsLine() {
        // REF: RFC 8259 sections 2-7: no comments, single quotes, unquoted names, trailing commas [published standard]
        for (String text : List.of("{\n// note\n\"a\": 1}", "{\n'a': 1}", "{\na: 1}", "{\"a\": 1,\n\"b\": 2,\n}")) {
            String message = refusal(text);
            assertTrue(message.contains("is not valid JSON") && message.contains("line "), message);
        }
        assertTrue(refusal("{\"a\": [1, 2}").contains("not valid JSON"), "bracket mismatch");
        assertTrue(refusal("{\"a\": {\"b\": 1}").contains("ends too early"), "truncated");
        assertTrue(refusal("").contains("is empty"), "empty");
        assertTrue(refusal("[{\"a\": 1}]").contains("one JSON object"), "a list, not an object");
        assertTrue(refusal("\"text\"").contains("one JSON object"), "a string, not an object");
        assertTrue(refusal("[".repeat(300)).contains("nested too deeply"), "nesting beyond Gson's limit");
    }

    @Test
    void aFileThatIsNotUtf8IsRefusedInOneSentence() throws IOException {
        Path file = dir.resolve("latin1.json");
        Files.write(file, new byte[] {'{', '"', 'a', '"', ':', ' ', '"', (byte) 0xE9, '"', '}'});
        InputException e = assertThrows(InputException.class, () -> JsonFiles.readObject(file, "the settings"));
        assertTrue(e.getMessage().contains("latin1.json") && e.getMessage().contains("not UTF-8"), e.getMessage());
        InputException absent = assertThrows(InputException.class,
                () -> JsonFiles.readObject(dir.resolve("absent.json"), "the settings"));
        assertTrue(absent.getMessage().contains("absent.json") && absent.getMessage().contains("does not exist"),
                absent.getMessage());
    }

    @Test
    void aWrongTypeNamesTheFileTheFullKeyAndTheValue() {
        JsonFields root = JsonFields.of(FILE, parse("{\"stimulus\": {\"time_s\": \"abc\", \"position_um\": -2},"
                + " \"models\": [\"nagumo\", 3], \"flag\": \"yes\", \"list\": [1, \"x\"], \"long\": \""
                + "x".repeat(200) + "\"}"));
        JsonFields stimulus = root.object("stimulus");
        assertEquals(FILE + ": key \"stimulus.time_s\" must be a number, got \"abc\".",
                assertThrows(InputException.class, () -> stimulus.number("time_s")).getMessage());
        assertEquals(FILE + ": key \"stimulus.position_um\" must be zero or a positive number, got -2.",
                assertThrows(InputException.class, () -> stimulus.optionalNonNegative("position_um")).getMessage());
        assertEquals(FILE + ": key \"stimulus.width_um\" must be a positive number (it is missing).",
                assertThrows(InputException.class, () -> stimulus.positive("width_um")).getMessage());
        assertEquals(FILE + ": key \"flag\" must be true or false, got \"yes\".",
                assertThrows(InputException.class, () -> root.flag("flag", false)).getMessage());
        assertTrue(assertThrows(InputException.class, () -> root.strings("models", "must be a list of model names"))
                .getMessage().contains("key \"models\""));
        assertTrue(assertThrows(InputException.class, () -> root.numbers("list")).getMessage()
                .contains("key \"list\" must be a list of numbers"));
        assertTrue(assertThrows(InputException.class, () -> root.object("models")).getMessage()
                .contains("key \"models\" must be an object"));
        String cut = assertThrows(InputException.class, () -> root.number("long")).getMessage();
        assertTrue(cut.endsWith("...") && cut.length() < 200, "a long value is cut: " + cut);
    }

    @Test
    void absentAndNullAreBothNotGivenAndNumbersMustBeFinite() {
        JsonFields root = JsonFields.of(FILE, parse("{\"a\": null, \"b\": 1e400, \"c\": 7, \"d\": 2.5}"));
        assertNull(root.optionalNumber("a"));
        assertNull(root.optionalString("missing"));
        assertEquals(5, root.wholeNumber("a", 0, 10, 5), "default for null");
        assertEquals(7, root.wholeNumber("c", 0, 10, 5));
        assertTrue(assertThrows(InputException.class, () -> root.number("b")).getMessage()
                .contains("must be a number, got 1e400"), "beyond the range of a double");
        assertTrue(assertThrows(InputException.class, () -> root.wholeNumber("d", 0, 10, 5)).getMessage()
                .contains("whole number from 0 to 10"));
        assertArrayEquals(new double[] {1, 2.5}, JsonFields.of(FILE, parse("{\"v\": [1, 2.5]}")).numbers("v"), 0.0);
    }

    @Test
    void unknownKeysAreListedOrRefusedWithTheirFullKey() {
        JsonFields root = JsonFields.of(FILE, parse("{\"solver\": {\"step\": 1, \"max_step_s\": 2}, \"colour\": 1}"));
        assertEquals(List.of("colour"), root.unknownKeys(Set.of("solver")));
        String refused = assertThrows(InputException.class,
                () -> root.object("solver").refuseUnknownKeys(Set.of("max_step_s", "step_factor"))).getMessage();
        assertTrue(refused.contains("unknown key solver.step") && refused.contains("max_step_s, step_factor"), refused);
    }

    @Test
    void everyShippedJsonFileIsAcceptedByItsReader() throws IOException {
        Path repository = Path.of("..").toAbsolutePath().normalize();
        try (Stream<Path> sessions = Files.list(repository.resolve("test-images"))) {
            for (Path session : sessions.filter(p -> Files.isRegularFile(p.resolve("session.json"))).toList()) {
                assertTrue(SessionConfig.read(session).warnings().isEmpty(), session + " reads without warnings");
            }
        }
        try (Stream<Path> models = Files.list(repository.resolve("docs/examples"))) {
            List<Path> files = models.filter(p -> p.toString().endsWith(".json")).toList();
            assertTrue(files.size() >= 3, "the example model files are there");
            for (Path model : files) {
                ModelFile.Parsed parsed = ModelFile.read(model);
                assertTrue(parsed.spec() != null || parsed.tree() != null, model.toString());
            }
        }
    }
}
