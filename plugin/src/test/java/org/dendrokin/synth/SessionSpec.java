package org.dendrokin.synth;

import java.util.List;
import java.util.SplittableRandom;
import java.util.random.RandomGenerator;

import org.dendrokin.core.Checks;

/**
 * Every setting of one synthetic imaging session, each effect switchable on its own. Lengths in um, times in s,
 * intensities in camera counts. {@link #clean} and {@link #realistic} are the two presets; the {@code with...}
 * methods return a copy with one part replaced, e.g.
 * <pre>
 *   SessionSpec spec = SessionSpec.realistic(7).withMotion(Motion.linear(0.8, 0.02))
 *           .withChannels(Channels.twoStructuralFirst());
 * </pre>
 * A spec does no random drawing itself except in the presets; {@link SessionGenerator} draws the random parts of
 * the scene (curve, spines, loading, background, jitter, noise) from {@link #seed}, each from its own stream, so
 * switching one effect off leaves the others as they were.
 *
 * @param seed       master seed of every random part
 * @param imaging    frame size, frame interval, slices, raster line period
 * @param dendrite   the curve and the thickness of the dendrite
 * @param spines     spines beside the shaft and their neck exchange
 * @param optics     point-spread function
 * @param loading    uneven dye loading along the dendrite
 * @param camera     brightness and Poisson-Gaussian noise
 * @param background uneven background
 * @param bleaching  photobleaching of the indicator
 * @param motion     rigid drift, jump and jitter of the specimen
 * @param channels   which channels the movie has, in which order
 * @param signal     what the indicator reports along the dendrite
 * @param path       the line a user draws along the dendrite
 * @param intruder   a bright spine that moves into the path's band, or {@link Intruder#NONE}
 * @param session    what session.json says
 */
