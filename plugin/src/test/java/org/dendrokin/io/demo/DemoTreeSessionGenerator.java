package org.dendrokin.io.demo;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import java.util.zip.ZipEntry;
import java.util.zip.ZipOutputStream;

import org.dendrokin.core.model.SolverSettings;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.core.model.TreeDomain;
import org.dendrokin.core.model.TreeGeometry;
import org.dendrokin.core.model.TreeRun;
import org.dendrokin.core.model.TreeStimulus;
import org.dendrokin.io.AtomicFiles;

import ij.ImagePlus;
import ij.ImageStack;
import ij.gui.Line;
import ij.gui.Roi;
import ij.io.FileSaver;
import ij.io.RoiEncoder;
import ij.measure.Calibration;
import ij.process.ShortProcessor;

/**
 * Writes a synthetic branched session: a 16-bit TIFF time series of a dendrite with side branches, its lines as an
 * ImageJ ROI set ({@code branches.zip}) and a {@code session.json} with a {@code "tree"} block. Seeded: the same
 * scenario gives the same bytes.
 * <p>
 * Scenario (our own, for demonstration): a trunk 28 um long; 16 um from its left end a side branch leaves it
 * (side_a), and at its right end it forks into two daughters (side_b, side_c), all of one thickness. A brief focal
 * release at 14 um along the trunk at 2.5 s spreads by diffusion with first-order decay, dF/F0 obeying
 * du/dt = D d2u/dx2 - k u on the tree (continuity and conservation of flux at the junctions, sealed ends), solved by
 * Dendrokin's tree engine on a fine grid (0.05 um, compact fourth-order scheme). The camera sees the dye's resting
 * brightness (a Gaussian cross-section around each line) times 1 + dF/F0, bleaching, over an offset, with photon
 * and read noise.
 * <p>
 * Usage: {@code java -cp "$(bench/test-classpath.sh)" org.dendrokin.io.demo.DemoTreeSessionGenerator [OUT_DIR]}
 * (default {@code test-images/demo-tree}).
 */
public final class DemoTreeSessionGenerator {
    /** True diffusion coefficient, um^2/s. */
    public static final double D = 4.0;
    /** True decay rate, 1/s. */
    public static final double K = 0.05;
    static final int WIDTH = 160;
    static final int HEIGHT = 96;
    static final int FRAMES = 140;
    static final double PIXEL_UM = 0.25;
    static final double FRAME_S = 0.25;
    static final double STIMULUS_S = 5.0;
    static final double STIMULUS_UM = 14.0;
    static final double WIDTH_UM = 1.0;
    static final double PEAK = 3.0;
    static final double REST = 500;
    static final double OFFSET = 100;
    static final double BLEACH_S = 200;
    static final double READ_NOISE = 3;
    static final long SEED = 20261204L;

    /** The lines, in image pixels: {x0, y0, x1, y1}, the trunk first. */
    static final Map<String, double[]> LINES = lines();

    private DemoTreeSessionGenerator() {
    }

    /** The lines, in image pixels (pixel centres at half-integers): name to {x0, y0, x1, y1}, the trunk first. */
    public static Map<String, double[]> lines() {
        Map<String, double[]> m = new LinkedHashMap<>();
        m.put("trunk", new double[] {8, 48, 120, 48});
        m.put("side_a", new double[] {72, 48, 112, 8});
        m.put("side_b", new double[] {120, 48, 152, 84});
        m.put("side_c", new double[] {120, 48, 154, 14});
        return m;
    }

    public static void main(String[] args) {
        Path out = Path.of(args.length > 0 ? args[0] : "test-images/demo-tree");
        write(out);
        System.out.println("Wrote the branched demo session to " + out.toAbsolutePath());
    }

    private static double lengthUm(String line) {
        double[] l = LINES.get(line);
        return Math.hypot(l[2] - l[0], l[3] - l[1]) * PIXEL_UM;
    }

