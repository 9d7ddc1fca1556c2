package org.dendrokin.synth;

import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;

import org.dendrokin.io.AtomicFiles;

import com.google.gson.FieldNamingPolicy;
import com.google.gson.Gson;
import com.google.gson.GsonBuilder;
import com.google.gson.TypeAdapter;
import com.google.gson.stream.JsonReader;
import com.google.gson.stream.JsonToken;
import com.google.gson.stream.JsonWriter;

/**
 * Every true value of one synthetic session, as made by {@link SessionGenerator}; also written as truth.json
 * (keys in snake case with their unit, e.g. {@code d_um2_per_s}; a value that does not apply, NaN, as null; an
 * infinite one as the string "Infinity"). Pixel coordinates
 * are in the project's convention (pixel i covers [i, i+1), its centre at i + 0.5) unless named {@code roi...}
 * (ImageJ's stored line coordinates, 0.5 less). "Along the path" means arc length from the first vertex of the
 * drawn path; "axis" means arc length along the true dendrite axis from where the axis starts, outside the image.
 *
 * @param generator  what made it
 * @param seed       master seed
 * @param units      unit of each name suffix
 * @param movie      the movie's layout
 * @param signal     the signal model and its constants
 * @param stimulus   where and when
 * @param path       the drawn path and how it lies against the true axis
 * @param dendrite   shaft geometry and loading
 * @param spines     every spine in or near the field, ordered by axis position
 * @param motion     the rigid shift of every frame
 * @param optics     the point-spread function
 * @param camera     brightness and noise
 * @param bleaching  bleaching of both dyes
 * @param background the background's parts
 * @param intruder   the moving bright spine, or null
 * @param laterStimuli the stimuli after the first, when the signal has several (empty otherwise)
 */
