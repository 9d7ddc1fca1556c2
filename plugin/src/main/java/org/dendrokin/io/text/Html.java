package org.dendrokin.io.text;

/**
 * Escapes text for the HTML pages the tool writes (report, batch index, fit pages, the guide shown in ImageJ).
 * The pages are UTF-8, so only the characters with a meaning in HTML are replaced.
 */
public final class Html {
    private Html() {
    }

    /**
     * Text safe both between tags and inside a quoted attribute value: {@code & < > " '} become entities.
     * Null gives "" (an absent value shows as an empty cell).
     */
    public static String esc(String s) {
        if (s == null) {
            return "";
        }
        StringBuilder b = new StringBuilder(s.length() + 16);
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '&' -> b.append("&amp;");
                case '<' -> b.append("&lt;");
                case '>' -> b.append("&gt;");
                case '"' -> b.append("&quot;");
                case '\'' -> b.append("&#39;");
                default -> b.append(c);
            }
        }
        return b.toString();
    }

    /**
     * Text for between tags only: {@code & < >} become entities and quotes stay as they are, so that code
     * samples keep their quotes in the page source. Never use it inside an attribute value. Null gives "".
     */
    public static String escText(String s) {
        if (s == null) {
            return "";
        }
        return s.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;");
    }
}
