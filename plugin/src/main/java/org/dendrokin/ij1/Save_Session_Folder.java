package org.dendrokin.ij1;

import java.nio.file.Files;
import java.nio.file.Path;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.Roi;
import ij.io.FileInfo;
import ij.io.RoiEncoder;
import ij.plugin.PlugIn;

import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.session.SessionConfig;

import com.google.gson.GsonBuilder;
import com.google.gson.JsonObject;

/**
 * Plugins > Dendrokin > Save Session Folder: turns what is on the screen (the movie, the line drawn along
 * the dendrite, the settings) into a session folder that Analyze Session Folder, Analyze Many Sessions and
 * the command line can run again later: session.json, path.roi and either a reference to the movie's file
 * or a copy of the movie. The new session.json is read back with the same reader the analysis uses, so a
 * folder this command writes is one the analysis accepts.
 */
public class Save_Session_Folder implements PlugIn {
    static final String COMMAND = "Save Session Folder";
    static final String[] MOVIE = {"refer to its file", "save a copy in the folder"};

    @Override
    public void run(String arg) {
        ImagePlus movie = WindowManager.getCurrentImage();
        if (movie == null) {
            IJ.noImage();
            return;
        }
        try {
            LineSelection line = LineSelection.of(movie.getRoi(), "selection");
            ImageSettings cal = ImageSettings.of(movie);
            double pixel = Double.isNaN(cal.pixelSizeUm()) ? 0 : cal.pixelSizeUm();
            Path file = movieFile(movie);
            OptionsDialog d = new OptionsDialog(COMMAND, "save-session");
            d.folder("Session folder (new or empty)", "");
            d.choice("Movie", MOVIE, file != null ? MOVIE[0] : MOVIE[1]);
            d.number("Pixel size (um)", pixel, 4, false);
            d.number("Frame interval (s)", Double.isNaN(cal.frameIntervalS()) ? 0 : cal.frameIntervalS(), 4, false);
            d.number("Band width (um)", pixel > 0 ? Math.round(line.widthPx() * pixel * 1e4) / 1e4 : 1, 3, false);
            d.text("Time of the stimulus (s; empty: detect)", "", 8);
            d.text("Position of the stimulus (um along the path; empty: detect)", "", 8);
            d.text("Background (intensity; empty: estimate)", "", 8);
            d.file("Calibration file (JSON; empty: none, the signal stays dF/F0)", "");
            if (!d.show()) {
                return;
            }
            String folder = d.nextText();
            boolean copy = d.nextChoice().equals(MOVIE[1]);
            double px = d.nextNumber();
            double dt = d.nextNumber();
            double band = d.nextNumber();
            String time = d.nextText();
            String position = d.nextText();
            String background = d.nextText();
            String calibration = d.nextText();
            if (folder.isEmpty()) {
                throw new IllegalArgumentException("choose a folder for the session");
            }
            Path dir = Path.of(folder).toAbsolutePath().normalize();
            write(movie, line.roi(), dir, copy ? null : file, px, dt, band, time, position, background, calibration);
            IJ.showStatus(COMMAND + ": " + dir.resolve(SessionConfig.FILE_NAME) + " written.");
        } catch (RuntimeException e) {
            Failures.show(COMMAND, e);
        }
    }

    /** The file the movie was opened from, if it is a TIFF on disk; null otherwise. */
    static Path movieFile(ImagePlus movie) {
        FileInfo fi = movie.getOriginalFileInfo();
        if (fi == null || fi.directory == null || fi.fileName == null || fi.directory.isEmpty()) {
            return null;
        }
        Path p = Path.of(fi.directory, fi.fileName);
        String name = p.getFileName().toString().toLowerCase(java.util.Locale.ROOT);
        return Files.isRegularFile(p) && (name.endsWith(".tif") || name.endsWith(".tiff")) ? p : null;
    }

    /**
     * Writes the session folder. Refuses a folder that already holds a session.json, so nothing is overwritten.
     *
     * @param movieFile the movie's file to refer to, or null to save a copy of the movie as movie.tif
     */
    static void write(ImagePlus movie, Roi roi, Path dir, Path movieFile, double pixelSizeUm, double frameIntervalS,
            double bandWidthUm, String stimulusTime, String stimulusPosition, String background, String calibration) {
        Path sessionJson = dir.resolve(SessionConfig.FILE_NAME);
        if (Files.exists(sessionJson)) {
            throw new IllegalArgumentException(sessionJson + " already exists; choose a new or empty folder");
        }
        if (!(pixelSizeUm > 0) || !(frameIntervalS > 0)) {
            throw new IllegalArgumentException("Pixel size (um) and frame interval (s) must be positive numbers");
        }
        JsonObject json = new JsonObject();
        json.addProperty("description", "Saved from ImageJ by " + COMMAND + " from " + movie.getTitle());
        if (movieFile == null) {
            json.addProperty("movie", "movie.tif");
        } else {
            json.addProperty("movie", reference(dir, movieFile));
        }
        json.addProperty("path", "path.roi");
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
        if (!background.isEmpty()) {
            JsonObject bg = new JsonObject();
            bg.addProperty("value", number(background, "Background"));
            json.add("background", bg);
        }
        JsonObject cal = new JsonObject();
        if (calibration.isEmpty()) {
            cal.addProperty("method", "none");
        } else {
            Path calFile = Path.of(calibration).toAbsolutePath().normalize();
            if (!Files.isRegularFile(calFile)) {
                throw new IllegalArgumentException("the calibration file " + calFile + " does not exist");
            }
            cal.addProperty("method", "standards");
            cal.addProperty("file", reference(dir, calFile));
        }
        json.add("calibration", cal);

        byte[] roiBytes = RoiEncoder.saveAsByteArray(roi);
        AtomicFiles.write(dir.resolve("path.roi"), out -> out.write(roiBytes));
        if (movieFile == null) {
            Kymograph_Along_Line.saveTiff(movie, dir.resolve("movie.tif"));
        }
        // session.json last: the folder counts as a session only once everything it names is there
        AtomicFiles.writeString(sessionJson, new GsonBuilder().setPrettyPrinting().create().toJson(json) + "\n");
        SessionConfig.read(dir);
    }

    /**
     * How session.json names a file: relative to the session folder when it lies in the folder or next to it
     * (so the folders can move together), else its absolute path.
     */
    static String reference(Path dir, Path file) {
        Path abs = file.toAbsolutePath().normalize();
        Path rel = dir.relativize(abs);
        int ups = 0;
        for (Path part : rel) {
            if (part.toString().equals("..")) {
                ups++;
            }
        }
        return (ups <= 1 ? rel : abs).toString().replace('\\', '/');
    }

    private static double number(String text, String what) {
        try {
            return Double.parseDouble(text.trim());
        } catch (NumberFormatException e) {
            throw new IllegalArgumentException(what + " must be a number or empty, got '" + text + "'");
        }
    }
}
