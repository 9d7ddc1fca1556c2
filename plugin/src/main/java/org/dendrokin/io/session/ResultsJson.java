package org.dendrokin.io.session;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;

import org.dendrokin.core.analysis.AnalysisResult;
import org.dendrokin.core.analysis.SpineOutcome;
import org.dendrokin.core.spines.Spine;
import org.dendrokin.core.spines.SpineAnalysis;
import org.dendrokin.core.spines.SpineSettings;
import org.dendrokin.core.analysis.CalibrationStage;
import org.dendrokin.core.analysis.Headline;
import org.dendrokin.core.analysis.ResolvedStimulus;
import org.dendrokin.core.analysis.SkippedModel;
import org.dendrokin.core.analysis.Warning;
import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.CalibrationSummary;
import org.dendrokin.core.calib.SampleStatus;
import org.dendrokin.core.calib.SaturationLimits;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.Interval;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.fit.Misfit;
import org.dendrokin.core.fit.VarianceModel;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.motion.MotionTrace;
import org.dendrokin.core.preprocess.Preprocessing;
import org.dendrokin.core.spread.Estimate;
import org.dendrokin.core.spread.SpreadAnalysis;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.ToolVersion;
import org.dendrokin.io.calib.CalibrationSetup;

import com.google.gson.GsonBuilder;
import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonNull;
import com.google.gson.JsonObject;
import com.google.gson.JsonPrimitive;

/**
 * Builds and writes {@code results.json}, the one place that knows its layout. The contract's keys
 * ({@code tool_version}, {@code session}, {@code signal_unit}, {@code kymograph}, {@code fits},
 * {@code best_model}, {@code spread}, {@code warnings}) come first; the sections describing the inputs and the
 * preprocessing follow. Non-finite numbers, and interval ends the data leave open, are written as null (JSON
 * cannot hold them).
 *
 * <p>A fit is {@code {"model", "converged", "aic", "aicc", "bic", "rmse", "points", "parameters": {NAME:
 * {"value", "unit", "ci95": [lo, hi], "ci_method", "standard_error", "identifiable", ...}}, "derived": {...},
 * "warnings": [...], "akaike_weight", "weight_criterion"}}; a fit that did not converge has
 * {@code "converged": false}, a {@code "reason"} and no parameters (its numbers are not estimates).
 *
 * <p>A run with settings given over session.json (the command line's {@code --channel}, {@code --motion},
 * {@code --stimulus-xy}, or the ImageJ dialog) has {@code "overrides": {"given_in", "channel",
 * "structural_channel", "motion", "stimulus_xy_px": [x, y]}} holding only the settings given; the other sections
 * describe the run with them in place. Without overrides the key is absent.
 *
 * <p>It is one file on purpose: it is the one place that knows the layout of results.json, section by section, and
 * the sections share their conventions (null for what JSON cannot hold, fits in one shape); split, the layout would
 * be spread over several classes that must agree.
 */
public final class ResultsJson {
    /** File name of the results. */
    public static final String FILE_NAME = "results.json";

    private ResultsJson() {
    }

    /**
     * The whole document of one analysis.
     *
     * @param in            the session's inputs
     * @param a             the analysis
     * @param kymographFile file name of the kymograph CSV beside it
     */
    public static JsonObject build(SessionInputs in, AnalysisResult a, String kymographFile) {
        return build(in, a, kymographFile, null);
    }

