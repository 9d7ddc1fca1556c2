package org.dendrokin.io.session;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import java.util.zip.ZipEntry;
import java.util.zip.ZipInputStream;

import org.dendrokin.core.analysis.SpineRequest;
import org.dendrokin.core.spines.SpineSettings;
import org.dendrokin.core.spines.SpineSite;
import org.dendrokin.io.InputException;
import org.dendrokin.io.json.JsonFields;
import org.dendrokin.io.json.JsonFiles;
import org.dendrokin.io.path.RoiBytes;
import org.dendrokin.io.text.TextFiles;

import ij.gui.Roi;
import ij.io.RoiDecoder;
import ij.process.FloatPolygon;

/**
 * The {@code spines} object of session.json, which switches the spine analysis on:
 * <pre>
 *   "spines": {"detect": true, "min_distance_um": 0.8, "max_distance_um": 2.5, "head_radius_um": 0.3,
 *              "threshold_sd": 5, "head_decay_per_s": 0, "stimulated_within_um": 1.5, "rois": "spines.zip"}
 * </pre>
 * Every key is optional ({@code "spines": {}} detects heads with the defaults of {@link SpineSettings#defaults()}).
 * {@code rois} names an ImageJ .roi file or .zip ROI set in the session folder whose point and oval ROIs are spine
 * heads (other ROIs in it, such as the path's line, are passed over); with {@code rois} given, {@code detect}
 * defaults to false. A point at whole-pixel coordinates means that pixel's centre; an oval's centre is its box's
 * centre and its radius half the box's smaller side. Without the key there is no spine analysis.
 */
public final class SpineConfig {
    /** The key in session.json. */
    public static final String KEY = "spines";
    private static final Set<String> KEYS = Set.of("detect", "min_distance_um", "max_distance_um", "head_radius_um",
            "threshold_sd", "head_decay_per_s", "stimulated_within_um", "profiles", "rois", "fitted_shaft");

    private final SpineSettings settings;
    private final String rois;
    private final boolean fittedShaft;
    private final List<String> warnings;

    private SpineConfig(SpineSettings settings, String rois, boolean fittedShaft, List<String> warnings) {
        this.settings = settings;
        this.rois = rois;
        this.fittedShaft = fittedShaft;
        this.warnings = List.copyOf(warnings);
    }

    /** Whether the neck fits may be driven by the shaft's fitted model (key {@code fitted_shaft}, default true). */
    public boolean fittedShaft() {
        return fittedShaft;
    }

    /** The settings; detection as asked. */
    public SpineSettings settings() {
        return settings;
    }

    /** The ROI file name relative to the session folder, or null. */
    public String rois() {
        return rois;
    }

    /** Sentences about keys that were ignored. */
    public List<String> warnings() {
        return warnings;
    }

    /** The spine settings of a session folder's session.json, or null when it has no {@code spines} key. */
    public static SpineConfig read(Path sessionDir) {
        Path file = sessionDir.resolve(SessionConfig.FILE_NAME);
        return parse(file, TextFiles.read(file));
    }

    /** Parses the {@code spines} key of a session.json's text; null when absent. */
    public static SpineConfig parse(Path file, String text) {
        JsonFields root = JsonFields.of(file, JsonFiles.parseObject(file, text, "the session's settings"));
        if (root.get(KEY) == null) {
            return null;
        }
        JsonFields s = root.object(KEY);
        List<String> warnings = new ArrayList<>();
        for (String key : s.unknownKeys(KEYS)) {
            warnings.add(String.format(Locale.ROOT, "%s: key \"%s\" of \"spines\" is not one Dendrokin knows and was "
                    + "ignored.", file.getFileName(), key));
        }
        SpineSettings d = SpineSettings.defaults();
        String rois = s.optionalString("rois");
        boolean detect = s.flag("detect", rois == null);
        if (!detect && rois == null) {
            throw s.bad("detect", "is false, but no \"rois\" file gives the heads: switch detection on or name a ROI "
                    + "file");
        }
        double min = orDefault(s.optionalNonNegative("min_distance_um"), d.minDistanceUm());
        double max = orDefault(s.optionalPositive("max_distance_um"), d.maxDistanceUm());
        if (!(max > min)) {
            throw s.bad("max_distance_um", String.format(Locale.ROOT, "(%s um) must exceed \"min_distance_um\" "
                    + "(%s um)", max, min));
        }
        SpineSettings settings = new SpineSettings(detect, min, max,
                orDefault(s.optionalPositive("head_radius_um"), d.headRadiusUm()),
                orDefault(s.optionalPositive("threshold_sd"), d.thresholdSd()), d.shaftSmoothingUm(),
                orDefault(s.optionalNonNegative("head_decay_per_s"), d.headDecayPerS()),
                orDefault(s.optionalNonNegative("stimulated_within_um"), d.stimulatedWithinUm()),
                s.flag("profiles", d.profiles()));
        return new SpineConfig(settings, rois, s.flag("fitted_shaft", true), warnings);
    }

