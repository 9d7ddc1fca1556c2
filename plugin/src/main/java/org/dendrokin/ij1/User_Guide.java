package org.dendrokin.ij1;

import java.util.Map;

import ij.IJ;
import ij.gui.HTMLDialog;
import ij.plugin.PlugIn;

import org.dendrokin.io.ToolVersion;
import org.dendrokin.io.text.Html;

/**
 * Plugins > Dendrokin > User Guide: shows a chapter of the user guide from the jar in a text window.
 * The argument {@code "about"} shows the version and licence instead.
 */
public class User_Guide implements PlugIn {
    static final String COMMAND = "User Guide";

    @Override
    public void run(String arg) {
        if ("about".equals(arg)) {
            about();
            return;
        }
        try {
            Map<String, String> chapters = UserGuide.chapters();
            if (chapters.isEmpty()) {
                IJ.error(COMMAND, "This copy of the plug-in was built without its user guide; see docs/README.md"
                        + " in the Dendrokin source folder.");
                return;
            }
            String[] titles = chapters.keySet().toArray(new String[0]);
            OptionsDialog dialog = new OptionsDialog(COMMAND, "guide")
                    .choice("Chapter", titles, pickDefault(titles));
            if (!dialog.show()) {
                return;
            }
            String title = dialog.nextChoice();
            String file = chapters.get(title);
            if (file == null) {
                IJ.error(COMMAND, "The user guide has no chapter called '" + title + "'.");
                return;
            }
            String text = UserGuide.page(file);
            if (OptionsDialog.headless()) {
                IJ.log(text);
            } else {
                Display.place(new HTMLDialog("Dendrokin guide: " + title, GuideHtml.toHtml(text), false), null);
            }
        } catch (RuntimeException e) {
            Failures.show(COMMAND, e);
        }
    }

    private static String pickDefault(String[] titles) {
        for (String t : titles) {
            if (t.toLowerCase(java.util.Locale.ROOT).contains("imagej")) {
                return t;
            }
        }
        return titles[0];
    }

    static String aboutText() {
        return "Dendrokin " + ToolVersion.get() + "\n \n"
                + "Spread of signals along dendrites: kymographs along a drawn path, background and bleach\n"
                + "correction, calibration to concentration, reaction-diffusion simulation, and fits of\n"
                + "diffusion and rate constants with 95% confidence intervals.\n \n"
                + "Plugins > Dendrokin > User Guide shows the manual (it is inside the plug-in jar).\n"
                + "Licence: BSD-2-Clause.";
    }

    private static void about() {
        if (OptionsDialog.headless()) {
            IJ.log(aboutText());
        } else {
            String html = "<html><body style='width:420px'>" + Html.escText(aboutText()).replace("\n \n", "<p>")
                    .replace("\n", " ") + "</body></html>";
            Display.place(new HTMLDialog("About Dendrokin", html, false), null);
        }
    }
}