    /**
     * The whole document, with a {@code spines} section when the spines were analysed.
     *
     * @param spines the spine analysis, or null (then the document is exactly that of the three-argument build)
     */
    public static JsonObject build(SessionInputs in, AnalysisResult a, String kymographFile, SpineOutcome spines) {
        Kymograph signal = a.signal();
        JsonObject root = new JsonObject();
        root.addProperty("tool_version", ToolVersion.get());
        root.addProperty("session", in.sessionName());
        root.addProperty("signal_unit", signal.signalUnit());
        JsonObject kymo = new JsonObject();
        kymo.addProperty("file", kymographFile);
        kymo.addProperty("distance_step_um", signal.distanceStepUm());
        kymo.addProperty("time_step_s", signal.timeStepS());
        root.add("kymograph", kymo);
        JsonArray fitArray = new JsonArray();
        if (a.fits() != null) {
            fits(a.fits()).forEach(fitArray::add);
        }
        for (SkippedModel m : a.skipped()) {
            JsonObject o = new JsonObject();
            o.addProperty("model", m.model());
            o.addProperty("tried", false);
            o.addProperty("converged", false);
            o.addProperty("reason", m.reason());
            o.add("parameters", new JsonObject());
            fitArray.add(o);
        }
        root.add("fits", fitArray);
        root.add("best_model", a.bestModel() == null ? JsonNull.INSTANCE : new JsonPrimitive(a.bestModel()));
        root.add("spread", spread(a.spread(), a.headline()));
        root.add("movie", movie(in, a));
        root.add("path", path(in, a));
        root.add("stimulus", stimulus(a.stimulus()));
        JsonArray baseline = new JsonArray();
        baseline.add(a.preprocessing().baselineFirst());
        baseline.add(a.preprocessing().baselineLast());
        root.add("baseline_frames", baseline);
        JsonObject bg = new JsonObject();
        bg.addProperty("value", a.background().value());
        if (a.background().hasUncertainty()) {
            bg.addProperty("uncertainty_sd", a.background().uncertainty());
        }
        bg.addProperty("how", a.background().description());
        root.add("background", bg);
        JsonObject bleach = new JsonObject();
        bleach.addProperty("requested", in.config().bleachCorrection());
        bleach.addProperty("applied", a.preprocessing().bleach().applied());
        bleach.add("time_constant", estimate(a.preprocessing().bleach().timeConstant()));
        if (a.preprocessing().bleach().fastPhase() != null) {
            // two phases: time_constant is the slow one's
            JsonObject fast = new JsonObject();
            fast.addProperty("fraction", a.preprocessing().bleach().fastPhase().fraction());
            fast.add("time_constant", estimate(a.preprocessing().bleach().fastPhase().timeConstant()));
            bleach.add("fast_phase", fast);
        }
        root.add("bleach_correction", bleach);
        root.add("baseline_noise_sd_dF_F0", finiteOrNull(a.preprocessing().deltaF().typicalNoiseSd()));
        root.add("calibration", calibration(in.calibration(), a.calibrated()));
        root.add("channels", channels(in, a));
        root.add("motion", motion(a.motion()));
        JsonArray stimuli = new JsonArray();
        for (AnalysisResult.StimulusOutcome o : a.stimuli()) {
            stimuli.add(stimulusOutcome(o));
        }
        root.add("stimuli", stimuli);
        if (spines != null) {
            root.add("spines", spines(spines));
        }
        if (!in.overrides().isEmpty()) {
            root.add("overrides", overrides(in.overrides()));
        }
        JsonArray w = new JsonArray();
        Stream.concat(in.warnings().stream(), a.warnings().stream()).map(Warning::text).forEach(w::add);
        root.add("warnings", w);
        return root;
    }

    /** Writes the document, pretty-printed, through a temporary file. */
    public static void write(JsonObject results, Path target) {
        String text = new GsonBuilder().setPrettyPrinting().serializeNulls().disableHtmlEscaping().create()
                .toJson(results);
        AtomicFiles.writeString(target, text + "\n");
    }

    // ---- sections ------------------------------------------------------------------------------------------

