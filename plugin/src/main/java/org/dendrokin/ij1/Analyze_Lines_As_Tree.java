package org.dendrokin.ij1;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import java.util.zip.ZipEntry;
import java.util.zip.ZipOutputStream;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.Roi;
import ij.io.RoiEncoder;
import ij.measure.ResultsTable;
import ij.plugin.PlugIn;
import ij.plugin.frame.RoiManager;

import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.SessionRunner;
import org.dendrokin.io.session.ResultsJson;
import org.dendrokin.io.session.SessionConfig;
import org.dendrokin.io.session.TreeSession;

import com.google.gson.GsonBuilder;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

/**
 * Plugins > Dendrokin > Analyze Lines as Tree: every line selection in the ROI Manager is one line of a branched
 * dendrite, the first one the main line that holds the stimulus. Writes a session folder (session.json with a
 * {@code "tree"} block, the lines as {@code lines.zip}, the movie referred to or copied), runs the same analysis as
 * the command line's {@code analyze} on it, and shows the main line's kymograph and a table of the tree fit and of
 * what entered each side line. Recordable: every option is a dialog field.
 */
public class Analyze_Lines_As_Tree implements PlugIn {
    static final String COMMAND = "Analyze Lines as Tree";

    @Override
    public void run(String arg) {
        ImagePlus movie = WindowManager.getCurrentImage();
        if (movie == null) {
            IJ.noImage();
            return;
        }
        IjProgress progress = new IjProgress(COMMAND);
        try {
            RoiManager manager = RoiManager.getInstance2();
            List<Roi> lines = manager == null ? List.of() : lines(manager.getRoisAsArray());
            if (lines.size() < 2) {
                throw new IllegalArgumentException("the ROI Manager holds " + lines.size() + " line selection"
                        + (lines.size() == 1 ? "" : "s") + "; a tree needs at least two, each branch drawn as a line "
                        + "and added with Add [t]");
            }
            ImageSettings cal = ImageSettings.of(movie);
            double pixel = Double.isNaN(cal.pixelSizeUm()) ? 0 : cal.pixelSizeUm();
            OptionsDialog d = new OptionsDialog(COMMAND, "tree");
            d.folder("Session folder (new or empty)", "");
            d.folder("Output folder (empty: beside it, with -results)", "");
            d.number("Pixel size (um)", pixel, 4, false);
            d.number("Frame interval (s)", Double.isNaN(cal.frameIntervalS()) ? 0 : cal.frameIntervalS(), 4, false);
            d.number("Band width (um)", 1, 3);
            d.text("Time of the stimulus (s; empty: detect)", "", 8);
            d.text("Position of the stimulus (um along the first line; empty: detect)", "", 8);
            d.number("Join tolerance (um)", TreeSession.DEFAULT_TOLERANCE_UM, 2);
            if (!d.show()) {
                return;
            }
            String folder = d.nextText();
            String output = d.nextText();
            double px = d.nextNumber();
            double dt = d.nextNumber();
            double band = d.nextNumber();
            String time = d.nextText();
            String position = d.nextText();
            double tolerance = d.nextNumber();
            if (folder.isEmpty()) {
                throw new IllegalArgumentException("choose a folder for the session");
            }
            Path dir = Path.of(folder).toAbsolutePath().normalize();
            write(movie, lines, dir, Save_Session_Folder.movieFile(movie), px, dt, band, time, position, tolerance);
            Path outDir = output.isEmpty() ? Analyze_Session_Folder.defaultOutput(dir) : Path.of(output);
            SessionRunner.Result result = SessionRunner.analyze(dir, outDir, progress);
            result.warnings().forEach(w -> IJ.log(COMMAND + " (" + result.session() + "): " + w));
            ImagePlus image = KymographImage.toImage(result.analysis().signal(), result.session());
            Display.showKymograph(image);
            Tables.show(table(outDir.resolve(ResultsJson.FILE_NAME)), "Dendrokin tree " + result.session(),
                    image.getWindow());
            progress.finish(COMMAND + ": results in " + outDir);
        } catch (RuntimeException e) {
            Failures.show(COMMAND, e);
        }
    }

    /** The line selections among the ROIs, in order. */
    static List<Roi> lines(Roi[] rois) {
        List<Roi> out = new ArrayList<>();
        for (Roi r : rois) {
            if (r != null && r.isLine()) {
                out.add(r);
            }
        }
        return out;
    }