    private static double orDefault(Double v, double d) {
        return v == null ? d : v;
    }

    /**
     * The request for the analysis, with the given heads read from the ROI file and checked against the image.
     *
     * @param sessionDir the session folder
     * @param widthPx    the movie's width, pixels
     * @param heightPx   the movie's height, pixels
     * @throws InputException when the ROI file is missing, unreadable, holds no point or oval, or a head lies
     *                        outside the image
     */
    public SpineRequest request(Path sessionDir, int widthPx, int heightPx) {
        if (rois == null) {
            return new SpineRequest(settings, List.of(), "", fittedShaft);
        }
        Path file = sessionDir.resolve(rois);
        if (!Files.isRegularFile(file)) {
            throw new InputException(sessionDir.resolve(SessionConfig.FILE_NAME), "key \"spines.rois\" names " + rois
                    + ", which is not in the session folder");
        }
        List<SpineSite> sites = sites(file, widthPx, heightPx);
        if (sites.isEmpty()) {
            throw new InputException(file, "holds no point or oval ROI to take as a spine head");
        }
        return new SpineRequest(settings, sites, file.getFileName().toString(), fittedShaft);
    }

    /** The point and oval ROIs of a .roi file or .zip ROI set as heads, each checked to lie inside the image. */
    static List<SpineSite> sites(Path file, int widthPx, int heightPx) {
        List<SpineSite> out = new ArrayList<>();
        String name = file.getFileName().toString().toLowerCase(Locale.ROOT);
        try {
            if (name.endsWith(".zip")) {
                try (InputStream in = Files.newInputStream(file); ZipInputStream zip = new ZipInputStream(in)) {
                    ZipEntry entry;
                    while ((entry = zip.getNextEntry()) != null) {
                        if (!entry.isDirectory() && entry.getName().toLowerCase(Locale.ROOT).endsWith(".roi")) {
                            String base = entry.getName().substring(0, entry.getName().length() - 4);
                            add(file, decode(file, zip.readAllBytes(), entry.getName()), base, widthPx, heightPx,
                                    out);
                        }
                    }
                }
            } else {
                String base = file.getFileName().toString().replaceFirst("(?i)\\.roi$", "");
                add(file, decode(file, Files.readAllBytes(file), file.getFileName().toString()), base, widthPx,
                        heightPx, out);
            }
        } catch (IOException e) {
            throw new InputException(file, "the spine ROIs could not be read (" + e.getMessage() + ")", e);
        }
        return out;
    }

    private static Roi decode(Path file, byte[] bytes, String entry) {
        Roi roi;
        try {
            roi = new RoiDecoder(RoiBytes.withoutGroup(bytes), entry).getRoi();
        } catch (IOException | RuntimeException e) {
            roi = null;
        }
        if (roi == null) {
            throw new InputException(file, "entry " + entry + " is not an ImageJ ROI");
        }
        return roi;
    }

    private static void add(Path file, Roi roi, String base, int widthPx, int heightPx, List<SpineSite> out) {
        String label = roi.getName() != null ? roi.getName() : base;
        if (roi.getType() == Roi.POINT) {
            FloatPolygon p = roi.getFloatPolygon();
            for (int i = 0; i < p.npoints; i++) {
                double x = p.xpoints[i];
                double y = p.ypoints[i];
                // A point placed on a whole pixel stands for that pixel, whose centre is half a pixel in.
                if (x == Math.rint(x) && y == Math.rint(y)) {
                    x += 0.5;
                    y += 0.5;
                }
                String l = p.npoints > 1 ? label + "-" + (i + 1) : label;
                out.add(inside(file, SpineSite.given(x, y, Double.NaN, l), widthPx, heightPx));
            }
        } else if (roi.getType() == Roi.OVAL) {
            java.awt.geom.Rectangle2D.Double b = roi.getFloatBounds();
            double r = Math.min(b.width, b.height) / 2;
            out.add(inside(file, SpineSite.given(b.x + b.width / 2, b.y + b.height / 2, r > 0 ? r : Double.NaN,
                    label), widthPx, heightPx));
        }
    }

    private static SpineSite inside(Path file, SpineSite s, int widthPx, int heightPx) {
        if (!(s.xPx() >= 0 && s.yPx() >= 0 && s.xPx() < widthPx && s.yPx() < heightPx)) {
            throw new InputException(file, String.format(Locale.ROOT, "the spine ROI \"%s\" at (%.1f, %.1f) px lies "
                    + "outside the movie's %d x %d pixels", s.label(), s.xPx(), s.yPx(), widthPx, heightPx));
        }
        return s;
    }
}