    /** The spines: how they were found, and one object a spine with its neck time constant and interval. */
    private static JsonObject spines(SpineOutcome s) {
        SpineAnalysis.Result r = s.result();
        JsonObject o = new JsonObject();
        SpineSettings set = s.request().settings();
        JsonObject settings = new JsonObject();
        settings.addProperty("detect", set.detect());
        settings.addProperty("min_distance_um", set.minDistanceUm());
        settings.addProperty("max_distance_um", set.maxDistanceUm());
        settings.addProperty("head_radius_um", set.headRadiusUm());
        settings.addProperty("threshold_sd", set.thresholdSd());
        settings.addProperty("head_decay_per_s", set.headDecayPerS());
        settings.addProperty("rois", s.request().source());
        settings.addProperty("fitted_shaft", s.request().fittedShaft());
        o.add("settings", settings);
        o.addProperty("shaft_signal", r.shaftDriver().isEmpty() ? "measured kymograph"
                : "fitted " + r.shaftDriver() + " model");
        o.addProperty("file", SpineOutputs.SPINES_CSV);
        o.addProperty("traces_file", SpineOutputs.TRACES_CSV);
        JsonArray list = new JsonArray();
        for (Spine sp : r.spines()) {
            JsonObject j = new JsonObject();
            j.addProperty("id", sp.id());
            j.addProperty("label", sp.site().label());
            j.addProperty("source", sp.site().source().word());
            j.add("x_px", finiteOrNull(sp.site().xPx()));
            j.add("y_px", finiteOrNull(sp.site().yPx()));
            j.add("radius_px", finiteOrNull(sp.radiusUm() / r.pixelSizeUm()));
            j.add("position_um", finiteOrNull(sp.positionUm()));
            j.addProperty("side", sp.side().word());
            j.add("off_path_um", finiteOrNull(sp.offPathUm()));
            j.add("base_position_um", finiteOrNull(sp.basePositionUm()));
            j.add("distance_from_stimulus_um", finiteOrNull(sp.distanceFromStimulusUm()));
            j.addProperty("stimulated", sp.stimulated());
            j.add("peak_dF_F0", finiteOrNull(sp.peakDeltaF()));
            j.add("time_to_peak_s", finiteOrNull(sp.timeToPeakS()));
            j.add("decay_time_s", finiteOrNull(sp.decayTimeS()));
            JsonElement tau = JsonNull.INSTANCE;
            if (sp.tauNeck().isPresent()) {
                JsonObject t = modelEstimate(sp.tauNeck().get(), sp.exchange().model());
                t.addProperty("determined", sp.tauNeck().get().identifiable());
                tau = t;
            }
            j.add("tau_neck", tau);
            j.addProperty("not_fitted", SpineOutputs.notFitted(sp));
            list.add(j);
        }
        o.add("spines", list);
        JsonArray w = new JsonArray();
        s.warnings().forEach(w::add);
        o.add("warnings", w);
        return o;
    }

    /** The settings given for this run over session.json, only those given. */
    private static JsonObject overrides(SessionOverrides o) {
        JsonObject j = new JsonObject();
        j.addProperty("given_in", o.origin().phrase());
        if (o.channel() != null) {
            j.addProperty("channel", o.channel());
        }
        if (o.structuralChannel() != null) {
            j.addProperty("structural_channel", o.structuralChannel());
        }
        if (o.motion() != null) {
            j.addProperty("motion", o.motion().key());
        }
        if (o.stimulusXPx() != null) {
            JsonArray xy = new JsonArray();
            xy.add(o.stimulusXPx());
            xy.add(o.stimulusYPx());
            j.add("stimulus_xy_px", xy);
        }
        return j;
    }

    private static JsonObject spread(SpreadAnalysis.Result spread, Headline headline) {
        JsonObject o = new JsonObject();
        JsonElement modelFree = estimate(spread == null ? null : spread.frontSpeed());
        if (headline.frontSpeedFromModel()) {
            o.add("front_speed", modelEstimate(headline.modelFrontSpeed(), headline.bestModel()));
        } else {
            o.add("front_speed", modelFree);
        }
        o.add("length_constant", headline.lengthConstant() == null ? JsonNull.INSTANCE
                : modelEstimate(headline.lengthConstant(), headline.bestModel()));
        o.add("peak_decay_length", estimate(spread == null ? null : spread.peakDecayLength()));
        o.add("decay_time", estimate(spread == null ? null : spread.decayTime()));
        JsonElement d = estimate(spread == null ? null : spread.apparentD());
        if (d.isJsonObject() && spread.varianceWindowS() != null) {
            JsonArray window = new JsonArray();
            window.add(spread.varianceWindowS()[0]);
            window.add(spread.varianceWindowS()[1]);
            d.getAsJsonObject().add("time_window_s", window);
        }
        o.add("apparent_D", d);
        o.addProperty("positions_with_arrival", spread == null ? 0 : spread.arrivalTimeS().length);
        if (headline.frontSpeedFromModel()) {
            o.add("front_speed_model_free", modelFree);
        }
        o.add("front", front(spread));
        return o;
    }

