package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** Which frames the profile plots show: the first one after the stimulus, then later ones spread in time. */
class ProfilePlotTest {
    private static double[] times(int n, double dt) {
        double[] t = new double[n];
        for (int i = 0; i < n; i++) {
            t[i] = i * dt;
        }
        return t;
    }

    @Test
    void theFirstProfileIsTheFirstFrameAfterTheStimulusAndTheOthersFollowInOrder() {
        double[] t = times(200, 0.5);
        int[] f = ProfilePlot.frames(t, 9.75);
        assertEquals(20, f[0], "10.0 s is the first frame after a stimulus at 9.75 s");
        assertEquals(ProfilePlot.COUNT, f.length);
        for (int i = 1; i < f.length; i++) {
            assertTrue(f[i] > f[i - 1], "ascending and distinct");
        }
        // the last one is about half the time the recording has left after the first profile
        assertEquals(9.75 + (99.5 - 9.75) / 2, t[f[f.length - 1]], 0.25);
        // times since the stimulus grow geometrically: 0.25 s x (44.875 / 0.25)^(k/3), to the nearest frame
        assertArrayEquals(new int[] {20, 22, 35, 109}, f);
    }

    @Test
    void aStimulusOnAFrameTimeStartsAtTheNextFrame() {
        assertEquals(11, ProfilePlot.frames(times(50, 1), 10)[0]);
    }

    @Test
    void fewFramesGiveFewerProfilesNeverTheSameOneTwice() {
        int[] f = ProfilePlot.frames(times(5, 1), 1.5);
        assertEquals(2, f[0]);
        for (int i = 1; i < f.length; i++) {
            assertTrue(f[i] > f[i - 1]);
        }
    }

    @Test
    void aStimulusAfterTheLastFrameShowsTheLastFrame() {
        assertArrayEquals(new int[] {9}, ProfilePlot.frames(times(10, 1), 30));
    }
}