    /** The true tree: the trunk in two pieces at side_a's branch point, three daughters. */
    static TreeGeometry tree() {
        double cut = (LINES.get("side_a")[0] - LINES.get("trunk")[0]) * PIXEL_UM;
        return TreeGeometry.of(List.of(TreeGeometry.Branch.of("trunk_1", cut),
                        TreeGeometry.Branch.of("trunk_2", lengthUm("trunk") - cut),
                        TreeGeometry.Branch.of("side_a", lengthUm("side_a")),
                        TreeGeometry.Branch.of("side_b", lengthUm("side_b")),
                        TreeGeometry.Branch.of("side_c", lengthUm("side_c"))),
                List.of(TreeGeometry.Junction.of(end("trunk_1", TreeGeometry.End.END),
                                end("trunk_2", TreeGeometry.End.START), end("side_a", TreeGeometry.End.START)),
                        TreeGeometry.Junction.of(end("trunk_2", TreeGeometry.End.END),
                                end("side_b", TreeGeometry.End.START), end("side_c", TreeGeometry.End.START))));
    }

    private static TreeGeometry.BranchEnd end(String b, TreeGeometry.End e) {
        return new TreeGeometry.BranchEnd(b, e);
    }

    /** Writes {@code branches.tif}, {@code branches.zip} and {@code session.json} into {@code dir}. */
    public static void write(Path dir) {
        write(dir, SEED);
    }