    /**
     * Writes the session folder: lines.zip (the lines, each named by its ROI name, else line-N), the movie (referred
     * to, or copied as movie.tif when it has no TIFF file) and session.json last. Refuses a folder that already holds
     * a session.json.
     */
    static void write(ImagePlus movie, List<Roi> lines, Path dir, Path movieFile, double pixelSizeUm,
            double frameIntervalS, double bandWidthUm, String stimulusTime, String stimulusPosition,
            double toleranceUm) {
        Path sessionJson = dir.resolve(SessionConfig.FILE_NAME);
        if (Files.exists(sessionJson)) {
            throw new IllegalArgumentException(sessionJson + " already exists; choose a new or empty folder");
        }
        if (!(pixelSizeUm > 0) || !(frameIntervalS > 0) || !(toleranceUm > 0)) {
            throw new IllegalArgumentException("Pixel size (um), frame interval (s) and join tolerance (um) must be "
                    + "positive numbers");
        }
        ByteArrayOutputStream zip = new ByteArrayOutputStream();
        Set<String> names = new HashSet<>();
        try (ZipOutputStream z = new ZipOutputStream(zip, StandardCharsets.UTF_8)) {
            for (int i = 0; i < lines.size(); i++) {
                Roi roi = (Roi) lines.get(i).clone();
                String name = roi.getName() == null || roi.getName().isBlank() ? "line-" + (i + 1) : roi.getName();
                if (!names.add(name)) {
                    throw new IllegalArgumentException("two lines in the ROI Manager are named " + name + "; rename "
                            + "one (Rename... in the ROI Manager)");
                }
                roi.setName(name);
                z.putNextEntry(new ZipEntry(name + ".roi"));
                z.write(RoiEncoder.saveAsByteArray(roi));
                z.closeEntry();
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        byte[] bytes = zip.toByteArray();
        JsonObject json = new JsonObject();
        json.addProperty("description", "Saved from ImageJ by " + COMMAND + " from " + movie.getTitle());
        json.addProperty("movie", movieFile == null ? "movie.tif" : Save_Session_Folder.reference(dir, movieFile));
        json.addProperty("path", "lines.zip");
        json.addProperty("path_width_um", bandWidthUm);
        json.addProperty("pixel_size_um", pixelSizeUm);
        json.addProperty("frame_interval_s", frameIntervalS);
        if (!stimulusTime.isEmpty() || !stimulusPosition.isEmpty()) {
            JsonObject stimulus = new JsonObject();
            if (!stimulusTime.isEmpty()) {
                stimulus.addProperty("time_s", number(stimulusTime, "Time of the stimulus"));
            }
            if (!stimulusPosition.isEmpty()) {
                stimulus.addProperty("position_um", number(stimulusPosition, "Position of the stimulus"));
            }
            json.add("stimulus", stimulus);
        }
        JsonObject cal = new JsonObject();
        cal.addProperty("method", "none");
        json.add("calibration", cal);
        JsonObject tree = new JsonObject();
        tree.addProperty("join_tolerance_um", toleranceUm);
        json.add(TreeSession.KEY, tree);
        AtomicFiles.write(dir.resolve("lines.zip"), out -> out.write(bytes));
        if (movieFile == null) {
            Kymograph_Along_Line.saveTiff(movie, dir.resolve("movie.tif"));
        }
        AtomicFiles.writeString(sessionJson, new GsonBuilder().setPrettyPrinting().create().toJson(json) + "\n");
        SessionConfig.read(dir);
    }

    /** The tree fit's D and k and what entered each side line, from results.json's "tree" section. */
    static ResultsTable table(Path resultsJson) {
        ResultsTable t = Tables.quantities();
        JsonObject tree;
        try {
            tree = JsonParser.parseString(Files.readString(resultsJson)).getAsJsonObject().getAsJsonObject("tree");
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        JsonElement fit = tree.get("fit");
        if (fit != null && fit.isJsonObject() && fit.getAsJsonObject().get("converged").getAsBoolean()) {
            JsonObject p = fit.getAsJsonObject().getAsJsonObject("parameters");
            for (String name : List.of("D", "k")) {
                JsonObject e = p.getAsJsonObject(name);
                double[] ci = interval(e.get("ci95"));
                Tables.add(t, "tree fit", name, e.get("value").getAsDouble(), e.get("unit").getAsString(), ci[0],
                        ci[1], e.get("ci_method").getAsString());
            }
        }
        for (JsonElement el : tree.getAsJsonArray("entered_side_branches")) {
            JsonObject e = el.getAsJsonObject();
            Tables.add(t, e.get("line").getAsString(), "entered: data / model", value(e.get("data_over_model")), "",
                    Double.NaN, Double.NaN, String.format(Locale.ROOT, "%.3g um from the stimulus along the tree",
                            value(e.get("distance_from_stimulus_um"))));
        }
        return t;
    }

    private static double[] interval(JsonElement ci) {
        if (ci == null || !ci.isJsonArray()) {
            return new double[] {Double.NaN, Double.NaN};
        }
        return new double[] {value(ci.getAsJsonArray().get(0)), value(ci.getAsJsonArray().get(1))};
    }

    private static double value(JsonElement e) {
        return e == null || e.isJsonNull() ? Double.NaN : e.getAsDouble();
    }

    private static double number(String text, String what) {
        try {
            return Double.parseDouble(text.trim());
        } catch (NumberFormatException e) {
            throw new IllegalArgumentException(what + " must be a number or empty, got '" + text + "'");
        }
    }
}