public record SessionSpec(long seed, Imaging imaging, Dendrite dendrite, Spines spines, Optics optics,
        Loading loading, Camera camera, Background background, Bleaching bleaching, Motion motion, Channels channels,
        Signal signal, DrawnPath path, Intruder intruder, SessionFile session) {

    public SessionSpec {
        Checks.require(imaging != null && dendrite != null && spines != null && optics != null && loading != null
                && camera != null && background != null && bleaching != null && motion != null && channels != null
                && signal != null && path != null && intruder != null && session != null,
                "every part of a session spec must be given");
    }

    // ---------------------------------------------------------------------------------------------------------
    // Presets

    /**
     * The assumptions of the diffusion-decay fit and nothing else: a straight dendrite of even thickness and
     * loading along the image's x axis, the path drawn exactly on its axis, no blur, no spines, no background
     * structure, no bleaching, no motion, white Gaussian read noise only. D, k and the pulse are drawn from the
     * seed as in {@link #realistic}.
     */
    public static SessionSpec clean(long seed) {
        RandomGenerator r = new SplittableRandom(seed);
        return new SessionSpec(seed, Imaging.standard(), Dendrite.straight(0.6), Spines.NONE, Optics.NONE,
                Loading.EVEN, Camera.readNoiseOnly(600, 100, 12), Background.NONE, Bleaching.NONE, Motion.NONE,
                Channels.SIGNAL_ONLY, GaussianPulse.drawn(r), DrawnPath.onAxis(), Intruder.NONE,
                SessionFile.standard());
    }

    /**
     * What real movies have, each effect at a plausible size: a dendrite curving through the field with a
     * thickness that varies, spines (about one per 1.2 um) whose heads carry their own signal through their necks,
     * a Gaussian point-spread function (sd 0.17 um), dye loading varying by about 25% along the dendrite, dimmer
     * and brighter spines, Poisson-Gaussian camera noise, a background with a gradient, blobs and
     * autofluorescence, single-exponential bleaching (time constant 120-300 s), and a polyline path of six
     * vertices drawn slightly off the axis. No motion and one channel (add them with {@link #withMotion} and
     * {@link #withChannels}; {@link Bleaching#twoPhase} for bleaching with a fast phase). D, k, the pulse, the
     * brightness and the bleaching are drawn from the seed.
     */
    public static SessionSpec realistic(long seed) {
        RandomGenerator r = new SplittableRandom(seed);
        Signal signal = GaussianPulse.drawn(r);
        double rest = 400 + 600 * r.nextDouble();
        Bleaching bleaching = Bleaching.single(120 + 180 * r.nextDouble());
        return new SessionSpec(seed, Imaging.standard(), Dendrite.curved(), Spines.typical(), Optics.sigma(0.17),
                Loading.typical(), Camera.poissonGaussian(rest), Background.typical(), bleaching,
                Motion.NONE, Channels.SIGNAL_ONLY, signal, DrawnPath.polyline(6), Intruder.NONE,
                SessionFile.standard());
    }

    // ---------------------------------------------------------------------------------------------------------
    // Copies with one part replaced

    public SessionSpec withSeed(long s) {
        return new SessionSpec(s, imaging, dendrite, spines, optics, loading, camera, background, bleaching, motion,
                channels, signal, path, intruder, session);
    }

    public SessionSpec withImaging(Imaging v) {
        return new SessionSpec(seed, v, dendrite, spines, optics, loading, camera, background, bleaching, motion,
                channels, signal, path, intruder, session);
    }

    public SessionSpec withDendrite(Dendrite v) {
        return new SessionSpec(seed, imaging, v, spines, optics, loading, camera, background, bleaching, motion,
                channels, signal, path, intruder, session);
    }

    public SessionSpec withSpines(Spines v) {
        return new SessionSpec(seed, imaging, dendrite, v, optics, loading, camera, background, bleaching, motion,
                channels, signal, path, intruder, session);
    }

    public SessionSpec withOptics(Optics v) {
        return new SessionSpec(seed, imaging, dendrite, spines, v, loading, camera, background, bleaching, motion,
                channels, signal, path, intruder, session);
    }

    public SessionSpec withLoading(Loading v) {
        return new SessionSpec(seed, imaging, dendrite, spines, optics, v, camera, background, bleaching, motion,
                channels, signal, path, intruder, session);
    }

    public SessionSpec withCamera(Camera v) {
        return new SessionSpec(seed, imaging, dendrite, spines, optics, loading, v, background, bleaching, motion,
                channels, signal, path, intruder, session);
    }

    public SessionSpec withBackground(Background v) {
        return new SessionSpec(seed, imaging, dendrite, spines, optics, loading, camera, v, bleaching, motion,
                channels, signal, path, intruder, session);
    }

    public SessionSpec withBleaching(Bleaching v) {
        return new SessionSpec(seed, imaging, dendrite, spines, optics, loading, camera, background, v, motion,
                channels, signal, path, intruder, session);
    }

    public SessionSpec withMotion(Motion v) {
        return new SessionSpec(seed, imaging, dendrite, spines, optics, loading, camera, background, bleaching, v,
                channels, signal, path, intruder, session);
    }

    public SessionSpec withChannels(Channels v) {
        return new SessionSpec(seed, imaging, dendrite, spines, optics, loading, camera, background, bleaching, motion,
                v, signal, path, intruder, session);
    }

    public SessionSpec withSignal(Signal v) {
        return new SessionSpec(seed, imaging, dendrite, spines, optics, loading, camera, background, bleaching, motion,
                channels, v, path, intruder, session);
    }

    public SessionSpec withPath(DrawnPath v) {
        return new SessionSpec(seed, imaging, dendrite, spines, optics, loading, camera, background, bleaching, motion,
                channels, signal, v, intruder, session);
    }

    public SessionSpec withIntruder(Intruder v) {
        return new SessionSpec(seed, imaging, dendrite, spines, optics, loading, camera, background, bleaching, motion,
                channels, signal, path, v, session);
    }

    public SessionSpec withSession(SessionFile v) {
        return new SessionSpec(seed, imaging, dendrite, spines, optics, loading, camera, background, bleaching, motion,
                channels, signal, path, intruder, v);
    }

    // ---------------------------------------------------------------------------------------------------------
    // The parts

    /**
     * Frame size and timing.
     *
     * @param widthPx        image width, pixels
     * @param heightPx       image height, pixels
     * @param frames         time points
     * @param pixelSizeUm    pixel size, um
     * @param frameIntervalS time between frames, s; frame i starts at i * frameIntervalS
     * @param zSlices        focal planes per time point (1 = a plain time series)
     * @param zStepUm        distance between focal planes, um; the dendrite lies in the middle plane
     * @param linePeriodS    raster scan: image row j of frame i is acquired at i * frameIntervalS + j * linePeriodS
     *                       (0 = the whole frame at once)
     * @param oversampling   sub-samples per pixel side when rendering (the scene is integrated over each pixel's
     *                       area on this grid before binning)
     */
    public record Imaging(int widthPx, int heightPx, int frames, double pixelSizeUm, double frameIntervalS,
            int zSlices, double zStepUm, double linePeriodS, int oversampling) {
        public Imaging {
            Checks.require(widthPx >= 16 && heightPx >= 16, "the image must be at least 16 x 16 pixels");
            Checks.require(frames >= 2, "at least 2 frames");
            Checks.positiveFinite(pixelSizeUm, "pixelSizeUm");
            Checks.positiveFinite(frameIntervalS, "frameIntervalS");
            Checks.require(zSlices >= 1, "at least one slice");
            Checks.require(zSlices == 1 || zStepUm > 0, "several slices need a positive zStepUm");
            Checks.require(linePeriodS >= 0 && linePeriodS * heightPx <= frameIntervalS,
                    "a frame's rows must be acquired within one frame interval");
            Checks.require(oversampling >= 1 && oversampling <= 8, "oversampling 1 to 8");
        }

        /** 160 x 64 pixels of 0.2 um, 150 frames at 0.5 s, one plane, whole-frame exposure, 2 x 2 sub-samples. */
        public static Imaging standard() {
            return new Imaging(160, 64, 150, 0.2, 0.5, 1, 0, 0, 2);
        }

        public Imaging withFrames(int n) {
            return new Imaging(widthPx, heightPx, n, pixelSizeUm, frameIntervalS, zSlices, zStepUm, linePeriodS,
                    oversampling);
        }

        public Imaging withSlices(int n, double stepUm) {
            return new Imaging(widthPx, heightPx, frames, pixelSizeUm, frameIntervalS, n, stepUm, linePeriodS,
                    oversampling);
        }

        public Imaging withLinePeriod(double s) {
            return new Imaging(widthPx, heightPx, frames, pixelSizeUm, frameIntervalS, zSlices, zStepUm, s,
                    oversampling);
        }

        public Imaging withSize(int w, int h) {
            return new Imaging(w, h, frames, pixelSizeUm, frameIntervalS, zSlices, zStepUm, linePeriodS,
                    oversampling);
        }

        public Imaging withOversampling(int n) {
            return new Imaging(widthPx, heightPx, frames, pixelSizeUm, frameIntervalS, zSlices, zStepUm, linePeriodS,
                    n);
        }

        public double durationS() {
            return frames * frameIntervalS;
        }
    }

    /**
     * The dendrite's course and thickness. The axis is a natural cubic spline through {@code controlPoints} points
     * spaced evenly along a line through the field's centre at {@code tiltDeg} to the x axis, each moved
     * sideways by a random amount up to {@code bendUm}; it runs past both edges of the image, so the dendrite
     * continues beyond the field as real dendrites do. The radius varies along the axis as
     * r(s) = radiusUm (1 + radiusCv f(s)), f a smooth random field of unit sd and correlation length
     * {@code correlationUm}, kept above 0.4 radiusUm. The projected brightness across the shaft is that of a
     * cylinder: proportional to the chord 2 sqrt(r^2 - d^2) at distance d from the axis.
     *
     * @param controlPoints spline control points, at least 3
     * @param bendUm        largest sideways displacement of a control point, um (0 = straight)
     * @param tiltDeg       angle of the dendrite's general course to the x axis, degrees; NaN = drawn from the
     *                      seed within +-12 degrees
     * @param radiusUm      mean radius, um
     * @param radiusCv      relative sd of the radius along the dendrite (dimensionless)
     * @param correlationUm correlation length of the radius variation, um
     */
    public record Dendrite(int controlPoints, double bendUm, double tiltDeg, double radiusUm, double radiusCv,
            double correlationUm) {
        public Dendrite {
            Checks.require(controlPoints >= 3, "at least 3 control points");
            Checks.require(bendUm >= 0, "bendUm >= 0");
            Checks.positiveFinite(radiusUm, "radiusUm");
            Checks.require(radiusCv >= 0 && radiusCv < 0.5, "radiusCv in [0, 0.5)");
            Checks.positiveFinite(correlationUm, "correlationUm");
        }

        /** A straight dendrite of even radius along the x axis through the field's centre. */
        public static Dendrite straight(double radiusUm) {
            return new Dendrite(3, 0, 0, radiusUm, 0, 5);
        }

        /** A curved dendrite: 5 control points moved up to 2.5 um sideways, radius 0.6 um varying by 15%. */
        public static Dendrite curved() {
            return new Dendrite(5, 2.5, Double.NaN, 0.6, 0.15, 4);
        }
    }

    /**
     * Spines beside the shaft. Bases are placed along the axis as a Poisson process of density {@code perUm}
     * (at least {@code minGapUm} apart on the same side), each on a random side, its neck leaving at up to 25
     * degrees from the normal. Head radius, neck length, brightness and neck exchange time are drawn uniformly
     * (the time constant log-uniformly) from their ranges. A head's signal c_h follows the two-compartment
     * exchange dc_h/dt = (c_d(s_base, t) - c_h) / tauNeck - kHead c_h with the shaft's signal c_d at the base
     * (Svoboda, Tank & Denk 1996 measured such neck exchange; a head is a well-mixed compartment coupled to the
     * shaft through its neck), where kHead is the signal's own decay rate. The stimulated spine's head starts at
     * {@code stimulatedHeadDeltaF} at the stimulus time; its outflow is not added to the shaft, whose signal is
     * given by the signal model alone.
     *
     * @param perUm               spine density along the dendrite, 1/um (0 = no spines)
     * @param minGapUm            least distance between the bases of spines on the same side, um
     * @param headRadiusUm        {min, max} head radius, um
     * @param neckLengthUm        {min, max} neck length from the shaft's surface to the head's surface, um
     * @param neckRadiusUm        neck radius, um
     * @param brightness          {min, max} head indicator loading relative to the shaft's (dimensionless)
     * @param tauNeckS            {min, max} neck exchange time constant, s
     * @param carrySignal         heads exchange signal with the shaft; false = heads stay at rest
     * @param stimulatedSpine     put a spine at the stimulus, its head the stimulated one
     * @param stimulatedHeadDeltaF the stimulated head's dF/F0 at the stimulus time (dimensionless)
     */
    public record Spines(double perUm, double minGapUm, double[] headRadiusUm, double[] neckLengthUm,
            double neckRadiusUm, double[] brightness, double[] tauNeckS, boolean carrySignal, boolean stimulatedSpine,
            double stimulatedHeadDeltaF) {
        /** No spines. */
        public static final Spines NONE = new Spines(0, 1, new double[] {0.3, 0.3}, new double[] {0.5, 0.5}, 0.08,
                new double[] {1, 1}, new double[] {1, 1}, false, false, 0);

        public Spines {
            Checks.require(perUm >= 0, "perUm >= 0");
            headRadiusUm = range(headRadiusUm, "headRadiusUm");
            neckLengthUm = range(neckLengthUm, "neckLengthUm");
            brightness = range(brightness, "brightness");
            tauNeckS = range(tauNeckS, "tauNeckS");
            Checks.positiveFinite(neckRadiusUm, "neckRadiusUm");
        }

        /** About one spine per 1.2 um, heads 0.25-0.45 um, necks 0.2-0.9 um, tau 0.1-2 s, a stimulated spine. */
        public static Spines typical() {
            return new Spines(0.8, 1.0, new double[] {0.25, 0.45}, new double[] {0.2, 0.9}, 0.08,
                    new double[] {0.6, 1.6}, new double[] {0.1, 2.0}, true, true, 3.0);
        }

        public Spines withPerUm(double v) {
            return new Spines(v, minGapUm, headRadiusUm, neckLengthUm, neckRadiusUm, brightness, tauNeckS,
                    carrySignal, stimulatedSpine, stimulatedHeadDeltaF);
        }

        public Spines withTauNeck(double minS, double maxS) {
            return new Spines(perUm, minGapUm, headRadiusUm, neckLengthUm, neckRadiusUm, brightness,
                    new double[] {minS, maxS}, carrySignal, stimulatedSpine, stimulatedHeadDeltaF);
        }

        @Override
        public double[] headRadiusUm() {
            return headRadiusUm.clone();
        }

        @Override
        public double[] neckLengthUm() {
            return neckLengthUm.clone();
        }

        @Override
        public double[] brightness() {
            return brightness.clone();
        }

        @Override
        public double[] tauNeckS() {
            return tauNeckS.clone();
        }

        private static double[] range(double[] r, String name) {
            Checks.require(r != null && r.length == 2 && r[0] > 0 && r[1] >= r[0] && Double.isFinite(r[1]),
                    name + " must be {min, max} with 0 < min <= max");
            return r.clone();
        }
    }

    /**
     * A Gaussian point-spread function. Each channel's image is the scene convolved with it (before pixel
     * binning); planes off focus by z get sd psfSigmaUm sqrt(1 + (z / axialSigmaUm)^2) and a weight
     * exp(-z^2 / (2 axialSigmaUm^2)).
     *
     * @param psfSigmaUm   lateral sd, um (0 = no blur)
     * @param axialSigmaUm axial sd, um
     */
    public record Optics(double psfSigmaUm, double axialSigmaUm) {
        public static final Optics NONE = new Optics(0, 1);

        public Optics {
            Checks.require(psfSigmaUm >= 0 && Double.isFinite(psfSigmaUm), "psfSigmaUm >= 0");
            Checks.positiveFinite(axialSigmaUm, "axialSigmaUm");
        }

        public static Optics sigma(double psfSigmaUm) {
            return new Optics(psfSigmaUm, 0.6);
        }

        /**
         * The lateral sd of the Gaussian closest to a widefield Airy pattern, 0.21 lambda / NA.
         *
         * @param emissionNm emission wavelength, nm
         * @param na         numerical aperture
         */
        public static Optics fromAperture(double emissionNm, double na) {
            // REF: Zhang, Zerubia & Olivo-Marin 2007 Appl Opt 46:1819, widefield sigma = 0.21 lambda/NA
            // [from memory: Zhang et al. 2007; fairly sure]
            return new Optics(0.21 * emissionNm / 1000 / na, 0.6);
        }
    }

    /**
     * Uneven indicator loading along the dendrite, a log-normal multiplicative field exp(sd f(s) - sd^2 / 2) of
     * correlation length {@code correlationUm} (f a smooth random field of unit sd).
     *
     * @param sd            sd of the log loading (dimensionless; 0 = even)
     * @param correlationUm correlation length, um
     */
    public record Loading(double sd, double correlationUm) {
        public static final Loading EVEN = new Loading(0, 5);

        public Loading {
            Checks.require(sd >= 0 && sd < 1, "sd in [0, 1)");
            Checks.positiveFinite(correlationUm, "correlationUm");
        }

        public static Loading typical() {
            return new Loading(0.25, 4);
        }
    }

    /**
     * The camera. restCounts sets the scene's scale: a shaft of the mean radius with even loading shows restCounts
     * above the offset on its axis, before blur and bleaching. Recorded counts are offset + N / gain + e, N
     * Poisson with mean (expected - offset) * gain electrons, e Gaussian with sd readNoiseCounts, rounded and
     * clipped to 16 bits; the variance about the expected value is (expected - offset) / gain + readNoise^2
     * (+ 1/12 from rounding).
     *
     * @param restCounts            resting brightness on the axis, counts above the offset
     * @param gainElectronsPerCount electrons per count
     * @param offsetCounts          camera offset, counts
     * @param readNoiseCounts       read noise sd, counts
     * @param shotNoise             draw photon noise; false = read noise only
     */
    public record Camera(double restCounts, double gainElectronsPerCount, double offsetCounts, double readNoiseCounts,
            boolean shotNoise) {
        public Camera {
            Checks.positiveFinite(restCounts, "restCounts");
            Checks.positiveFinite(gainElectronsPerCount, "gainElectronsPerCount");
            Checks.require(offsetCounts >= 0 && readNoiseCounts >= 0, "offset and read noise >= 0");
        }

        public static Camera poissonGaussian(double restCounts) {
            return new Camera(restCounts, 1.0, 100, 3, true);
        }

        public static Camera readNoiseOnly(double restCounts, double offsetCounts, double readNoiseCounts) {
            return new Camera(restCounts, 1.0, offsetCounts, readNoiseCounts, false);
        }

        /** No noise at all: the recorded movie is the expected one rounded to whole counts. */
        public static Camera noiseless(double restCounts) {
            return new Camera(restCounts, 1.0, 100, 0, false);
        }
    }

    /**
     * Background light, attached to the specimen (it moves with the drift) and blurred like the rest:
     * autofluorescence (even), a gradient across the field, and Gaussian blobs of random position.
     *
     * @param autofluorescenceCounts even level, counts
     * @param gradientCounts         rise across the field's width along a random direction, counts
     * @param blobs                  number of blobs
     * @param blobCounts             {min, max} blob peak, counts
     * @param blobSdUm               {min, max} blob sd, um
     * @param bleachesWithDye        the background fades with the indicator's bleaching
     */
    public record Background(double autofluorescenceCounts, double gradientCounts, int blobs, double[] blobCounts,
            double[] blobSdUm, boolean bleachesWithDye) {
        public static final Background NONE = new Background(0, 0, 0, new double[] {0, 0}, new double[] {1, 1},
                false);

        public Background {
            Checks.require(autofluorescenceCounts >= 0 && blobs >= 0, "background levels >= 0");
            Checks.require(blobCounts.length == 2 && blobSdUm.length == 2 && blobSdUm[0] > 0, "blob ranges");
            blobCounts = blobCounts.clone();
            blobSdUm = blobSdUm.clone();
        }

        public static Background typical() {
            return new Background(40, 30, 4, new double[] {20, 80}, new double[] {1.5, 4}, false);
        }

        @Override
        public double[] blobCounts() {
            return blobCounts.clone();
        }

        @Override
        public double[] blobSdUm() {
            return blobSdUm.clone();
        }
    }

    /**
     * Photobleaching of the indicator: b(t) = f1 exp(-t / tau1S) + (1 - f1) exp(-t / tau2S), b(0) = 1.
     *
     * @param tau1S     first time constant, s (infinite = no bleaching)
     * @param tau2S     second time constant, s (infinite with fraction1 = 1 for one exponential)
     * @param fraction1 share of the first component (dimensionless)
     */
    public record Bleaching(double tau1S, double tau2S, double fraction1) {
        public static final Bleaching NONE = new Bleaching(Double.POSITIVE_INFINITY, Double.POSITIVE_INFINITY, 1);

        public Bleaching {
            Checks.require(tau1S > 0 && tau2S > 0, "bleaching time constants > 0");
            Checks.require(fraction1 >= 0 && fraction1 <= 1, "fraction1 in [0, 1]");
        }

        public static Bleaching single(double tauS) {
            return new Bleaching(tauS, Double.POSITIVE_INFINITY, 1);
        }

        /** A fast phase and a slow one: 30% with 25 s and 70% with 300 s (44% lost over 75 s). */
        public static Bleaching twoPhase() {
            return new Bleaching(25, 300, 0.3);
        }

        /** Fraction of the fluorescence left at time t (dimensionless). */
        public double remaining(double tS) {
            return fraction1 * Math.exp(-tS / tau1S) + (1 - fraction1) * Math.exp(-tS / tau2S);
        }
    }

    /**
     * Rigid motion of the specimen: frame i is the scene moved by shift(i) = drift i / (frames - 1) + jump
     * (from {@code jumpFrame} on) + jitter (independent Gaussian per frame). The scene itself is moved before it
     * is rendered, so the shift is exact at any fraction of a pixel.
     *
     * @param driftXUm  total drift in x over the movie, um
     * @param driftYUm  total drift in y over the movie, um
     * @param jumpFrame first frame after a sudden jump, or -1 for none
     * @param jumpXUm   jump in x, um
     * @param jumpYUm   jump in y, um
     * @param jitterSdUm sd of the jitter in each direction, um
     */
    public record Motion(double driftXUm, double driftYUm, int jumpFrame, double jumpXUm, double jumpYUm,
            double jitterSdUm) {
        public static final Motion NONE = new Motion(0, 0, -1, 0, 0, 0);

        public Motion {
            Checks.require(jitterSdUm >= 0, "jitterSdUm >= 0");
        }

        /** A slow linear drift of the given total (um) and jitter (sd, um). */
        public static Motion linear(double totalUm, double jitterSdUm) {
            return new Motion(totalUm * 0.8, totalUm * 0.6, -1, 0, 0, jitterSdUm);
        }

        public Motion withJump(int frame, double xUm, double yUm) {
            return new Motion(driftXUm, driftYUm, frame, xUm, yUm, jitterSdUm);
        }

        public boolean isNone() {
            return driftXUm == 0 && driftYUm == 0 && jumpFrame < 0 && jitterSdUm == 0;
        }
    }

    /** What a channel shows. */
    public enum Role {
        /** The indicator: resting fluorescence times (1 + signal). */
        SIGNAL,
        /** A structural dye filling the cell evenly, with no signal. */
        STRUCTURAL
    }

    /**
     * The channels in the movie's order.
     *
     * @param order             roles, channel 1 first
     * @param structuralCounts  the structural dye's resting brightness on the axis, counts above the offset
     * @param structuralBleachS the structural dye's single-exponential bleaching time, s (infinite = none)
     */
    public record Channels(List<Role> order, double structuralCounts, double structuralBleachS) {
        public static final Channels SIGNAL_ONLY = new Channels(List.of(Role.SIGNAL), 0, Double.POSITIVE_INFINITY);

        public Channels {
            order = List.copyOf(order);
            Checks.require(order.stream().filter(r -> r == Role.SIGNAL).count() == 1,
                    "exactly one signal channel");
            Checks.require(structuralBleachS > 0, "structuralBleachS > 0");
        }

        /** A red structural channel first, the signal second (as many set-ups record them). */
        public static Channels twoStructuralFirst() {
            return new Channels(List.of(Role.STRUCTURAL, Role.SIGNAL), 800, 600);
        }

        /** The signal first, a structural channel second. */
        public static Channels twoSignalFirst() {
            return new Channels(List.of(Role.SIGNAL, Role.STRUCTURAL), 800, 600);
        }

        /** 1-based index of the signal channel. */
        public int signalChannel() {
            return order.indexOf(Role.SIGNAL) + 1;
        }

        /** 1-based index of the structural channel, or 0 if none. */
        public int structuralChannel() {
            return order.indexOf(Role.STRUCTURAL) + 1;
        }
    }

    /** What the indicator reports along the dendrite: dF/F0 as a function of arc length along the true axis. */
    public sealed interface Signal permits GaussianPulse, NagumoFront, NagumoKick, PulsePair {
        /** Stimulus time, s. */
        double timeS();

        /** Model name for truth.json. */
        String name();
    }

    /**
     * Diffusion with first-order decay from a Gaussian of sd s0 released at the stimulus (Crank 1975; sheet s2.2,
     * s2.3): dF/F0 = A s0 / sqrt(V) exp(-(s - s_stim)^2 / (2 V)) exp(-k tau), V = s0^2 + 2 D tau, tau = t - t_stim
     * >= 0. k = 0 gives a purely diffusive pulse.
     *
     * @param dUm2PerS         D, um^2/s
     * @param kPerS            k, 1/s (0 = no decay)
     * @param sigma0Um         s0, um
     * @param amplitude        A, peak dF/F0 at the stimulus time (dimensionless)
     * @param timeS            stimulus time, s
     * @param positionFraction stimulus position as a fraction of the axis stretch the drawn path covers
     */
    public record GaussianPulse(double dUm2PerS, double kPerS, double sigma0Um, double amplitude, double timeS,
            double positionFraction) implements Signal {
        public GaussianPulse {
            Checks.positiveFinite(dUm2PerS, "dUm2PerS");
            Checks.require(kPerS >= 0, "kPerS >= 0");
            Checks.positiveFinite(sigma0Um, "sigma0Um");
            Checks.require(positionFraction > 0 && positionFraction < 1, "positionFraction in (0, 1)");
        }

        /** D in [0.4, 1.2] um^2/s, k in [0.03, 0.08] 1/s, s0 in [0.8, 1.2] um, A in [1, 2], at frame 19.5, mid-path. */
        public static GaussianPulse drawn(RandomGenerator r) {
            return new GaussianPulse(0.4 + 0.8 * r.nextDouble(), 0.03 + 0.05 * r.nextDouble(),
                    0.8 + 0.4 * r.nextDouble(), 1 + r.nextDouble(), 9.75, 0.4 + 0.2 * r.nextDouble());
        }

        /** The same pulse without decay. */
        public GaussianPulse withoutDecay() {
            return new GaussianPulse(dUm2PerS, 0, sigma0Um, amplitude, timeS, positionFraction);
        }

        @Override
        public String name() {
            return kPerS == 0 ? "diffusion" : "diffusion-decay";
        }
    }

    /**
     * Two stimuli at different times and places: the sum of two Gaussian pulses, which is exact for a linear model
     * such as diffusion with decay (superposition). session.json gives the first; the second is in truth.json's
     * {@code later_stimuli}.
     *
     * @param first  the first pulse (its time and place are the session's stimulus)
     * @param second the second pulse, later than the first
     */
    public record PulsePair(GaussianPulse first, GaussianPulse second) implements Signal {
        public PulsePair {
            Checks.require(second.timeS() > first.timeS(), "the second pulse comes after the first");
        }

        @Override
        public double timeS() {
            return first.timeS();
        }

        @Override
        public String name() {
            return first.name();
        }
    }

    /**
     * A bistable (Nagumo) front entering at the start of the drawn path: McKean's exact travelling wave of
     * u_t = D u_xx + k u (1 - u)(u - a), u = 1 / (1 + exp((s - s_start - c (t - t_stim)) / w)),
     * c = sqrt(2 D k)(1/2 - a), w = sqrt(2 D / k) (McKean 1970; sheet s5.2); dF/F0 = amplitude u. Its midpoint
     * passes the path's first point at the stimulus time.
     *
     * @param dUm2PerS  D, um^2/s
     * @param kPerS     k, 1/s
     * @param a         threshold, 0 < a < 1/2
     * @param amplitude dF/F0 of the excited state (dimensionless)
     * @param timeS     stimulus time, s
     */
    public record NagumoFront(double dUm2PerS, double kPerS, double a, double amplitude, double timeS)
            implements Signal {
        public NagumoFront {
            Checks.positiveFinite(dUm2PerS, "dUm2PerS");
            Checks.positiveFinite(kPerS, "kPerS");
            Checks.require(a > 0 && a < 0.5, "a in (0, 1/2)");
        }

        @Override
        public String name() {
            return "nagumo-front";
        }
    }

    /**
     * A brief local kick that starts two bistable fronts: u(s, t_stim) = exp(-(s - s_stim)^2 / (2 kickSdUm^2)), then
     * u_t = D u_ss + k u (1 - u)(u - a) integrated by the method of lines (3-point Laplacian on a uniform grid of
     * spacing w / gridPerWidth, classical Runge-Kutta in time from Commons Math); dF/F0 = amplitude u. Once
     * formed, each front moves at McKean's speed (sheet s5.2).
     *
     * @param dUm2PerS         D, um^2/s
     * @param kPerS            k, 1/s
     * @param a                threshold, 0 < a < 1/2
     * @param amplitude        dF/F0 of the excited state (dimensionless)
     * @param timeS            stimulus time, s
     * @param positionFraction kick position as a fraction of the axis stretch the drawn path covers
     * @param kickSdUm         sd of the kick, um
     * @param gridPerWidth     grid points per front width w (the speed error is about 1e-4 at 14, 4e-4 at 7;
     *                         sheet s5.4)
     */
    public record NagumoKick(double dUm2PerS, double kPerS, double a, double amplitude, double timeS,
            double positionFraction, double kickSdUm, double gridPerWidth) implements Signal {
        public NagumoKick {
            Checks.positiveFinite(dUm2PerS, "dUm2PerS");
            Checks.positiveFinite(kPerS, "kPerS");
            Checks.require(a > 0 && a < 0.5, "a in (0, 1/2)");
            Checks.positiveFinite(kickSdUm, "kickSdUm");
            Checks.require(gridPerWidth >= 4, "gridPerWidth >= 4");
            Checks.require(positionFraction > 0 && positionFraction < 1, "positionFraction in (0, 1)");
        }

        /**
         * D 0.5 um^2/s, k 1 1/s, a 0.2 (front 0.3 um/s, width 1 um), amplitude 1.5, kick of sd 1.5 um mid-path, 10
         * grid points per front width (front speed within about 2e-4 of McKean's; sheet s5.4).
         */
        public static NagumoKick typical() {
            return new NagumoKick(0.5, 1, 0.2, 1.5, 9.75, 0.5, 1.5, 10);
        }

        public NagumoKick withGridPerWidth(double n) {
            return new NagumoKick(dUm2PerS, kPerS, a, amplitude, timeS, positionFraction, kickSdUm, n);
        }

        @Override
        public String name() {
            return "nagumo-kick";
        }
    }

    /** How the user's line is drawn. */
    public enum PathStyle {
        /** ImageJ's segmented line: a few clicked vertices. */
        POLYLINE,
        /** ImageJ's freehand line: a vertex about every pixel, with a hand's wobble. */
        FREEHAND
    }

    /**
     * The line a user draws along the dendrite. It starts and ends {@code endInsetUm} inside the stretch of the
     * axis that stays within the image (with room for the band and the motion), and is drawn from the image's
     * left to its right. Polyline vertices sit at evenly spaced points of the axis (jittered by a quarter of the
     * spacing) moved sideways by Gaussian offsets of sd {@code offsetSdUm}; a freehand line follows the axis with a
     * smooth sideways wobble of that sd.
     *
     * @param style      polyline or freehand
     * @param vertices   polyline vertices (ignored for freehand)
     * @param offsetSdUm sd of the sideways offset from the true axis, um (0 = on the axis)
     * @param endInsetUm how far inside the usable stretch the line starts and ends, um
     * @param widthUm    band width written to session.json as path_width_um, um
     */
    public record DrawnPath(PathStyle style, int vertices, double offsetSdUm, double endInsetUm, double widthUm) {
        public DrawnPath {
            Checks.require(vertices >= 2, "at least 2 vertices");
            Checks.require(offsetSdUm >= 0 && endInsetUm >= 0, "offsets >= 0");
            Checks.positiveFinite(widthUm, "widthUm");
        }

        /** A straight line exactly on the axis (with a straight dendrite: the clean case). */
        public static DrawnPath onAxis() {
            return new DrawnPath(PathStyle.POLYLINE, 2, 0, 0.5, 1.0);
        }

        /** A segmented line of n vertices, 0.12 um sd off the axis. */
        public static DrawnPath polyline(int n) {
            return new DrawnPath(PathStyle.POLYLINE, n, 0.12, 0.5, 1.0);
        }

        /** A freehand line with a 0.1 um sd wobble. */
        public static DrawnPath freehand() {
            return new DrawnPath(PathStyle.FREEHAND, 2, 0.1, 0.5, 1.0);
        }
    }

    /**
     * A bright spine head (no neck, no signal) that moves in a straight line from {@code startOffsetUm} to
     * {@code endOffsetUm} from the dendrite's axis, perpendicular to it, between startTimeS and endTimeS: a spine
     * drifting into the path's band, which puts stripes along time into the kymograph.
     *
     * @param enabled          false = no intruder
     * @param brightness       head loading relative to the shaft (dimensionless)
     * @param radiusUm         head radius, um
     * @param positionFraction where along the drawn path's stretch of the axis, fraction
     * @param startOffsetUm    distance of the head's centre from the axis at the start, um
     * @param endOffsetUm      distance at the end, um
     * @param startTimeS       when it starts to move, s
     * @param endTimeS         when it stops, s
     */
    public record Intruder(boolean enabled, double brightness, double radiusUm, double positionFraction,
            double startOffsetUm, double endOffsetUm, double startTimeS, double endTimeS) {
        public static final Intruder NONE = new Intruder(false, 1, 0.4, 0.5, 3, 3, 0, 1);

        public Intruder {
            Checks.require(endTimeS > startTimeS, "endTimeS > startTimeS");
            Checks.positiveFinite(radiusUm, "radiusUm");
        }

        /** A head three times as bright as the shaft moving from 2.5 um to 0.9 um off the axis during the movie. */
        public static Intruder entering(double positionFraction, double startTimeS, double endTimeS) {
            return new Intruder(true, 3, 0.45, positionFraction, 2.5, 0.9, startTimeS, endTimeS);
        }
    }

    /**
     * What session.json says. Keys the analysis does not know yet are written only when asked, so that the clean
     * cases give no warnings.
     *
     * @param models       the "models" list, or an empty list to leave the key out
     * @param giveStimulus write the true stimulus time and its position along the drawn path
     * @param channelKeys  write "channel" and "structural_channel" for several channels
     * @param linePeriodKey write "line_period_s" for a raster scan
     */
    public record SessionFile(List<String> models, boolean giveStimulus, boolean channelKeys, boolean linePeriodKey) {
        public SessionFile {
            models = List.copyOf(models);
        }

        /** Diffusion-decay only, the stimulus given, the channel and line-period keys written when they apply. */
        public static SessionFile standard() {
            return new SessionFile(List.of("diffusion-decay"), true, true, true);
        }

        public SessionFile withModels(List<String> m) {
            return new SessionFile(m, giveStimulus, channelKeys, linePeriodKey);
        }
    }
}