    /**
     * As {@link #write(Path)}, with the camera noise drawn from another seed (the scene and its truth are the same).
     */
    public static void write(Path dir, long noiseSeed) {
        writeTiff(render(noiseSeed), dir.resolve("branches.tif"));
        ByteArrayOutputStream zip = new ByteArrayOutputStream();
        try (ZipOutputStream z = new ZipOutputStream(zip)) {
            for (Map.Entry<String, double[]> e : LINES.entrySet()) {
                double[] l = e.getValue();
                // ImageJ line coordinates are pixel corners; the path reader adds half a pixel (LINE_ROI_SHIFT)
                Roi roi = new Line(l[0] - 0.5, l[1] - 0.5, l[2] - 0.5, l[3] - 0.5);
                roi.setName(e.getKey());
                ZipEntry entry = new ZipEntry(e.getKey() + ".roi");
                entry.setTime(0);
                z.putNextEntry(entry);
                z.write(RoiEncoder.saveAsByteArray(roi));
                z.closeEntry();
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        byte[] bytes = zip.toByteArray();
        AtomicFiles.write(dir.resolve("branches.zip"), o -> o.write(bytes));
        AtomicFiles.writeString(dir.resolve("session.json"), String.format(Locale.ROOT, """
                {
                  "description": "Synthetic branched demo: focal release on a trunk with three side branches, \
                spreading by diffusion with decay through the tree; made by \
                org.dendrokin.io.demo.DemoTreeSessionGenerator",
                  "movie": "branches.tif",
                  "path": "branches.zip",
                  "path_width_um": 1.0,
                  "stimulus": {"time_s": %s, "position_um": %s},
                  "models": ["diffusion-decay"],
                  "calibration": {"method": "none"},
                  "tree": {"join_tolerance_um": 1.0}
                }
                """, STIMULUS_S, STIMULUS_UM));
    }

    /** The true dF/F0 of every line at every frame, on a 0.05 um grid along each line ({line}{frame}{point}). */
    static Map<String, double[][]> truth() {
        TreeGeometry tree = tree();
        double h = 0.05;
        TreeDomain domain = new TreeDomain(tree, h);
        double[] times = new double[FRAMES];
        for (int f = 0; f < FRAMES; f++) {
            times[f] = f * FRAME_S;
        }
        Map<String, double[]> nodes = TreeRun.nodePositions(domain);
        TreeRun run = TreeRun.prepare("diffusion-decay", domain, times, nodes,
                List.of(new TreeStimulus("trunk_1", Stimulus.pulse(STIMULUS_S, STIMULUS_UM, WIDTH_UM, PEAK))),
                SolverSettings.DEFAULT.withSpatialOrder(4).withFixedStepS(0.005));
        double[] out = new double[FRAMES * run.positionCount()];
        run.solve(new double[] {D, K}, out);
        Map<String, double[][]> byBranch = new LinkedHashMap<>();
        List<String> names = tree.branchNames();
        for (int b = 0; b < names.size(); b++) {
            double[] x = nodes.get(names.get(b));
            double[][] v = new double[FRAMES][x.length];
            for (int f = 0; f < FRAMES; f++) {
                System.arraycopy(out, f * run.positionCount() + run.offset(b), v[f], 0, x.length);
            }
            byBranch.put(names.get(b), v);
        }
        // the trunk's two pieces joined again (the junction node once)
        double[][] t1 = byBranch.get("trunk_1");
        double[][] t2 = byBranch.get("trunk_2");
        double[][] trunk = new double[FRAMES][t1[0].length + t2[0].length - 1];
        for (int f = 0; f < FRAMES; f++) {
            System.arraycopy(t1[f], 0, trunk[f], 0, t1[f].length);
            System.arraycopy(t2[f], 1, trunk[f], t1[f].length, t2[f].length - 1);
        }
        Map<String, double[][]> out2 = new LinkedHashMap<>();
        out2.put("trunk", trunk);
        for (String s : List.of("side_a", "side_b", "side_c")) {
            out2.put(s, byBranch.get(s));
        }
        return out2;
    }

    private static ImagePlus render(long noiseSeed) {
        Map<String, double[][]> truth = truth();
        double gridUm = 0.05;
        int n = WIDTH * HEIGHT;
        String[] nearestLine = new String[n];
        double[] arc = new double[n];
        double[] rest = new double[n];
        for (int j = 0; j < HEIGHT; j++) {
            for (int i = 0; i < WIDTH; i++) {
                double cx = i + 0.5;
                double cy = j + 0.5;
                double best = Double.POSITIVE_INFINITY;
                for (Map.Entry<String, double[]> e : LINES.entrySet()) {
                    double[] l = e.getValue();
                    double ex = l[2] - l[0];
                    double ey = l[3] - l[1];
                    double len2 = ex * ex + ey * ey;
                    double u = Math.max(0, Math.min(1, ((cx - l[0]) * ex + (cy - l[1]) * ey) / len2));
                    double d = Math.hypot(cx - l[0] - u * ex, cy - l[1] - u * ey);
                    if (d < best) {
                        best = d;
                        nearestLine[j * WIDTH + i] = e.getKey();
                        arc[j * WIDTH + i] = u * Math.sqrt(len2) * PIXEL_UM;
                    }
                }
                double dUm = best * PIXEL_UM;
                rest[j * WIDTH + i] = REST * Math.exp(-dUm * dUm / (2 * 0.4 * 0.4));
            }
        }
        Random random = new Random(noiseSeed);
        ImageStack stack = new ImageStack(WIDTH, HEIGHT);
        for (int f = 0; f < FRAMES; f++) {
            double t = f * FRAME_S;
            double bleach = Math.exp(-t / BLEACH_S);
            short[] pixels = new short[n];
            for (int k = 0; k < n; k++) {
                double[] row = truth.get(nearestLine[k])[f];
                double q = arc[k] / gridUm;
                int q0 = Math.min(row.length - 2, (int) Math.floor(q));
                double w = q - q0;
                double df = (1 - w) * row[q0] + w * row[q0 + 1];
                double signal = rest[k] * (1 + df) * bleach;
                double noisy = OFFSET + signal + Math.sqrt(signal + READ_NOISE * READ_NOISE) * random.nextGaussian();
                pixels[k] = (short) Math.max(0, Math.min(65535, Math.round(noisy)));
            }
            stack.addSlice("t=" + String.format(Locale.ROOT, "%.2f", t) + " s",
                    new ShortProcessor(WIDTH, HEIGHT, pixels, null));
        }
        ImagePlus imp = new ImagePlus("branches", stack);
        imp.setDimensions(1, 1, FRAMES);
        imp.setOpenAsHyperStack(true);
        Calibration cal = new Calibration();
        cal.pixelWidth = PIXEL_UM;
        cal.pixelHeight = PIXEL_UM;
        cal.setUnit("micron");
        cal.frameInterval = FRAME_S;
        cal.setTimeUnit("sec");
        imp.setCalibration(cal);
        return imp;
    }

    private static void writeTiff(ImagePlus imp, Path target) {
        try {
            Path dir = target.toAbsolutePath().getParent();
            Files.createDirectories(dir);
            Path tmp = Files.createTempFile(dir, ".branches.", ".tif");
            try {
                if (!new FileSaver(imp).saveAsTiffStack(tmp.toString())) {
                    throw new IOException("ImageJ could not save the stack");
                }
                byte[] bytes = Files.readAllBytes(tmp);
                AtomicFiles.write(target, o -> o.write(bytes));
            } finally {
                Files.deleteIfExists(tmp);
            }
        } catch (IOException e) {
            throw new UncheckedIOException("could not write " + target + ": " + e.getMessage(), e);
        }
    }
}
