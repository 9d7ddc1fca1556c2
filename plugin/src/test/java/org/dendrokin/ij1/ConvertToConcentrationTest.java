package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import ij.IJ;
import ij.ImagePlus;
import ij.ImageStack;
import ij.WindowManager;
import ij.process.FloatProcessor;

import org.dendrokin.core.kymo.Kymograph;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

class ConvertToConcentrationTest {
    private static final String SINGLE = "method=single-wavelength background=50 flag=0.8 reject=0.95"
            + " kd=0.345 fmin=100 fmax=1000";

    @BeforeAll
    static void imagej() {
        HeadlessImageJ.start();
    }

    private static ImagePlus runOn(ImagePlus image, String options) {
        WindowManager.setTempCurrentImage(image);
        IJ.run("Convert to Concentration...", options);
        return WindowManager.getCurrentImage();
    }

    @Test
    void kymographInIntensityBecomesMicromolar() {
        // 450 - background 50 = 400; 1100 - 50 = 1050 is above Fmax
        Kymograph k = new Kymograph(new double[] {0, 0.5}, new double[] {0, 1}, new double[] {450, 1100, 150, 450},
                "intensity");
        ImagePlus out = runOn(KymographImage.toImage(k, "cell"), SINGLE);
        Kymograph c = KymographImage.fromImage(out);
        assertEquals("uM", c.signalUnit());
        // REF: Grynkiewicz, Poenie & Tsien 1985, worked example Kd 345 nM, Fmin 100, Fmax 1000, F 400 -> 172.5 nM
        // [published: GPT85]; sheet s1.1 (float image: 1e-6 relative)
        assertEquals(0.1725, c.value(0, 0), 0.1725e-6, "concentration, uM");
        assertTrue(Double.isNaN(c.value(0, 1)), "above Fmax gives NaN, not a negative number");
        assertTrue(Double.isNaN(c.value(1, 0)), "at Fmin the calibration gives no positive concentration");
    }

    @Test
    void movieBecomesAVirtualStackInMicromolar() {
        ImageStack stack = new ImageStack(2, 1);
        stack.addSlice(new FloatProcessor(2, 1, new float[] {450, 150}));
        stack.addSlice(new FloatProcessor(2, 1, new float[] {150, 450}));
        stack.addSlice(new FloatProcessor(2, 1, new float[] {1100, 450}));
        ImagePlus movie = new ImagePlus("movie", stack);
        ImagePlus out = runOn(movie, SINGLE);
        assertTrue(out.getStack().isVirtual(), "no copy of the movie");
        assertEquals(3, out.getStackSize());
        assertEquals("uM", out.getCalibration().getValueUnit());
        float[] t2 = (float[]) out.getStack().getProcessor(2).getPixels();
        // REF: as above, GPT85 worked example; sheet s1.1
        assertEquals(0.1725, t2[1], 0.1725e-6, "concentration at frame 2, uM");
        float[] t3 = (float[]) out.getStack().getProcessor(3).getPixels();
        assertTrue(Float.isNaN(t3[0]), "saturated pixel is NaN");
    }

    @Test
    void twoChannelMovieByTheRatioMethod() {
        ImageStack stack = new ImageStack(1, 1);
        for (int t = 0; t < 2; t++) {
            stack.addSlice(new FloatProcessor(1, 1, new float[] {150}));
            stack.addSlice(new FloatProcessor(1, 1, new float[] {110}));
        }
        ImagePlus movie = new ImagePlus("two channels", stack);
        movie.setDimensions(2, 1, 2);
        ImagePlus out = runOn(movie, "method=ratio background=0 flag=0.8 reject=0.95 kd=0.224 rmin=0.3 rmax=6"
                + " beta=5 numerator=1 denominator=2 offset=10");
        float[] t1 = (float[]) out.getStack().getProcessor(1).getPixels();
        // R = 150 / (110 - 10) = 1.5
        // REF: Grynkiewicz, Poenie & Tsien 1985, ratio form, Kd 224 nM, Rmin 0.3, Rmax 6.0, beta 5, R 1.5 ->
        // 298.6667 nM [published: GPT85]; sheet s1.2
        assertEquals(0.2986667, t1[0], 1e-6, "concentration, uM");
    }

    @Test
    void ratioOnASingleChannelMovieIsRefusedInOneSentence() {
        ImageStack stack = new ImageStack(2, 1);
        stack.addSlice(new FloatProcessor(2, 1));
        stack.addSlice(new FloatProcessor(2, 1));
        ImagePlus movie = new ImagePlus("one channel", stack);
        String printed = UserGuideTest.captureStdout(() -> runOn(movie,
                "method=ratio background=0 flag=0.8 reject=0.95 kd=0.224 rmin=0.3 rmax=6 beta=5"));
        assertTrue(printed.contains("The ratio method needs two channels, but one channel has one"), printed);
    }
}
