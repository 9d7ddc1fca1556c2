package org.dendrokin.command;

import java.io.File;

import org.dendrokin.core.analysis.MotionMode;
import org.dendrokin.io.InputException;
import org.dendrokin.io.SessionRunner;
import org.dendrokin.io.session.SessionOverrides;
import org.scijava.ItemIO;
import org.scijava.app.StatusService;
import org.scijava.command.Command;
import org.scijava.command.ContextCommand;
import org.scijava.log.LogService;
import org.scijava.plugin.Parameter;
import org.scijava.plugin.Plugin;
import org.scijava.widget.FileWidget;

/**
 * One session folder analysed as the command line's {@code analyze} does, for scripts and headless runs; the
 * signal channel, structural channel, motion and stimulus spot may be set for this run over session.json (script
 * parameters {@code channel}, {@code structuralChannel}, {@code motion}, {@code stimulusSpot}).
 */
@Plugin(type = Command.class, headless = true, menuPath = "Plugins>Dendrokin>Scripting>Analyze One Session")
public class AnalyzeSessionCommand extends ContextCommand {
    /** The choice that keeps session.json's setting. */
    static final String KEEP = "as in session.json";

    @Parameter(label = "Session folder", style = FileWidget.DIRECTORY_STYLE)
    private File sessionDir;

    @Parameter(label = "Output folder", style = FileWidget.DIRECTORY_STYLE)
    private File outDir;

    // Not remembered between runs: a setting for one run must not silently apply to the next.
    @Parameter(label = "Signal channel", required = false, persist = false,
            choices = {KEEP, "1", "2", "3", "4", "5", "6", "7", "8"},
            description = "For this run, over session.json's \"channel\".")
    private String channel = KEEP;

    @Parameter(label = "Structural channel", required = false, persist = false,
            choices = {KEEP, "none", "1", "2", "3", "4", "5", "6", "7", "8"},
            description = "For this run, over session.json's \"structural_channel\".")
    private String structuralChannel = KEEP;

    @Parameter(label = "Motion", required = false, persist = false, choices = {KEEP, "correct", "measure", "off"},
            description = "For this run, over session.json's \"motion\".")
    private String motion = KEEP;

    @Parameter(label = "Stimulus spot (x,y in pixels; empty: from session.json)", required = false, persist = false,
            description = "For this run, over session.json's stimulus place; its time is kept.")
    private String stimulusSpot = "";

    @Parameter(required = false)
    private StatusService status;

    @Parameter(required = false)
    private LogService log;

    @Parameter(type = ItemIO.OUTPUT, label = "Signal unit")
    private String signalUnit;

    @Parameter(type = ItemIO.OUTPUT, label = "Best model")
    private String bestModel;

    @Parameter(type = ItemIO.OUTPUT, label = "Front speed (um/s)")
    private double frontSpeedUmPerS = Double.NaN;

    @Parameter(type = ItemIO.OUTPUT, label = "Report")
    private File report;

    @Override
    public void run() {
        StatusProgress progress = new StatusProgress(status, "Analyze One Session");
        try {
            SessionRunner.Result r = SessionRunner.analyze(sessionDir.toPath(), outDir.toPath(), overrides(),
                    progress);
            if (log != null) {
                r.warnings().forEach(log::warn);
            }
            signalUnit = r.signalUnit();
            bestModel = r.bestModel();
            if (r.analysis().headline().frontSpeed() != null) {
                frontSpeedUmPerS = r.analysis().headline().frontSpeed().value();
            }
            report = r.report().toFile();
        } catch (RuntimeException e) {
            cancel(Commands.sentence(e));
        } finally {
            progress.finish();
        }
    }

    /** The settings chosen for this run over session.json. */
    private SessionOverrides overrides() {
        Integer signal = channel == null || KEEP.equals(channel) ? null : Integer.valueOf(channel);
        Integer structural = structuralChannel == null || KEEP.equals(structuralChannel) ? null
                : "none".equals(structuralChannel) ? 0 : Integer.valueOf(structuralChannel);
        MotionMode mode = motion == null || KEEP.equals(motion) ? null : MotionMode.of(motion);
        Double x = null;
        Double y = null;
        if (stimulusSpot != null && !stimulusSpot.isBlank()) {
            double[] xy = SessionOverrides.spot(stimulusSpot);
            if (xy == null) {
                throw new InputException(null, "the stimulus spot must be two numbers x,y in pixels, such as "
                        + "120.5,40, not \"" + stimulusSpot + "\"");
            }
            x = xy[0];
            y = xy[1];
        }
        return new SessionOverrides(signal, structural, mode, x, y, SessionOverrides.Origin.DIALOG);
    }
}
