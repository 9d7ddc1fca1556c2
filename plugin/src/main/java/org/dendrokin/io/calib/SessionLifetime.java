package org.dendrokin.io.calib;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.analysis.LifetimeRequest;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.io.InputException;
import org.dendrokin.io.movie.Movie;

/**
 * The movies of the lifetime method, opened for one session: the mean lifetime per pixel and, when named, the
 * photon counts, each checked against the session's movie (same width, height and number of time points, one
 * focal plane, the channel present) before any work. The files a session names only once are opened once: a
 * photon file that is the session's movie, or the lifetime's own file, is read through the movie already open.
 * Close it after the analysis; the session's movie stays open (it is the caller's).
 */
public final class SessionLifetime implements AutoCloseable {
    private final LifetimeRequest request;
    private final List<Movie> opened;
    private final List<String> warnings;

    private SessionLifetime(LifetimeRequest request, List<Movie> opened, List<String> warnings) {
        this.request = request;
        this.opened = opened;
        this.warnings = List.copyOf(warnings);
    }

    /**
     * Opens and checks the lifetime method's movies.
     *
     * @param setup       the parsed calibration, whose {@link CalibrationSetup#lifetime()} is not null
     * @param sessionFile session.json, named in messages; its folder resolves the file names
     * @param movie       the session's movie, open; not closed here
     * @throws InputException naming session.json and the key when a movie does not fit the session's movie, or
     *                        naming the file when it cannot be read
     */
    public static SessionLifetime open(CalibrationSetup setup, Path sessionFile, Movie movie) {
        CalibrationSetup.LifetimeInput in = setup.lifetime();
        if (in == null) {
            throw new IllegalArgumentException("the calibration is not the lifetime method");
        }
        Path dir = sessionFile.toAbsolutePath().getParent();
        List<Movie> opened = new ArrayList<>();
        List<String> warnings = new ArrayList<>();
        try {
            Movie lifetimeMovie = in.movie() == null ? movie
                    : openFitting(dir.resolve(in.movie()), in.movie(), "movie", movie, sessionFile, opened, warnings);
            FrameSource lifetime = channel(lifetimeMovie, in.lifetimeChannel(), "lifetime_channel",
                    in.movie() == null ? "lifetime_channel" : "movie", sessionFile, movie);
            FrameSource photons = null;
            if (in.weighted()) {
                Movie photonMovie = in.photons() == null ? lifetimeMovie
                        : openFitting(dir.resolve(in.photons()), in.photons(), "photons", movie, sessionFile, opened,
                                warnings);
                photons = channel(photonMovie, in.photonChannelOrFirst(), "photon_channel",
                        in.photons() == null ? "photon_channel" : "photons", sessionFile, movie);
            }
            return new SessionLifetime(new LifetimeRequest(lifetime, photons), opened, warnings);
        } catch (RuntimeException e) {
            opened.forEach(Movie::close);
            throw e;
        }
    }

    /** The movies as the analysis takes them. */
    public LifetimeRequest request() {
        return request;
    }

    /** Sentences about the movies opened here (e.g. from their TIFF headers). */
    public List<String> warnings() {
        return warnings;
    }

    @Override
    public void close() {
        opened.forEach(Movie::close);
    }

    /** The session's movie itself when the name is its file, else the file opened and checked against it. */
    private static Movie openFitting(Path file, String name, String key, Movie session, Path sessionFile,
                                     List<Movie> opened, List<String> warnings) {
        if (file.toAbsolutePath().normalize().equals(session.file().toAbsolutePath().normalize())) {
            return session;
        }
        for (Movie m : opened) {
            if (file.toAbsolutePath().normalize().equals(m.file().toAbsolutePath().normalize())) {
                return m;
            }
        }
        Movie m = Movie.open(file, session.pixelSizeUm(), session.frameIntervalS());
        opened.add(m);
        warnings.addAll(m.warnings());
        if (m.width() != session.width() || m.height() != session.height() || m.frameCount() != session.frameCount()) {
            throw new InputException(sessionFile, String.format(Locale.ROOT, "key \"calibration.%s\" names %s, which "
                    + "is %s, but the movie %s is %s; the two must match pixel for pixel and frame for frame", key,
                    name, size(m), session.file().getFileName(), size(session)));
        }
        return m;
    }

    /**
     * One channel of a movie with one focal plane, or a sentence naming the key at fault: {@code channelKey} for a
     * channel the movie lacks, {@code movieKey} for a movie with several focal planes.
     */
    private static FrameSource channel(Movie m, int channel, String channelKey, String movieKey, Path sessionFile,
                                       Movie session) {
        String name = m == session ? "the session's movie " + m.file().getFileName() : String.valueOf(m.file()
                .getFileName());
        if (channel > m.channelCount()) {
            throw new InputException(sessionFile, String.format(Locale.ROOT, "key \"calibration.%s\" asks for channel "
                    + "%d, but %s has %d channel%s", channelKey, channel, name, m.channelCount(),
                    m.channelCount() == 1 ? "" : "s"));
        }
        if (m.zSlices() > 1) {
            throw new InputException(sessionFile, String.format(Locale.ROOT, "key \"calibration.%s\" points at %s, "
                    + "which has %d focal planes at each time point; the lifetime method needs movies with one plane (a "
                    + "projection of lifetimes would not be photon-weighted)", movieKey, name, m.zSlices()));
        }
        return m.channel(channel - 1);
    }

    private static String size(Movie m) {
        return String.format(Locale.ROOT, "%d x %d pixels with %d time points", m.width(), m.height(), m.frameCount());
    }
}
