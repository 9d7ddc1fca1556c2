package org.dendrokin.ij1;

import java.util.regex.Pattern;

import org.dendrokin.io.text.Html;

/**
 * Our user guide's Markdown as simple HTML for ImageJ's HTML window: headings, paragraphs, lists, tables,
 * code blocks, bold and code spans. Pictures are named, not shown (the screenshots are wider than the
 * window); links keep their text. Only the subset the guide uses is understood; anything else shows as text.
 */
final class GuideHtml {
    private static final Pattern IMAGE = Pattern.compile("!\\[([^\\]]*)\\]\\(([^)]*)\\)");
    private static final Pattern LINK = Pattern.compile("\\[([^\\]]+)\\]\\(([^)]*)\\)");
    private static final Pattern CODE = Pattern.compile("`([^`]+)`");
    private static final Pattern BOLD = Pattern.compile("\\*\\*([^*]+)\\*\\*");

    private GuideHtml() {
    }

    static String toHtml(String markdown) {
        StringBuilder html = new StringBuilder("<html><body>");
        String[] lines = markdown.split("\n", -1);
        StringBuilder paragraph = new StringBuilder();
        boolean inList = false;
        boolean inTable = false;
        for (int i = 0; i < lines.length; i++) {
            String line = lines[i];
            String trimmed = line.trim();
            if (trimmed.startsWith("```")) {
                flush(html, paragraph);
                html.append("<pre>");
                for (i++; i < lines.length && !lines[i].trim().startsWith("```"); i++) {
                    html.append(Html.escText(lines[i])).append('\n');
                }
                html.append("</pre>");
                continue;
            }
            boolean listItem = trimmed.startsWith("- ");
            boolean tableRow = trimmed.startsWith("|");
            if (inList && !listItem && (trimmed.isEmpty() || !line.startsWith(" "))) {
                flush(html, paragraph);
                html.append("</li></ul>");
                inList = false;
            }
            if (inTable && !tableRow) {
                html.append("</table>");
                inTable = false;
            }
            if (trimmed.isEmpty()) {
                flush(html, paragraph);
            } else if (trimmed.startsWith("#")) {
                flush(html, paragraph);
                int level = Math.min(3, trimmed.indexOf(' ') > 0 ? trimmed.indexOf(' ') : 1);
                html.append("<h").append(level).append('>').append(inline(trimmed.substring(level).trim()))
                        .append("</h").append(level).append('>');
            } else if (tableRow) {
                flush(html, paragraph);
                if (trimmed.matches("\\|[ \\-|:]+\\|?")) {
                    continue;
                }
                if (!inTable) {
                    html.append("<table border='1' cellspacing='0' cellpadding='3'>");
                    inTable = true;
                }
                html.append("<tr>");
                for (String cell : trimmed.substring(1, trimmed.endsWith("|") ? trimmed.length() - 1
                        : trimmed.length()).split("\\|")) {
                    html.append("<td>").append(inline(cell.trim())).append("</td>");
                }
                html.append("</tr>");
            } else if (listItem) {
                flush(html, paragraph);
                html.append(inList ? "</li><li>" : "<ul><li>");
                inList = true;
                paragraph.append(trimmed.substring(2)).append(' ');
            } else {
                paragraph.append(trimmed).append(' ');
            }
        }
        flush(html, paragraph);
        if (inList) {
            html.append("</li></ul>");
        }
        if (inTable) {
            html.append("</table>");
        }
        return html.append("</body></html>").toString();
    }

    private static void flush(StringBuilder html, StringBuilder paragraph) {
        if (paragraph.length() > 0) {
            html.append("<p>").append(inline(paragraph.toString().trim())).append("</p>");
            paragraph.setLength(0);
        }
    }

    static String inline(String text) {
        String s = Html.escText(text);
        s = IMAGE.matcher(s).replaceAll("<i>[picture: $1]</i>");
        s = LINK.matcher(s).replaceAll("<u>$1</u>");
        s = CODE.matcher(s).replaceAll("<code>$1</code>");
        s = BOLD.matcher(s).replaceAll("<b>$1</b>");
        return s;
    }
}
