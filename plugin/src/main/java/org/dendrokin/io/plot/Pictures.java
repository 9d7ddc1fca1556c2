package org.dendrokin.io.plot;

import java.awt.image.BufferedImage;
import java.nio.file.Path;

import javax.imageio.ImageIO;

import org.dendrokin.io.AtomicFiles;

/** Saves pictures as PNG through a temporary file. */
public final class Pictures {
    private Pictures() {
    }

    public static void savePng(BufferedImage image, Path target) {
        AtomicFiles.write(target, out -> {
            if (!ImageIO.write(image, "png", out)) {
                throw new java.io.IOException("no PNG writer available");
            }
        });
    }
}
