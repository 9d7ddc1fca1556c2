package org.dendrokin.ij1;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * The user guide (docs/*.md) as shipped inside the plug-in jar, so that help works without a network.
 * Chapters are found through the links in the guide's contents page, README.md.
 */
public final class UserGuide {
    /** Where the build puts the guide inside the jar. */
    static final String FOLDER = "/org/dendrokin/guide/";
    private static final Pattern LINK = Pattern.compile("\\[([^\\]]+)\\]\\(([A-Za-z0-9_-]+\\.md)\\)");

    private UserGuide() {
    }

    /** The text of one page of the guide, e.g. {@code "imagej.md"}; null if the jar does not have it. */
    public static String page(String fileName) {
        try (InputStream in = UserGuide.class.getResourceAsStream(FOLDER + fileName)) {
            return in == null ? null : new String(in.readAllBytes(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException("could not read the user guide page " + fileName, e);
        }
    }

    /** Chapter titles to file names, in the order of the contents page, which comes first. */
    public static Map<String, String> chapters() {
        Map<String, String> chapters = new LinkedHashMap<>();
        String contents = page("README.md");
        if (contents == null) {
            return chapters;
        }
        chapters.put("Contents", "README.md");
        Matcher m = LINK.matcher(contents);
        List<String> seen = new ArrayList<>();
        while (m.find()) {
            if (!seen.contains(m.group(2)) && page(m.group(2)) != null) {
                seen.add(m.group(2));
                chapters.put(m.group(1), m.group(2));
            }
        }
        return chapters;
    }
}
