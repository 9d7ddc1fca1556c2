package org.dendrokin.core.kymo;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.SplittableRandom;

import net.imglib2.RealRandomAccess;
import net.imglib2.img.array.ArrayImg;
import net.imglib2.img.array.ArrayImgs;
import net.imglib2.img.basictypeaccess.array.FloatArray;
import net.imglib2.interpolation.randomaccess.NLinearInterpolatorFactory;
import net.imglib2.type.numeric.real.FloatType;
import net.imglib2.view.Views;

import org.dendrokin.core.Progress;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.core.path.PixelConvention;
import org.junit.jupiter.api.Test;

/** Our bilinear sampling against ImgLib2's n-linear interpolator, with the half-pixel shift between them. */
class BilinearVersusImgLib2Test {

    @Test
    void sampleValuesMatchImgLib2AtRandomSubPixelPoints() {
        int width = 37;
        int height = 29;
        SplittableRandom random = new SplittableRandom(20261201L);  // fixed seed: a failure must reproduce
        float[] pixels = new float[width * height];
        for (int i = 0; i < pixels.length; i++) {
            pixels[i] = (float) (100 + 900 * random.nextDouble());
        }
        ArrayFrames frames = new ArrayFrames(width, height, new float[][] {pixels});
        ArrayImg<FloatType, FloatArray> img = ArrayImgs.floats(pixels, width, height);
        RealRandomAccess<FloatType> imglib = Views.interpolate(Views.extendBorder(img),
                new NLinearInterpolatorFactory<FloatType>()).realRandomAccess();
        for (int trial = 0; trial < 50; trial++) {
            // a short random segment well inside the image, sampled on the line only (band width 0)
            double x0 = 2 + (width - 4) * random.nextDouble();
            double y0 = 2 + (height - 4) * random.nextDouble();
            double angle = 2 * Math.PI * random.nextDouble();
            double x1 = Math.max(0.6, Math.min(width - 0.6, x0 + 6 * Math.cos(angle)));
            double y1 = Math.max(0.6, Math.min(height - 0.6, y0 + 6 * Math.sin(angle)));
            DendritePath path = DendritePath.of(new double[] {x0, x1}, new double[] {y0, y1}, false);
            Extraction e = KymographExtractor.extract(frames, path, 1.0, 1.0, 0.0, 0.37, Progress.NONE);
            double[] x = e.xPx();
            double[] y = e.yPx();
            for (int s = 0; s < x.length; s++) {
                imglib.setPosition(new double[] {PixelConvention.toArrayIndex(x[s]), PixelConvention.toArrayIndex(y[s])});
                // REF: ImgLib2 8.0.1 NLinearInterpolator on an ArrayImg, sample i at coordinate i [common practice]
                assertEquals(imglib.get().getRealDouble(), e.kymograph().value(0, s), 1e-3,
                        "trial " + trial + ", sample " + s);
            }
        }
    }
}