    /** Whether the arrival times show a front, why not, and the speed on each side. */
    private static JsonElement front(SpreadAnalysis.Result spread) {
        if (spread == null) {
            return JsonNull.INSTANCE;
        }
        SpreadAnalysis.Front f = spread.front();
        JsonObject o = new JsonObject();
        o.addProperty("present", f.present());
        o.addProperty("verdict", f.verdict().name().toLowerCase(java.util.Locale.ROOT).replace('_', '-'));
        o.add("reason", f.present() ? JsonNull.INSTANCE : new JsonPrimitive(f.reason()));
        o.add("near_half_speed_um_per_s", number(f.nearSpeedUmPerS()));
        o.add("far_half_speed_um_per_s", number(f.farSpeedUmPerS()));
        o.add("left_speed", estimate(f.left()));
        o.add("right_speed", estimate(f.right()));
        return o;
    }

    /** A fitted quantity shown among the spread measures, naming the model it comes from. */
    private static JsonObject modelEstimate(ParameterEstimate e, String model) {
        JsonObject o = new JsonObject();
        o.add("value", number(e.value()));
        o.addProperty("unit", e.unit().symbol());
        JsonArray ci = new JsonArray();
        ci.add(number(e.ci95() == null ? Double.NaN : e.ci95().lower()));
        ci.add(number(e.ci95() == null ? Double.NaN : e.ci95().upper()));
        o.add("ci95", ci);
        o.addProperty("ci_method", e.ci95() == null ? "" : e.ci95().method());
        o.addProperty("source", "model:" + model);
        return o;
    }

    private static JsonObject movie(SessionInputs in, AnalysisResult a) {
        AnalysisResult.Movie m = a.movie();
        JsonObject movie = new JsonObject();
        movie.addProperty("file", in.relative(in.movieFile()));
        movie.addProperty("width_px", m.widthPx());
        movie.addProperty("height_px", m.heightPx());
        movie.addProperty("frames", m.frameCount());
        movie.addProperty("bit_depth", in.bitDepth());
        movie.addProperty("pixel_size_um", m.pixelSizeUm());
        movie.addProperty("frame_interval_s", m.frameIntervalS());
        if (m.linePeriodS() > 0) {
            movie.addProperty("line_period_s", m.linePeriodS());
        }
        return movie;
    }

    private static JsonObject path(SessionInputs in, AnalysisResult a) {
        JsonObject path = new JsonObject();
        path.addProperty("file", in.relative(in.pathFile()));
        path.addProperty("length_um", a.movie().pathLengthUm());
        path.addProperty("band_width_um", a.movie().pathWidthUm());
        path.addProperty("positions", a.extraction().kymograph().positionCount());
        path.addProperty("fraction_outside_image", a.extraction().fractionOutside());
        return path;
    }

    private static JsonObject stimulus(Preprocessing.Stimulus s) {
        JsonObject stim = new JsonObject();
        stim.add("time_s", finiteOrNull(s.timeS()));
        stim.add("position_um", finiteOrNull(s.positionUm()));
        stim.addProperty("source", s.source());
        if (s.detection() != null) {
            stim.addProperty("detection_strength_noise_sd", s.detection().strength());
            stim.addProperty("detection", s.detection().describe());
        }
        return stim;
    }

