package org.dendrokin.io.session;

import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

import org.dendrokin.core.Progress;
import org.dendrokin.core.analysis.AnalysisInputException;
import org.dendrokin.core.analysis.AnalysisResult;
import org.dendrokin.core.analysis.BranchedPaths;
import org.dendrokin.core.analysis.TreeSessionAnalysis;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.InputException;
import org.dendrokin.io.json.JsonFields;
import org.dendrokin.io.json.JsonFiles;
import org.dendrokin.io.path.PathFiles;
import org.dendrokin.io.text.TextFiles;

/**
 * A session with several lines that form a tree, asked for by session.json's {@code "tree"} block:
 * <pre>
 *   "tree": {"paths": ["trunk.csv", "side.csv"], "join_tolerance_um": 2.0}
 * </pre>
 * Without {@code paths}, every line ROI of the session's {@code path} (a .zip ROI set) is a line. The main line is
 * the first one (or the ROI {@code path_roi_name} names): the session's single-path analysis runs on it unchanged,
 * and holds the stimulus. A session without the block is a single-path session, as before.
 */
public final class TreeSession {
    /** The session.json key. */
    public static final String KEY = "tree";
    /** Default largest gap between a line's end and the line it meets, um. */
    public static final double DEFAULT_TOLERANCE_UM = 2.0;
    private static final Set<String> KEYS = Set.of("paths", "join_tolerance_um");

    /**
     * The lines and how they were read.
     *
     * @param paths       by name, main first
     * @param files       the file each line came from, by name
     * @param toleranceUm join tolerance, um
     * @param blame       the file an error about how the lines meet names
     */
    public record Lines(Map<String, DendritePath> paths, Map<String, Path> files, double toleranceUm, Path blame) {
    }

    private TreeSession() {
    }

    /**
     * The lines of a branched session, or null when session.json has no {@code "tree"} block.
     *
     * @param sessionDir the session folder
     * @param config     its settings
     * @param pathFile   the file the session's {@code path} names (used when the block lists no paths), or null
     */
    public static Lines read(Path sessionDir, SessionConfig config, Path pathFile) {
        Path sessionFile = sessionDir.resolve(SessionConfig.FILE_NAME);
        JsonFields root = JsonFields.of(sessionFile, JsonFiles.parseObject(sessionFile, TextFiles.read(sessionFile),
                "the session's settings"));
        JsonFields block = root.optionalObject(KEY);
        if (block == null) {
            return null;
        }
        if (!block.unknownKeys(KEYS).isEmpty()) {
            throw block.fail("key \"" + KEY + "\" holds " + block.unknownKeys(KEYS) + ", which are not among "
                    + KEYS);
        }
        Double tol = block.optionalPositive("join_tolerance_um");
        double tolerance = tol == null ? DEFAULT_TOLERANCE_UM : tol;
        Map<String, DendritePath> paths = new LinkedHashMap<>();
        Map<String, Path> files = new LinkedHashMap<>();
        if (block.has("paths")) {
            List<String> names = block.strings("paths", "must be a list of path files [\"a.csv\", ...]");
            if (names.size() < 2) {
                throw block.bad("paths", "must name at least two path files");
            }
            for (String n : names) {
                Path f = sessionDir.resolve(n);
                String stem = f.getFileName().toString().replaceFirst("\\.[^.]*$", "");
                if (paths.put(stem, PathFiles.read(f, null)) != null) {
                    throw block.bad("paths", "names two files called " + stem);
                }
                files.put(stem, f);
            }
            return new Lines(paths, files, tolerance, sessionFile);
        }
        if (pathFile == null) {
            throw block.fail("key \"" + KEY + "\" needs \"paths\", or \"path\" naming a .zip ROI set");
        }
        Map<String, DendritePath> all = PathFiles.readLines(pathFile);
        String main = config.pathRoiName();
        if (main != null && !all.containsKey(main)) {
            throw new InputException(pathFile, "the ROI set holds no line ROI named \"" + main + "\"");
        }
        if (main != null) {
            paths.put(main, all.get(main));
        }
        all.forEach((n, p) -> paths.putIfAbsent(n, p));
        paths.keySet().forEach(n -> files.put(n, pathFile));
        return new Lines(paths, files, tolerance, pathFile);
    }

    /** Joins the lines into a tree; how they fail to (apart, or in a loop) names the file they came from. */
    public static BranchedPaths join(Lines lines, double pixelSizeUm) {
        try {
            return BranchedPaths.join(lines.paths(), pixelSizeUm, lines.toleranceUm());
        } catch (AnalysisInputException e) {
            throw new InputException(lines.blame(), e.getMessage(), e);
        }
    }

    /** Runs the branched part after the main line's analysis. */
    public static TreeSessionAnalysis.Result analyse(Lines lines, BranchedPaths layout, FrameSource frames,
            SessionConfig config, AnalysisResult main, Progress progress) {
        return TreeSessionAnalysis.run(frames, lines.paths(), layout, main.movie().pixelSizeUm(),
                main.movie().frameIntervalS(), config.pathWidthUm(), config.bleachCorrection(), main, progress);
    }

    /** File name of a line's kymograph. */
    public static String kymographFile(String line) {
        return "kymograph-" + line.replaceAll("[^A-Za-z0-9._-]", "_") + ".csv";
    }

    static String number(double v) {
        return Double.isFinite(v) ? String.format(Locale.ROOT, "%.4g", v) : "n/a";
    }
}
