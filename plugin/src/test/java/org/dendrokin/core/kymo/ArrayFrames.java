package org.dendrokin.core.kymo;

import java.util.function.IntFunction;

/** Frames held in memory, for tests: {@code frames[t][row * width + column]}. */
final class ArrayFrames implements FrameSource {
    private final int width;
    private final int height;
    private final float[][] frames;

    ArrayFrames(int width, int height, float[][] frames) {
        this.width = width;
        this.height = height;
        this.frames = frames;
    }

    /** Frames whose pixel (column, row) of frame t holds {@code value.apply(t).at(column, row)}. */
    static ArrayFrames of(int width, int height, int frameCount, IntFunction<PixelFunction> value) {
        float[][] frames = new float[frameCount][width * height];
        for (int t = 0; t < frameCount; t++) {
            PixelFunction f = value.apply(t);
            for (int row = 0; row < height; row++) {
                for (int col = 0; col < width; col++) {
                    frames[t][row * width + col] = (float) f.at(col, row);
                }
            }
        }
        return new ArrayFrames(width, height, frames);
    }

    @Override
    public int width() {
        return width;
    }

    @Override
    public int height() {
        return height;
    }

    @Override
    public int frameCount() {
        return frames.length;
    }

    @Override
    public float[] readRows(int frame, int firstRow, int rowCount, float[] dst) {
        System.arraycopy(frames[frame], firstRow * width, dst, 0, rowCount * width);
        return dst;
    }

    /** A pixel value by array column and row. */
    interface PixelFunction {
        double at(int column, int row);
    }
}
