/**
 * Rigid motion of the specimen: each frame's translation against a reference of the baseline frames, measured by
 * phase correlation in a window near the path and away from the stimulated site, streamed one frame at a time;
 * and the kymograph taken along the path moved with it. May import {@code core}, {@code core.kymo} and
 * {@code core.path}; nothing outside {@code core}.
 */
package org.dendrokin.core.motion;
