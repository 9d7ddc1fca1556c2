package org.dendrokin.io.session;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.analysis.MotionMode;
import org.dendrokin.core.analysis.Normalisation;
import org.dendrokin.core.analysis.StimulusSpec;
import org.dendrokin.io.InputException;

/**
 * Settings given for one run that take precedence over session.json: the command line's {@code analyze
 * --channel, --motion, --stimulus-xy} and the ImageJ dialog's channel, structural channel, motion and stimulus
 * spot. The session folder is not changed; results.json and the report state each override. A null field
 * leaves session.json's setting.
 *
 * @param channel           signal channel counted from 1, or null
 * @param structuralChannel structural channel counted from 1, 0 for none, or null
 * @param motion            what to do about motion, or null
 * @param stimulusXPx       stimulation spot x, ImageJ pixel coordinates, or null (given with {@code stimulusYPx})
 * @param stimulusYPx       stimulation spot y, or null
 * @param origin            how the overrides were given, to name them in messages
 */
public record SessionOverrides(Integer channel, Integer structuralChannel, MotionMode motion, Double stimulusXPx,
                               Double stimulusYPx, Origin origin) {
    /** No override: session.json as written. */
    public static final SessionOverrides NONE = new SessionOverrides(null, null, null, null, null,
            Origin.COMMAND_LINE);

    /** Where the overrides came from; each names its settings as the user gave them. */
    public enum Origin {
        /** Options of {@code analyze}. */
        COMMAND_LINE("the command line", "--channel", "--structural-channel", "--motion", "--stimulus-xy"),
        /** Fields of the ImageJ dialog (or the options of a macro that ran it). */
        DIALOG("the dialog", "the dialog's channel", "the dialog's structural channel", "the dialog's motion",
                "the dialog's stimulus spot");

        private final String phrase;
        private final String channel;
        private final String structural;
        private final String motion;
        private final String spot;

        Origin(String phrase, String channel, String structural, String motion, String spot) {
            this.phrase = phrase;
            this.channel = channel;
            this.structural = structural;
            this.motion = motion;
            this.spot = spot;
        }

        /** E.g. "the command line". */
        public String phrase() {
            return phrase;
        }

        /** How the signal channel override is named, e.g. "--channel". */
        public String channelName() {
            return channel;
        }

        /** How the structural channel override is named. */
        public String structuralName() {
            return structural;
        }
    }

    public SessionOverrides {
        if ((stimulusXPx == null) != (stimulusYPx == null)) {
            throw new IllegalArgumentException("a stimulus spot needs both coordinates");
        }
        if (origin == null) {
            throw new IllegalArgumentException("origin is required");
        }
    }

    /** True when nothing is overridden. */
    public boolean isEmpty() {
        return channel == null && structuralChannel == null && motion == null && stimulusXPx == null;
    }

    /** True when the signal channel is overridden. */
    public boolean setsChannel() {
        return channel != null;
    }

    /**
     * The settings of session.json with these overrides in place, checked together as session.json's own keys
     * are (the signal and structural channels differ; a normalisation by the structural channel keeps one).
     *
     * @param config      session.json as read
     * @param sessionFile session.json, named when session.json and an override disagree
     * @throws InputException naming the override when it cannot apply
     */
    public SessionConfig apply(SessionConfig config, Path sessionFile) {
        if (isEmpty()) {
            return config;
        }
        SessionConfig.Acquisition a = config.acquisition();
        int signal = channel != null ? channel : a.channel();
        int structural = structuralChannel != null ? structuralChannel : a.structuralChannel();
        if (channel != null && channel < 1) {
            throw new InputException(null, origin.channel + " must be a channel number counted from 1, not " + channel);
        }
        if (structural != 0 && structural == signal) {
            String name = structuralChannel != null ? origin.structural : origin.channel;
            throw new InputException(channel != null && structuralChannel != null ? null : sessionFile, String.format(
                    Locale.ROOT, "%s sets channel %d, which is also the structural channel; the two must differ",
                    name, signal));
        }
        Normalisation normalisation = a.normalisation();
        if (normalisation != Normalisation.NONE && structural == 0) {
            throw new InputException(sessionFile, "key \"normalisation\" needs a structural channel, but "
                    + origin.structural + " sets none");
        }
        SessionConfig.Acquisition acquisition = new SessionConfig.Acquisition(signal, structural, normalisation,
                motion != null ? motion : a.motion(), a.zSlice(), a.zProjection(), a.trainGapS(), a.linePeriodS(),
                a.linesPerFrame());
        List<StimulusSpec> stimuli = config.stimuli();
        if (stimulusXPx != null) {
            if (stimuli.size() > 1) {
                throw new InputException(sessionFile, String.format(Locale.ROOT, "key \"stimuli\" lists %d stimuli, "
                        + "so %s cannot tell which one it places; give the spots in session.json", stimuli.size(),
                        origin.spot));
            }
            if (!Double.isFinite(stimulusXPx) || !Double.isFinite(stimulusYPx)) {
                throw new InputException(null, origin.spot + " must be two finite numbers x,y in pixels");
            }
            stimuli = new ArrayList<>(List.of(new StimulusSpec(stimuli.get(0).timeS(), null, stimulusXPx,
                    stimulusYPx)));
        }
        StimulusSpec first = stimuli.get(0);
        return new SessionConfig(config.movie(), config.path(), config.pathRoiName(), config.pathWidthUm(),
                config.pixelSizeUm(), config.frameIntervalS(), first.timeS(), first.positionUm(),
                config.baselineFrames(), config.backgroundValue(), config.backgroundRoi(), config.calibration(),
                config.models(), config.bleachCorrection(), config.fit(), config.warnings(), stimuli, acquisition);
    }

    /** One sentence listing the overrides for the report, e.g. "Set on the command line over session.json: ..." */
    public String sentence() {
        List<String> parts = new ArrayList<>();
        if (channel != null) {
            parts.add("signal channel " + channel);
        }
        if (structuralChannel != null) {
            parts.add(structuralChannel == 0 ? "no structural channel" : "structural channel " + structuralChannel);
        }
        if (motion != null) {
            parts.add("motion " + motion.key());
        }
        if (stimulusXPx != null) {
            parts.add(String.format(Locale.ROOT, "stimulus spot at x %s, y %s pixels", plain(stimulusXPx),
                    plain(stimulusYPx)));
        }
        return "Set in " + origin.phrase + " for this run, over session.json: " + String.join("; ", parts) + ".";
    }

    /** A stimulation spot written as two finite numbers {@code x,y} (pixels), or null if the text is not one. */
    public static double[] spot(String text) {
        String[] parts = text.split(",", -1);
        if (parts.length != 2) {
            return null;
        }
        try {
            double x = Double.parseDouble(parts[0].trim());
            double y = Double.parseDouble(parts[1].trim());
            return Double.isFinite(x) && Double.isFinite(y) ? new double[] {x, y} : null;
        } catch (NumberFormatException e) {
            return null;
        }
    }

    /** A pixel coordinate for people: at most three decimals, without trailing zeros. */
    private static String plain(double v) {
        return java.math.BigDecimal.valueOf(v).setScale(3, java.math.RoundingMode.HALF_EVEN).stripTrailingZeros()
                .toPlainString();
    }
}