public record Truth(String generator, long seed, Map<String, String> units, Movie movie, Signal signal,
        Stimulus stimulus, DrawnPath path, Dendrite dendrite, List<Spine> spines, Motion motion,
        SessionSpec.Optics optics, SessionSpec.Camera camera, Bleaching bleaching, SessionSpec.Background background,
        Intruder intruder, List<Stimulus> laterStimuli) {

    public Truth {
        units = Map.copyOf(units);
        spines = List.copyOf(spines);
        laterStimuli = List.copyOf(laterStimuli);
    }

    /** The units of the name suffixes used in truth.json. */
    static final Map<String, String> UNITS = Map.of("_um", "um", "_s", "s", "_px", "pixels (pixel i covers [i, i+1))",
            "_um2_per_s", "um^2/s", "_per_s", "1/s", "_um_per_s", "um/s", "_counts", "camera counts (16-bit)",
            "delta_f", "dF/F0 (dimensionless)", "_electrons_per_count", "e-/count");

    /**
     * @param file              movie file name
     * @param widthPx           width, pixels
     * @param heightPx          height, pixels
     * @param frames            time points
     * @param channels          channels
     * @param slices            z-slices
     * @param pixelSizeUm       pixel size, um
     * @param frameIntervalS    frame interval, s
     * @param linePeriodS       time from one row to the next within a frame, s (0 = whole frame at once)
     * @param channelRoles      role of each channel, channel 1 first ("signal" or "structural")
     * @param signalChannel     1-based signal channel
     * @param structuralChannel 1-based structural channel, 0 if none
     * @param focalSlice        0-based slice holding the dendrite in focus, or -1 if it lies between two slices
     */
    public record Movie(String file, int widthPx, int heightPx, int frames, int channels, int slices,
            double pixelSizeUm, double frameIntervalS, double linePeriodS, List<String> channelRoles,
            int signalChannel, int structuralChannel, int focalSlice) {
        public Movie {
            channelRoles = List.copyOf(channelRoles);
        }
    }

    /**
     * @param model            "diffusion-decay", "diffusion", "nagumo-front" or "nagumo-kick"
     * @param dUm2PerS         D, um^2/s
     * @param kPerS            k, 1/s (decay rate of the pulse; rate constant of the bistable reaction)
     * @param a                bistable threshold (NaN for the pulse)
     * @param amplitudeDeltaF  pulse peak at the stimulus time, or the excited state's dF/F0 of a front
     * @param sigma0Um         the pulse's initial sd, um (NaN for fronts)
     * @param frontSpeedUmPerS McKean's front speed sqrt(2 D k)(1/2 - a), um/s (NaN for the pulse)
     * @param frontWidthUm     McKean's front width sqrt(2 D / k), um (NaN for the pulse)
     * @param decayTimeS       1 / k of the pulse, s (infinite without decay; NaN for fronts)
     * @param lengthConstantUm sqrt(D / k) of the pulse, um (NaN for fronts)
     * @param headDecayPerS    decay rate inside spine heads, 1/s
     */
    public record Signal(String model, double dUm2PerS, double kPerS, double a, double amplitudeDeltaF,
            double sigma0Um, double frontSpeedUmPerS, double frontWidthUm, double decayTimeS, double lengthConstantUm,
            double headDecayPerS) {
    }

    /**
     * @param timeS             stimulus time, s
     * @param axisUm            stimulus position along the true axis, um
     * @param pathPositionUm    the stimulus point projected onto the drawn path, um along it
     * @param xPx               stimulus point x, pixels (in the first frame's scene position)
     * @param yPx               stimulus point y, pixels
     * @param offPathUm         distance from the stimulus point to the drawn path, um
     * @param stimulatedSpineId id of the stimulated spine, or -1
     */
    public record Stimulus(double timeS, double axisUm, double pathPositionUm, double xPx, double yPx,
            double offPathUm, int stimulatedSpineId) {
    }

    /**
     * @param style         "polyline" or "freehand"
     * @param file          ROI file name
     * @param xPx           vertex x, pixels (our convention)
     * @param yPx           vertex y, pixels
     * @param roiXPx        vertex x as stored in the ImageJ ROI (xPx - 0.5)
     * @param roiYPx        vertex y as stored
     * @param lengthUm      length of the drawn path, um
     * @param axisStartUm   axis position nearest the path's first vertex, um
     * @param axisEndUm     axis position nearest its last vertex, um
     * @param lengthRatio   lengthUm / (axisEndUm - axisStartUm): distances along the drawn path are this times
     *                      the true distances on average (dimensionless)
     * @param rmsOffsetUm   root mean square distance of the drawn path from the axis, um
     * @param maxOffsetUm   largest distance, um
     * @param widthUm       band width given in session.json, um
     */
    public record DrawnPath(String style, String file, double[] xPx, double[] yPx, double[] roiXPx, double[] roiYPx,
            double lengthUm, double axisStartUm, double axisEndUm, double lengthRatio, double rmsOffsetUm,
            double maxOffsetUm, double widthUm) {
    }

    /**
     * @param meanRadiusUm            mean shaft radius, um
     * @param radiusCv                relative sd of the radius
     * @param loadingSd               sd of the log dye loading
     * @param tiltDeg                 general course against the x axis, degrees
     * @param minCurvatureRadiusUm    tightest bend of the axis inside the image, um
     * @param axisXPx                 the axis, sampled every 2 pixels of arc length, x
     * @param axisYPx                 the axis, y
     * @param axisSampleUm            axis position of those samples, um
     */
    public record Dendrite(double meanRadiusUm, double radiusCv, double loadingSd, double tiltDeg,
            double minCurvatureRadiusUm, double[] axisXPx, double[] axisYPx, double[] axisSampleUm) {
    }

    /**
     * @param id             0-based, in axis order
     * @param axisUm         base position along the axis, um
     * @param pathPositionUm the head's centre projected onto the drawn path, um along it
     * @param side           +1 or -1: side of the axis (+1 = the axis normal's side, normal = tangent turned +90
     *                       degrees in image coordinates, y down)
     * @param headXPx        head centre x, pixels (first frame)
     * @param headYPx        head centre y, pixels
     * @param headRadiusUm   head radius, um
     * @param neckLengthUm   neck length, um
     * @param brightness     head loading relative to the shaft
     * @param tauNeckS       neck exchange time constant, s
     * @param stimulated     this head was stimulated
     * @param peakDeltaF     largest head dF/F0 during the movie
     */
    public record Spine(int id, double axisUm, double pathPositionUm, int side, double headXPx, double headYPx,
            double headRadiusUm, double neckLengthUm, double brightness, double tauNeckS, boolean stimulated,
            double peakDeltaF) {
    }

    /**
     * @param shiftXPx  rigid shift of the scene in each frame, x, pixels (frame 0 first)
     * @param shiftYPx  y, pixels
     * @param maxShiftUm largest shift, um
     * @param rmsShiftUm root mean square shift, um
     * @param settings  what made it
     */
    public record Motion(double[] shiftXPx, double[] shiftYPx, double maxShiftUm, double rmsShiftUm,
            SessionSpec.Motion settings) {
    }

    /**
     * @param signal              the indicator's bleaching
     * @param structuralTauS      the structural dye's bleaching time, s
     */
    public record Bleaching(SessionSpec.Bleaching signal, double structuralTauS) {
    }

    /**
     * @param axisUm         where along the axis it enters, um
     * @param pathPositionUm projected onto the drawn path, um
     * @param xPx            head centre in each frame (with the motion), x, pixels
     * @param yPx            y, pixels
     * @param offPathUm      distance of the head's centre from the drawn path in each frame, um
     * @param settings       what made it
     */
    public record Intruder(double axisUm, double pathPositionUm, double[] xPx, double[] yPx, double[] offPathUm,
            SessionSpec.Intruder settings) {
    }

    /** Writes this truth as JSON. */
    public void write(Path file) {
        String json = GSON.toJson(this);
        AtomicFiles.writeString(file, json + "\n");
    }

    /** Reads a truth.json written by {@link #write}. */
    public static Truth read(Path file) throws IOException {
        return GSON.fromJson(java.nio.file.Files.readString(file), Truth.class);
    }

    private static final Gson GSON;

    static {
        // NaN and infinities are not JSON numbers: NaN (not applicable) is written as null, an infinity (e.g. a
        // bleaching time of a dye that does not bleach) as the string "Infinity" or "-Infinity".
        TypeAdapter<Double> finite = new TypeAdapter<>() {
            @Override
            public void write(JsonWriter out, Double value) throws IOException {
                if (value == null || Double.isNaN(value)) {
                    out.nullValue();
                } else if (Double.isInfinite(value)) {
                    out.value(value > 0 ? "Infinity" : "-Infinity");
                } else {
                    out.value(value.doubleValue());
                }
            }

            @Override
            public Double read(JsonReader in) throws IOException {
                if (in.peek() == JsonToken.NULL) {
                    in.nextNull();
                    return Double.NaN;
                }
                if (in.peek() == JsonToken.STRING) {
                    return Double.parseDouble(in.nextString());
                }
                return in.nextDouble();
            }
        };
        GSON = new GsonBuilder().setFieldNamingPolicy(FieldNamingPolicy.LOWER_CASE_WITH_UNDERSCORES)
                .registerTypeAdapter(Double.class, finite).registerTypeAdapter(double.class, finite)
                .serializeNulls().setPrettyPrinting().create();
    }
}
