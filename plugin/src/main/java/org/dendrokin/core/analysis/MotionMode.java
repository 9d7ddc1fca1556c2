package org.dendrokin.core.analysis;

/** What an analysis does about rigid motion of the specimen. */
public enum MotionMode {
    /** Measure every frame's shift and move the path with it when taking the kymograph. */
    CORRECT("correct"),
    /** Measure and report the shifts, but take the kymograph along the path as drawn. */
    MEASURE("measure"),
    /** Neither. */
    OFF("off");

    private final String key;

    MotionMode(String key) {
        this.key = key;
    }

    /** As written in session.json and results.json. */
    public String key() {
        return key;
    }

    /** The mode for its session.json word, or null. */
    public static MotionMode of(String key) {
        for (MotionMode m : values()) {
            if (m.key.equals(key)) {
                return m;
            }
        }
        return null;
    }
}
