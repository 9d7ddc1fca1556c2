package org.dendrokin.io.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** The profile picture starts with the first frame after the stimulus and reaches towards the movie's end. */
class FitPicturesTest {
    @Test
    void profilesStartAtTheFirstFrameAfterTheStimulusAndSpreadOutGeometrically() {
        int first = 20;
        int nt = 200;
        int[] frames = FitPictures.profileFrames(first, nt);
        assertEquals(first, frames[0], "the first profile is the first frame at or after the stimulus");
        assertEquals(4, frames.length);
        for (int i = 1; i < frames.length; i++) {
            assertTrue(frames[i] > frames[i - 1] && frames[i] < nt, "frames rise and stay inside the movie");
        }
        // each later profile is about three times as long after the stimulus as the one before
        assertEquals(3.0, (frames[3] - first) / (double) (frames[2] - first), 0.1);
        assertEquals(3.0, (frames[2] - first) / (double) (frames[1] - first), 0.2);
        assertEquals(0, FitPictures.profileFrames(nt, nt).length, "no profile without a frame after the stimulus");
    }
}
