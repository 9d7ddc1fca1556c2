package org.dendrokin.io.plot;

import java.awt.Color;

/**
 * Colour maps for pictures: a sequential map running from dark blue through teal and green to pale yellow
 * (lightness rises steadily, so it reads in grey print and for common colour-vision deficiencies), and a
 * diverging blue-white-red map for residuals. Anchor colours are our own choice.
 */
public enum ColourScale {
    SEQUENTIAL(new int[][] {
        {20, 14, 60}, {48, 40, 120}, {40, 90, 150}, {30, 135, 145}, {60, 175, 115}, {150, 205, 70}, {245, 235, 120}}),
    DIVERGING(new int[][] {
        {40, 60, 150}, {110, 150, 210}, {245, 245, 245}, {225, 130, 100}, {160, 30, 40}});

    private final int[][] anchors;
    private final int[] table = new int[256];

    ColourScale(int[][] anchors) {
        this.anchors = anchors;
        for (int i = 0; i < 256; i++) {
            table[i] = interpolate(i / 255.0);
        }
    }

    /** RGB of a value scaled to [0, 1]; values outside are clamped, NaN is mid grey. */
    public int rgb(double fraction) {
        if (Double.isNaN(fraction)) {
            return 0x808080;
        }
        int i = (int) Math.round(Math.max(0, Math.min(1, fraction)) * 255);
        return table[i];
    }

    public Color colour(double fraction) {
        return new Color(rgb(fraction));
    }

    private int interpolate(double t) {
        double x = t * (anchors.length - 1);
        int i = Math.min((int) Math.floor(x), anchors.length - 2);
        double w = x - i;
        int r = (int) Math.round(anchors[i][0] * (1 - w) + anchors[i + 1][0] * w);
        int g = (int) Math.round(anchors[i][1] * (1 - w) + anchors[i + 1][1] * w);
        int b = (int) Math.round(anchors[i][2] * (1 - w) + anchors[i + 1][2] * w);
        return (r << 16) | (g << 8) | b;
    }
}
