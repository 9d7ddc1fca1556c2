package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import org.dendrokin.core.Progress;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

/**
 * The optimiser and its standard errors on the NIST StRD certified nonlinear regression problems that Commons Math
 * ships in its test jar (Kirby2, Hahn1, MGH17, Lanczos1), read from the files themselves: data, both NIST starts,
 * certified parameters, certified standard deviations and certified residual sum of squares.
 */
class NistStrdTest {
    /** One NIST StRD nonlinear regression file. */
    record Dataset(String name, double[] x, double[] y, double[] start1, double[] start2, double[] certified,
                   double[] certifiedSd, double certifiedRss) {
    }

    private static final Pattern PARAMETER = Pattern.compile(
            "^\\s*b(\\d+)\\s*=\\s*(\\S+)\\s+(\\S+)\\s+(\\S+)\\s+(\\S+)\\s*$");
    private static final Pattern RSS = Pattern.compile("^\\s*Residual Sum of Squares:\\s+(\\S+)\\s*$");
    private static final Pattern DATA_HEADER = Pattern.compile("^\\s*Data:\\s+y\\s+x\\s*$");

    /** Reads a NIST StRD file from the Commons Math test jar on the test class path. */
    static Dataset read(String name) {
        String resource = "/org/apache/commons/math3/fitting/leastsquares/" + name + ".dat";
        List<double[]> params = new ArrayList<>();
        List<double[]> points = new ArrayList<>();
        double rss = Double.NaN;
        try (InputStream in = NistStrdTest.class.getResourceAsStream(resource)) {
            assertNotNull(in, "the Commons Math test jar is on the test class path: " + resource);
            BufferedReader reader = new BufferedReader(new InputStreamReader(in, StandardCharsets.US_ASCII));
            boolean data = false;
            for (String line = reader.readLine(); line != null; line = reader.readLine()) {
                if (data) {
                    String[] f = line.trim().split("\\s+");
                    if (f.length == 2) {
                        points.add(new double[] {Double.parseDouble(f[1]), Double.parseDouble(f[0])});
                    }
                    continue;
                }
                Matcher m = PARAMETER.matcher(line);
                if (m.matches()) {
                    assertEquals(params.size() + 1, Integer.parseInt(m.group(1)), name + ": parameters in order");
                    params.add(new double[] {Double.parseDouble(m.group(2)), Double.parseDouble(m.group(3)),
                        Double.parseDouble(m.group(4)), Double.parseDouble(m.group(5))});
                }
                Matcher r = RSS.matcher(line);
                if (r.matches()) {
                    rss = Double.parseDouble(r.group(1));
                }
                data = DATA_HEADER.matcher(line).matches();
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        int p = params.size();
        double[][] cols = new double[4][p];
        for (int j = 0; j < p; j++) {
            for (int c = 0; c < 4; c++) {
                cols[c][j] = params.get(j)[c];
            }
        }
        double[] x = points.stream().mapToDouble(q -> q[0]).toArray();
        double[] y = points.stream().mapToDouble(q -> q[1]).toArray();
        return new Dataset(name, x, y, cols[0], cols[1], cols[2], cols[3], rss);
    }

    /** The value and gradient of one NIST model at one x. */
    interface Curve {
        double value(double[] b, double x, double[] gradient);
    }

    /** A NIST model over the file's x values, every parameter on the linear scale, analytic Jacobian. */
    static final class NistModel implements FitModel {
        private final Dataset set;
        private final Curve curve;
        private final boolean analytic;

        NistModel(Dataset set, Curve curve, boolean analytic) {
            this.set = set;
            this.curve = curve;
            this.analytic = analytic;
        }

        @Override
        public String name() {
            return set.name();
        }

        @Override
        public List<ParameterSpec> parameters() {
            List<ParameterSpec> s = new ArrayList<>();
            for (int j = 0; j < set.certified().length; j++) {
                s.add(ParameterSpec.linear("b" + (j + 1), Unit.DIMENSIONLESS));
            }
            return s;
        }

        @Override
        public int size() {
            return set.x().length;
        }

        @Override
        public boolean hasJacobian() {
            return analytic;
        }

        @Override
        public void evaluate(double[] b, double[] values, double[] jac) {
            int p = b.length;
            double[] grad = new double[p];
            for (int i = 0; i < values.length; i++) {
                values[i] = curve.value(b, set.x()[i], grad);
                if (jac != null) {
                    System.arraycopy(grad, 0, jac, i * p, p);
                }
            }
        }
    }

    /** (b1 + b2 x + ... ) / (1 + b_{m+1} x + ...), numerator of degree m - 1 and denominator of degree d. */
    static Curve rational(int numeratorTerms, int denominatorTerms) {
        return (b, x, g) -> {
            double num = 0;
            double pow = 1;
            for (int j = 0; j < numeratorTerms; j++) {
                num += b[j] * pow;
                pow *= x;
            }
            double den = 1;
            pow = x;
            for (int j = 0; j < denominatorTerms; j++) {
                den += b[numeratorTerms + j] * pow;
                pow *= x;
            }
            pow = 1;
            for (int j = 0; j < numeratorTerms; j++) {
                g[j] = pow / den;
                pow *= x;
            }
            pow = x;
            for (int j = 0; j < denominatorTerms; j++) {
                g[numeratorTerms + j] = -num * pow / (den * den);
                pow *= x;
            }
            return num / den;
        };
    }

    /** MGH17: b1 + b2 exp(-x b4) + b3 exp(-x b5). */
    static final Curve MGH17 = (b, x, g) -> {
        double e4 = Math.exp(-x * b[3]);
        double e5 = Math.exp(-x * b[4]);
        g[0] = 1;
        g[1] = e4;
        g[2] = e5;
        g[3] = -x * b[1] * e4;
        g[4] = -x * b[2] * e5;
        return b[0] + b[1] * e4 + b[2] * e5;
    };

    /** Lanczos1: b1 exp(-b2 x) + b3 exp(-b4 x) + b5 exp(-b6 x). */
    static final Curve LANCZOS = (b, x, g) -> {
        double sum = 0;
        for (int j = 0; j < 6; j += 2) {
            double e = Math.exp(-b[j + 1] * x);
            g[j] = e;
            g[j + 1] = -x * b[j] * e;
            sum += b[j] * e;
        }
        return sum;
    };

    private static FitResult fit(Dataset set, Curve curve, boolean analytic, double[] start) {
        ModelFit.Options options = ModelFit.Options.defaults().withProfiles(false).withTolerance(1e-14)
                .withMaxEvaluations(5000);
        return ModelFit.fit(new NistModel(set, curve, analytic), FitData.unweighted(set.y()), List.of(start),
                options, Progress.NONE);
    }

    /**
     * Asserts the certified parameters and standard deviations to the given relative tolerances and the certified
     * RSS to rssTolerance.
     */
    private static void assertCertified(Dataset set, FitResult fit, String start, double valueTol, double sdTol,
                                        double rssTol) {
        String what = set.name() + " from " + start;
        assertTrue(fit.converged(), what + ": " + fit.reason());
        for (int j = 0; j < set.certified().length; j++) {
            ParameterEstimate e = fit.parameters().get(j);
            // REF: NIST StRD certified values, data file as shipped in commons-math3 3.6.1 tests jar
            assertEquals(set.certified()[j], e.value(), valueTol * Math.abs(set.certified()[j]),
                    what + ": b" + (j + 1));
            // REF: NIST StRD certified standard deviations s (J^T J)^-1/2, same file [published]; sheet s8.2, s8.4
            assertEquals(set.certifiedSd()[j], e.standardError(), sdTol * set.certifiedSd()[j],
                    what + ": standard deviation of b" + (j + 1));
        }
        // REF: NIST StRD certified residual sum of squares, same file
        assertEquals(set.certifiedRss(), fit.chiSquare(), rssTol * set.certifiedRss(), what + ": RSS");
    }

    @Test
    void kirby2FromBothStarts() {
        // REF: NIST StRD Kirby2 (certified values), data file as shipped in commons-math3 3.6.1 tests jar
        Dataset set = read("Kirby2");
        assertEquals(151, set.x().length, "Kirby2 observations");
        assertCertified(set, fit(set, rational(3, 2), true, set.start1()), "start 1", 1e-8, 1e-8, 1e-10);
        assertCertified(set, fit(set, rational(3, 2), true, set.start2()), "start 2", 1e-8, 1e-8, 1e-10);
    }

    @Test
    void hahn1FromBothStarts() {
        // REF: NIST StRD Hahn1 (certified values), data file as shipped in commons-math3 3.6.1 tests jar
        Dataset set = read("Hahn1");
        assertEquals(236, set.x().length, "Hahn1 observations");
        assertCertified(set, fit(set, rational(4, 3), true, set.start1()), "start 1", 1e-7, 1e-8, 1e-10);
        assertCertified(set, fit(set, rational(4, 3), true, set.start2()), "start 2", 1e-7, 1e-8, 1e-10);
    }

    @Test
    void mgh17FromStartTwo() {
        // REF: NIST StRD MGH17 (certified values), data file as shipped in commons-math3 3.6.1 tests jar
        Dataset set = read("MGH17");
        assertEquals(33, set.x().length, "MGH17 observations");
        FitResult fit = fit(set, MGH17, true, set.start2());
        assertCertified(set, fit, "start 2", 1e-9, 1e-8, 1e-10);
        // REF: derived check value, 95% CI of b4 [published: NIST StRD + t(0.975, 28)]; sheet s8.4
        ParameterEstimate b4 = fit.parameters().get(3);
        assertEquals(0.01194859, b4.ci95().lower(), 1e-7, "MGH17 b4 CI lower");
        assertEquals(0.01378648, b4.ci95().upper(), 1e-7, "MGH17 b4 CI upper");
        // REF: AIC/AICc/BIC with K = p + 1 = 6 at the certified RSS, n = 33 [common practice: sheet s8.3]; sheet s8.4
        assertEquals(-427.2659, fit.aic(), 1e-3, "AIC");
        assertEquals(-424.0351, fit.aicc(), 1e-3, "AICc");
        assertEquals(-418.2869, fit.bic(), 1e-3, "BIC");
    }

    @Test
    void mgh17FromStartOne() {
        // Start 1 (b = 50, 150, -100, 1, 2) is far from the solution (both exponentials die within one sample) and
        // is known to defeat some good optimisers; Commons Math's Levenberg-Marquardt on the linear scale reaches
        // the certified fit from it (in about 1500 evaluations, against 61 from start 2).
        // REF: NIST StRD MGH17 (certified values), data file as shipped in commons-math3 3.6.1 tests jar
        Dataset set = read("MGH17");
        assertCertified(set, fit(set, MGH17, true, set.start1()), "start 1", 1e-9, 1e-8, 1e-10);
    }

    @Test
    void mgh17WithFiniteDifferenceJacobianAgrees() {
        // REF: NIST StRD MGH17 (certified values), data file as shipped in commons-math3 3.6.1 tests jar
        Dataset set = read("MGH17");
        FitResult fit = fit(set, MGH17, false, set.start2());
        // Forward differences lose about half the digits of the Jacobian, hence 1e-5 on values and 1e-4 on the SDs.
        assertCertified(set, fit, "start 2, finite differences", 1e-5, 1e-4, 1e-10);
    }

    @Test
    void lanczos1FromBothStarts() {
        // The data are exact to 13 digits (RSS 1.4e-25, residuals at the rounding level of y): the parameters are
        // reached to about 3e-11, but RSS, and with it the standard deviations (which scale with sqrt(RSS)), only to
        // about 1e-3, the accuracy with which double precision can sum residuals of 1e-13 on values of order 1.
        // REF: NIST StRD Lanczos1 (certified values), data file as shipped in commons-math3 3.6.1 tests jar
        Dataset set = read("Lanczos1");
        assertEquals(24, set.x().length, "Lanczos1 observations");
        assertCertified(set, fit(set, LANCZOS, true, set.start1()), "start 1", 1e-9, 5e-3, 5e-3);
        assertCertified(set, fit(set, LANCZOS, true, set.start2()), "start 2", 1e-9, 5e-3, 5e-3);
    }
}
