package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class GuideHtmlTest {
    @Test
    void rendersTheMarkdownTheGuideUses() {
        String html = GuideHtml.toHtml("""
                # Title
                Some **bold** and `code`, a [link](x.md)
                and a second line.

                - one
                  continued
                - two

                | key | meaning |
                | --- | --- |
                | `d` | D, um^2/s |

                ```
                run("A", "b=<1>");
                ```
                ![The menu](images/menu.png)
                """);
        assertEquals("<html><body><h1>Title</h1><p>Some <b>bold</b> and <code>code</code>, a <u>link</u> and a second"
                + " line.</p><ul><li><p>one continued</p></li><li><p>two</p></li></ul><table border='1' cellspacing='0'"
                + " cellpadding='3'><tr><td>key</td><td>meaning</td></tr><tr><td><code>d</code></td><td>D, um^2/s</td>"
                + "</tr></table><pre>run(\"A\", \"b=&lt;1&gt;\");\n</pre><p><i>[picture: The menu]</i></p></body></html>",
                html);
    }

    @Test
    void theWholeGuideConverts() {
        for (String file : UserGuide.chapters().values()) {
            String html = GuideHtml.toHtml(UserGuide.page(file));
            assertTrue(html.startsWith("<html><body>") && html.endsWith("</body></html>"), file);
        }
    }
}