    /** Which channel and focal planes were analysed, and any normalisation by a structural channel. */
    private static JsonObject channels(SessionInputs in, AnalysisResult a) {
        SessionConfig.Acquisition acq = in.config().acquisition();
        JsonObject o = new JsonObject();
        o.addProperty("in_movie", in.channelCount());
        int signal = acq.channel() > 0 ? acq.channel()
                : in.calibration().channels() != null ? in.calibration().channels().numerator() : 1;
        o.addProperty("signal", signal);
        o.add("structural", acq.structuralChannel() > 0 ? new JsonPrimitive(acq.structuralChannel()) : JsonNull.INSTANCE);
        o.addProperty("normalisation", a.normalisation().key());
        return o;
    }

    /** What was done about motion, and the measured shifts in summary (frame by frame in motion.csv). */
    private static JsonObject motion(AnalysisResult.Motion m) {
        JsonObject o = new JsonObject();
        o.addProperty("mode", m.mode().key());
        MotionTrace t = m.trace();
        o.addProperty("measured", t != null);
        o.addProperty("corrected", m.corrected());
        if (t != null) {
            o.addProperty("reference", t.reference().describe());
            o.add("max_shift_um", number(t.maxShiftUm()));
            o.add("rms_shift_um", number(t.rmsShiftUm()));
            o.add("warning_threshold_um", number(t.warningThresholdUm()));
            o.addProperty("exceeds_threshold", t.exceedsThreshold());
            o.add("median_peak_height", number(t.medianPeakHeight()));
            o.addProperty("frames_at_search_limit", t.framesAtLimit());
            o.addProperty("file", SessionOutputs.MOTION_CSV);
        }
        return o;
    }

    /** One stimulus with the spread measured over its own window. */
    private static JsonObject stimulusOutcome(AnalysisResult.StimulusOutcome o) {
        ResolvedStimulus s = o.stimulus();
        JsonObject j = new JsonObject();
        j.add("time_s", number(s.timeS()));
        j.add("position_um", number(s.positionUm()));
        j.add("off_path_um", number(s.offPathUm()));
        j.addProperty("pulses", s.pulses());
        j.add("last_pulse_s", number(s.lastPulseS()));
        JsonArray frames = new JsonArray();
        frames.add(o.firstFrame());
        frames.add(o.endFrame() - 1);
        j.add("frames", frames);
        SpreadAnalysis.Result r = o.spread();
        JsonObject sp = new JsonObject();
        sp.add("front_speed", estimate(r == null ? null : r.frontSpeed()));
        sp.add("peak_decay_length", estimate(r == null ? null : r.peakDecayLength()));
        sp.add("decay_time", estimate(r == null ? null : r.decayTime()));
        sp.add("apparent_D", estimate(r == null ? null : r.apparentD()));
        sp.add("front", front(r));
        j.add("spread", sp);
        return j;
    }

