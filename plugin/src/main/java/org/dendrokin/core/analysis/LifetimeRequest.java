package org.dendrokin.core.analysis;

import org.dendrokin.core.Checks;
import org.dendrokin.core.kymo.FrameSource;

/**
 * The movies of the lifetime method, already opened and checked against the session's movie by the caller: the
 * mean fluorescence lifetime of each pixel (ns) and, when given, its photon count, which weights the average across
 * the band ({@link org.dendrokin.core.kymo.PhotonWeighting}) and sets the lifetime's photon-limited precision.
 *
 * @param lifetimeNs mean lifetime per pixel, ns; same width, height and frame count as the session's movie
 * @param photons    photon count per pixel on the same grid, or null (equal weights, no precision from photons)
 */
public record LifetimeRequest(FrameSource lifetimeNs, FrameSource photons) {
    public LifetimeRequest {
        Checks.require(lifetimeNs != null, "the lifetime method needs the lifetime movie");
        Checks.require(photons == null || (photons.width() == lifetimeNs.width()
                && photons.height() == lifetimeNs.height() && photons.frameCount() == lifetimeNs.frameCount()),
                "the photon-count movie and the lifetime movie differ in size");
    }
}
