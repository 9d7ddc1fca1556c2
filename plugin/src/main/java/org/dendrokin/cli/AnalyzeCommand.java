package org.dendrokin.cli;

import java.io.File;
import java.util.Locale;
import java.util.concurrent.Callable;

import org.dendrokin.core.analysis.MotionMode;
import org.dendrokin.io.InputException;
import org.dendrokin.io.SessionRunner;
import org.dendrokin.io.session.SessionOverrides;

import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/**
 * {@code analyze SESSION_DIR --out OUT_DIR [--channel N] [--motion MODE] [--stimulus-xy X,Y]}: one session folder
 * to kymograph, pictures, results and report. The three options take precedence over session.json for this run
 * only; results.json and the report state them as overrides.
 */
@Command(name = "analyze", mixinStandardHelpOptions = true,
        description = "Analyse one session folder (a folder holding session.json, a movie and a path).")
final class AnalyzeCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "SESSION_DIR", description = "The session folder; it is never written.")
    File sessionDir;

    @Option(names = "--out", required = true, paramLabel = "OUT_DIR",
            description = "Output folder, created if missing; nothing is written outside it.")
    File outDir;

    // Read as text and checked in call(), so that a bad value gets one sentence naming the option.
    @Option(names = "--channel", paramLabel = "N",
            description = "Signal channel of a hyperstack, counted from 1, for this run (over session.json's "
                    + "\"channel\").")
    String channel;

    @Option(names = "--motion", paramLabel = "MODE",
            description = "correct, measure or off, for this run (over session.json's \"motion\").")
    String motion;

    @Option(names = "--stimulus-xy", paramLabel = "X,Y",
            description = "Stimulation spot in image pixels, for this run (over session.json's stimulus place; "
                    + "its time is kept).")
    String stimulusXy;

    @Spec
    CommandSpec spec;

    @Override
    public Integer call() {
        SessionRunner.Result result = DemoCommand.run(sessionDir.toPath(), outDir.toPath(), overrides(),
                spec.commandLine().getErr());
        spec.commandLine().getOut().println(DemoCommand.summary(result));
        return Main.OK;
    }

    /** The options given, checked. */
    SessionOverrides overrides() {
        Integer n = null;
        if (channel != null) {
            try {
                n = Integer.valueOf(channel.trim());
            } catch (NumberFormatException e) {
                n = 0;
            }
            if (n < 1) {
                throw new InputException(null, "--channel must be a channel number counted from 1, not \"" + channel
                        + "\"");
            }
        }
        MotionMode m = null;
        if (motion != null) {
            m = MotionMode.of(motion.trim().toLowerCase(Locale.ROOT));
            if (m == null) {
                throw new InputException(null, "--motion must be correct, measure or off, not \"" + motion + "\"");
            }
        }
        Double x = null;
        Double y = null;
        if (stimulusXy != null) {
            double[] xy = SessionOverrides.spot(stimulusXy);
            if (xy == null) {
                throw new InputException(null, "--stimulus-xy must be two numbers X,Y in image pixels, such as "
                        + "120.5,40, not \"" + stimulusXy + "\"");
            }
            x = xy[0];
            y = xy[1];
        }
        return new SessionOverrides(n, null, m, x, y, SessionOverrides.Origin.COMMAND_LINE);
    }
}