    /**
     * The {@code calibration} object: method, description, constants, source file, the limits with their reason,
     * counts and fractions of flagged and NaN samples, and whether an uncertainty was propagated (the per-sample
     * SD then goes to {@code concentration_sd.csv}).
     */
    public static JsonObject calibration(CalibrationSetup setup, CalibrationStage.Calibrated applied) {
        Calibration cal = setup.calibration();
        JsonObject o = new JsonObject();
        o.addProperty("method", cal.method());
        o.addProperty("description", cal.description());
        o.addProperty("signal_in", cal.input().phrase());
        o.addProperty("unit", cal.outputUnit().symbol());
        JsonObject constants = new JsonObject();
        for (Map.Entry<String, Double> e : cal.constants().entrySet()) {
            constants.add(e.getKey(), number(e.getValue()));
        }
        o.add("constants", constants);
        o.add("source_file", setup.sourceFile() == null ? JsonNull.INSTANCE : new JsonPrimitive(setup.sourceFile()));
        if (setup.channels() != null) {
            JsonObject ch = new JsonObject();
            ch.addProperty("numerator_channel", setup.channels().numerator());
            ch.addProperty("denominator_channel", setup.channels().denominator());
            o.add("channels", ch);
        }
        if (setup.lifetime() != null) {
            CalibrationSetup.LifetimeInput in = setup.lifetime();
            JsonObject lt = new JsonObject();
            lt.add("movie", in.movie() == null ? JsonNull.INSTANCE : new JsonPrimitive(in.movie()));
            lt.addProperty("lifetime_channel", in.lifetimeChannel());
            lt.add("photons", in.photons() == null ? JsonNull.INSTANCE : new JsonPrimitive(in.photons()));
            lt.add("photon_channel", in.weighted() ? new JsonPrimitive(in.photonChannelOrFirst()) : JsonNull.INSTANCE);
            lt.addProperty("photon_weighted", in.weighted());
            o.add("lifetime", lt);
        }
        if (applied.summary() != null) {
            CalibrationSummary s = applied.summary();
            SaturationLimits l = s.limits();
            JsonObject t = new JsonObject();
            t.addProperty("flag_saturation_above", l.flagAbove());
            t.addProperty("reject_saturation_above", l.rejectAbove());
            t.addProperty("why", "fractional saturation f of the indicator's range; the error amplification "
                    + "d ln c / d ln F is at least 1 / (n (1 - f)): 5 at f = 0.8 and 20 at f = 0.95 for n = 1");
            o.add("thresholds", t);
            JsonObject counts = new JsonObject();
            counts.addProperty("samples_with_signal", s.finiteInputs());
            counts.addProperty("flagged", s.count(SampleStatus.FLAGGED));
            counts.addProperty("nan_near_saturation", s.count(SampleStatus.REJECTED));
            counts.addProperty("nan_at_or_above_saturation", s.count(SampleStatus.ABOVE_RANGE));
            counts.addProperty("nan_at_or_below_zero", s.count(SampleStatus.BELOW_RANGE));
            o.add("counts", counts);
            o.addProperty("fraction_flagged", s.fractionFlagged());
            o.addProperty("fraction_nan", s.fractionNan());
            o.addProperty("uncertainty_propagated", applied.propagated());
        } else if (applied.sdMicromolar() != null) {
            o.addProperty("uncertainty_propagated", applied.propagated());
        }
        JsonArray w = new JsonArray();
        applied.warnings().forEach(w::add);
        o.add("warnings", w);
        return o;
    }

    // ---- fits ----------------------------------------------------------------------------------------------

    /**
     * One object per fit, in the outcome's order, each with its Akaike weight (null for a fit that did not
     * converge: it takes no part in the comparison).
     */
    public static List<JsonObject> fits(KymographFits.Outcome outcome) {
        Map<String, Double> weights = outcome.weights();
        return outcome.fits().stream().map(f -> {
            JsonObject o = fit(f);
            o.add("akaike_weight", number(f.converged() ? weights.getOrDefault(f.model(), Double.NaN) : Double.NaN));
            o.addProperty("weight_criterion", outcome.criterion());
            if (outcome.noiseModel() != null) {
                o.add("noise_model", noiseModel(outcome.noiseModel()));
            }
            outcome.misfit(f.model()).ifPresent(m -> o.add("misfit", misfit(m, f.model())));
            return o;
        }).toList();
    }

    /** One fit. */
    public static JsonObject fit(FitResult f) {
        JsonObject o = new JsonObject();
        o.addProperty("model", f.model());
        o.addProperty("tried", true);
        o.addProperty("converged", f.converged());
        if (!f.converged()) {
            o.addProperty("reason", f.reason());
        }
        o.add("aic", number(f.converged() ? f.aic() : Double.NaN));
        o.add("aicc", number(f.converged() ? f.aicc() : Double.NaN));
        o.add("bic", number(f.converged() ? f.bic() : Double.NaN));
        o.add("rmse", number(f.converged() ? f.rmse() : Double.NaN));
        o.addProperty("points", f.pointsUsed());
        if (f.converged()) {
            o.add("parameters", estimates(f.parameters()));
            o.add("derived", estimates(f.derived()));
        } else {
            o.add("parameters", new JsonObject());
        }
        JsonArray w = new JsonArray();
        f.warnings().forEach(w::add);
        o.add("warnings", w);
        return o;
    }

    /** The weights' noise model: the signal-dependent gain g with its standard error, and a sentence. */
    private static JsonObject noiseModel(VarianceModel m) {
        JsonObject o = new JsonObject();
        o.addProperty("signal_dependent", m.signalDependent());
        o.add("signal_gain", number(m.gain()));
        o.add("signal_gain_se", number(m.gainStandardError()));
        o.addProperty("description", m.describe());
        return o;
    }

    /** The lack-of-fit figure with its threshold and verdict. */
    private static JsonObject misfit(Misfit.Result m, String model) {
        JsonObject o = new JsonObject();
        o.addProperty("statistic", "lag-1 correlation of the standardised residuals between frames, from the "
                + "stimulus on");
        o.add("value", number(m.temporalCorrelation()));
        o.addProperty("threshold", m.threshold());
        o.addProperty("structure_threshold", Misfit.STRUCTURE);
        o.addProperty("verdict", m.verdict().label());
        o.addProperty("pattern", m.pattern().label());
        o.addProperty("sentence", m.sentence(model));
        o.add("spatial_correlation", number(m.spatialCorrelation()));
        o.add("chi_square_per_point", number(m.chiSquarePerPoint()));
        o.add("stripe_share", number(m.stripeShare()));
        o.add("stimulus_share", number(m.blobShare()));
        o.add("front_share", number(m.frontShare()));
        return o;
    }

    private static JsonObject estimates(List<ParameterEstimate> list) {
        JsonObject o = new JsonObject();
        for (ParameterEstimate e : list) {
            JsonObject p = new JsonObject();
            p.add("value", number(e.value()));
            p.addProperty("unit", e.unit().symbol());
            p.add("ci95", interval(e.ci95()));
            p.add("ci_method", e.ci95() == null ? JsonNull.INSTANCE : new JsonPrimitive(e.ci95().method()));
            if (e.ci95() != null && !e.ci95().note().isEmpty()) {
                p.addProperty("ci_note", e.ci95().note());
            }
            p.add("standard_error", number(e.standardError()));
            p.addProperty("identifiable", e.identifiable());
            if (e.atBound()) {
                p.addProperty("at_bound", true);
            }
            if (!e.otherIntervals().isEmpty()) {
                JsonArray others = new JsonArray();
                for (Interval i : e.otherIntervals()) {
                    JsonObject io = new JsonObject();
                    io.add("ci95", interval(i));
                    io.addProperty("ci_method", i.method());
                    if (!i.note().isEmpty()) {
                        io.addProperty("ci_note", i.note());
                    }
                    others.add(io);
                }
                p.add("other_intervals", others);
            }
            o.add(e.name(), p);
        }
        return o;
    }

    private static JsonElement interval(Interval i) {
        if (i == null) {
            return JsonNull.INSTANCE;
        }
        JsonArray a = new JsonArray();
        a.add(number(i.lower()));
        a.add(number(i.upper()));
        return a;
    }

    // ---- numbers -------------------------------------------------------------------------------------------

    /** {@code {"value": v, "unit": u, "ci95": [lo, hi], "interval_method": m}}, or JSON null for a null estimate. */
    public static JsonElement estimate(Estimate e) {
        if (e == null) {
            return JsonNull.INSTANCE;
        }
        JsonObject o = new JsonObject();
        o.addProperty("value", e.value());
        o.addProperty("unit", e.unit());
        JsonArray ci = new JsonArray();
        ci.add(finiteOrNull(e.lo95()));
        ci.add(finiteOrNull(e.hi95()));
        o.add("ci95", ci);
        o.addProperty("interval_method", e.method());
        return o;
    }

    /** A finite number, or JSON null for NaN and infinities (which JSON cannot hold). */
    public static JsonElement finiteOrNull(double v) {
        return Double.isFinite(v) ? new JsonPrimitive(v) : JsonNull.INSTANCE;
    }

    private static JsonElement number(double v) {
        return finiteOrNull(v);
    }
}
