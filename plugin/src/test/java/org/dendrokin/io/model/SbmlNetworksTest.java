package org.dendrokin.io.model;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;

import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.MasterEquation;
import org.dendrokin.core.model.NetworkRun;
import org.dendrokin.core.model.ReactionNetwork;
import org.dendrokin.core.model.SolverSettings;
import org.dendrokin.io.InputException;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class SbmlNetworksTest {
    private static final String HEAD = """
            <?xml version="1.0" encoding="UTF-8"?>
            <sbml xmlns="http://www.sbml.org/sbml/level3/version1/core" level="3" version="1">
              <model id="m">
                <listOfCompartments>
                  <compartment id="cell" size="%s" constant="true" spatialDimensions="3"/>
                </listOfCompartments>
            """;
    private static final String MATH = "xmlns=\"http://www.w3.org/1998/Math/MathML\"";

    private static String species(String id, double initial) {
        return "<species id=\"" + id + "\" compartment=\"cell\" initialConcentration=\"" + initial
                + "\" hasOnlySubstanceUnits=\"false\" boundaryCondition=\"false\" constant=\"false\"/>";
    }

    /** A <-> B, kinetic law cell * (kf A - kr B) (amount per time, as SBML defines it). */
    static String reversible(double kf, double kr, double size) {
        return HEAD.formatted(size) + "<listOfSpecies>" + species("A", 1) + species("B", 0) + "</listOfSpecies>"
                + "<listOfParameters><parameter id=\"kf\" value=\"" + kf + "\" constant=\"true\"/>"
                + "<parameter id=\"kr\" value=\"" + kr + "\" constant=\"true\"/></listOfParameters>"
                + "<listOfReactions><reaction id=\"flip\" reversible=\"true\">"
                + "<listOfReactants>"
                + "<speciesReference species=\"A\" stoichiometry=\"1\" constant=\"true\"/></listOfReactants>"
                + "<listOfProducts>"
                + "<speciesReference species=\"B\" stoichiometry=\"1\" constant=\"true\"/></listOfProducts>"
                + "<kineticLaw><math " + MATH + "><apply><times/><ci>cell</ci><apply><minus/>"
                + "<apply><times/><ci>kf</ci><ci>A</ci></apply><apply><times/><ci>kr</ci><ci>B</ci></apply>"
                + "</apply></apply></math></kineticLaw></reaction></listOfReactions></model></sbml>";
    }

    /** S -> P with vmax S / (Km + S), local parameters. */
    static String michaelisMenten(double vmax, double km, double s0) {
        return HEAD.formatted(1) + "<listOfSpecies>" + species("S", s0) + species("P", 0) + "</listOfSpecies>"
                + "<listOfReactions><reaction id=\"enzyme\" reversible=\"false\">"
                + "<listOfReactants>"
                + "<speciesReference species=\"S\" stoichiometry=\"1\" constant=\"true\"/></listOfReactants>"
                + "<listOfProducts>"
                + "<speciesReference species=\"P\" stoichiometry=\"1\" constant=\"true\"/></listOfProducts>"
                + "<kineticLaw><math " + MATH + "><apply><divide/><apply><times/><ci>vmax</ci><ci>S</ci></apply>"
                + "<apply><plus/><ci>Km</ci><ci>S</ci></apply></apply></math>"
                + "<listOfLocalParameters><localParameter id=\"vmax\" value=\"" + vmax + "\"/>"
                + "<localParameter id=\"Km\" value=\"" + km + "\"/></listOfLocalParameters>"
                + "</kineticLaw></reaction></listOfReactions></model></sbml>";
    }

    /** 2A -> 0 with the kinetic law {@code law} (MathML content), parameter k, in a compartment of the given size. */
    static String dimerisation(double k, double a0, double size, String law) {
        return HEAD.formatted(size) + "<listOfSpecies>" + species("A", a0) + "</listOfSpecies>"
                + "<listOfParameters><parameter id=\"k\" value=\"" + k + "\" constant=\"true\"/></listOfParameters>"
                + "<listOfReactions><reaction id=\"pairing\" reversible=\"false\">"
                + "<listOfReactants>"
                + "<speciesReference species=\"A\" stoichiometry=\"2\" constant=\"true\"/></listOfReactants>"
                + "<kineticLaw><math " + MATH + ">" + law + "</math></kineticLaw></reaction></listOfReactions>"
                + "</model></sbml>";
    }

    private static double[][] wellMixed(ReactionNetwork net, double[] times) {
        Domain domain = new Domain(2, 0.5, Boundary.NO_FLUX);
        NetworkRun run = NetworkRun.prepare(net, domain, times, new double[] {1.0}, List.of(),
                SolverSettings.DEFAULT.withFixedStepS(1e-3), net.species().get(0));
        double[][] out = new double[net.speciesCount()][times.length];
        run.solve(out);
        return out;
    }

    @Test
    void reversibleConversionMatchesItsExponentialApproach(@TempDir Path dir) throws Exception {
        Path file = dir.resolve("flip.xml");
        // a compartment of size 2: the law's "cell *" and the division by the size cancel
        Files.writeString(file, reversible(2, 1, 2));
        ReactionNetwork net = SbmlNetworks.read(file, Map.of("A", 1.0, "B", 0.5), dir.resolve("model.json"));
        double[] times = {0, 0.25, 0.5, 1, 2};
        double[][] out = wellMixed(net, times);
        for (int f = 0; f < times.length; f++) {
            double exact = 1.0 / 3 + 2.0 / 3 * Math.exp(-3 * times[f]);
            // REF: first-order reversible A <-> B: A = A_eq + (A0 - A_eq) exp(-(kf + kr) t) [published: standard
            // linear kinetics, e.g. any physical chemistry text]
            assertEquals(exact, out[0][f], 1e-6, "A at t = " + times[f] + " s");
            assertEquals(1 - exact, out[1][f], 1e-6, "B at t = " + times[f] + " s");
        }
        assertTrue(Files.notExists(dir.resolve("jsbml.log")) && Files.notExists(Path.of("jsbml.log")), "no jsbml.log");
    }

    @Test
    void michaelisMentenMatchesTheImplicitClosedForm(@TempDir Path dir) throws Exception {
        Path file = dir.resolve("mm.xml");
        double vmax = 1;
        double km = 0.5;
        double s0 = 2;
        Files.writeString(file, michaelisMenten(vmax, km, s0));
        ReactionNetwork net = SbmlNetworks.read(file, Map.of("S", 0.0, "P", 0.0), dir.resolve("model.json"));
        double[] times = {0.5, 1, 2, 3};
        double[][] out = wellMixed(net, times);
        for (int f = 0; f < times.length; f++) {
            // REF: integrated Michaelis-Menten equation S + Km ln S = S0 + Km ln S0 - vmax t (Schnell & Mendoza 1997,
            // closed form via Lambert W) [published: from memory; fairly sure]; solved here by bisection
            double target = s0 + km * Math.log(s0) - vmax * times[f];
            double lo = 1e-12;
            double hi = s0;
            for (int it = 0; it < 200; it++) {
                double mid = 0.5 * (lo + hi);
                if (mid + km * Math.log(mid) > target) {
                    hi = mid;
                } else {
                    lo = mid;
                }
            }
            assertEquals(0.5 * (lo + hi), out[0][f], 1e-6, "S at t = " + times[f] + " s");
            assertEquals(s0 - 0.5 * (lo + hi), out[1][f], 1e-6, "P at t = " + times[f] + " s");
        }
    }

    @Test
    void massActionLawsAreRecognisedAndOtherLawsAreNot() throws Exception {
        List<String> ids = List.of("A", "B");
        Map<String, Double> values = Map.of("k", 0.5, "Km", 2.0, "cell", 3.0);
        SbmlNetworks.Monomial square = SbmlNetworks.monomial(Formulas.parse("k*A*A"), ids, values);
        assertArrayEquals(new double[] {2, 0}, square.orders(), "orders of k*A*A");
        assertEquals(0.5, square.constant(), 0, "constant of k*A*A");
        SbmlNetworks.Monomial power = SbmlNetworks.monomial(Formulas.parse("k*A^2"), ids, values);
        assertArrayEquals(new double[] {2, 0}, power.orders(), "orders of k*A^2");
        SbmlNetworks.Monomial pair = SbmlNetworks.monomial(Formulas.parse("cell*k*A*B"), ids, values);
        assertArrayEquals(new double[] {1, 1}, pair.orders(), "orders of cell*k*A*B");
        assertEquals(1.5, pair.constant(), 1e-15, "constant of cell*k*A*B");
        assertNull(SbmlNetworks.monomial(Formulas.parse("k*A/(Km+A)"), ids, values), "Michaelis-Menten");
        assertNull(SbmlNetworks.monomial(Formulas.parse("k*A - k*B"), ids, values), "a difference");
        assertNull(SbmlNetworks.monomial(Formulas.parse("k*A^0.5"), ids, values), "a fractional order");
        assertNull(SbmlNetworks.monomial(Formulas.parse("k/A"), ids, values), "a species in the denominator");
    }

    @Test
    void massActionFromSbmlCountsMoleculePairsInTheStochasticMode(@TempDir Path dir) throws Exception {
        double k = 0.01;
        int n0 = 10;
        String[] laws = {
            // cell * k * A * A: the compartment factor and the division by its size cancel
            "<apply><times/><ci>cell</ci><ci>k</ci><ci>A</ci><ci>A</ci></apply>",
            // k * A^2 in a compartment of size 1
            "<apply><times/><ci>k</ci><apply><power/><ci>A</ci><cn type=\"integer\">2</cn></apply></apply>"};
        double[] sizes = {2, 1};
        double[] times = {1, 3, 6, 12, 25, 50};
        int states = n0 / 2 + 1;
        double[] pairs = new double[states];
        double[] count = new double[states];
        for (int j = 0; j < states; j++) {
            int n = n0 - 2 * j;
            count[j] = n;
            // one molecule per concentration unit in a 1 um^3 voxel: omega = 1, propensity k n (n - 1)
            pairs[j] = k * n * (n - 1);
        }
        // REF: Gillespie 1977, propensity c n (n - 1) / 2 with c = 2 k / omega for 2A -> [published];
        // mean from the chemical master equation integrated with Commons Math DormandPrince853 [common practice]
        double[][] exact = MasterEquation.chain(pairs, count, times);
        for (int l = 0; l < laws.length; l++) {
            Path file = dir.resolve("pairing" + l + ".xml");
            Files.writeString(file, dimerisation(k, n0, sizes[l], laws[l]));
            ReactionNetwork net = SbmlNetworks.read(file, Map.of("A", 0.0), dir.resolve("model.json"));
            assertArrayEquals(new double[] {-2}, net.reactions().get(0).netStoichiometry(), 0,
                    "whole stoichiometry of " + file.getFileName());
            MasterEquation.assertMeanMatches(net, "A", times, exact, "mean count of A under 2A -> 0 from SBML " + l);
            double[][] det = wellMixed(net, times);
            for (int f = 0; f < times.length; f++) {
                // REF: second-order decay d[A]/dt = -2 k [A]^2 has [A] = A0 / (1 + 2 k A0 t) [common practice]
                assertEquals(n0 / (1 + 2 * k * n0 * times[f]), det[0][f], 1e-6, "deterministic A at t = " + times[f]);
            }
        }
    }

    @Test
    void otherLawsInOneCompartmentAlsoKeepWholeStoichiometries(@TempDir Path dir) throws Exception {
        // the rate then carries the division by the compartment size (A <-> B in a compartment of size 2 above
        // checks the values)
        Path file = dir.resolve("saturating.xml");
        Files.writeString(file, dimerisation(0.01, 10, 2, "<apply><divide/><apply><times/><ci>k</ci><ci>A</ci></apply>"
                + "<apply><plus/><cn>1</cn><ci>A</ci></apply></apply>"));
        ReactionNetwork net = SbmlNetworks.read(file, Map.of("A", 0.0), dir.resolve("model.json"));
        assertArrayEquals(new double[] {-2}, net.reactions().get(0).netStoichiometry(), 0,
                "stoichiometry of 2A -> 0 under a saturating law");
    }

    @Test
    void unsupportedConstructsAreNamed(@TempDir Path dir) throws Exception {
        Path file = dir.resolve("rule.xml");
        String withRule = reversible(1, 1, 1).replace("<listOfReactions>",
                "<listOfRules><algebraicRule><math " + MATH + "><apply><minus/><ci>A</ci><ci>B</ci></apply></math>"
                        + "</algebraicRule></listOfRules><listOfReactions>");
        Files.writeString(file, withRule);
        InputException e = assertThrows(InputException.class,
                () -> SbmlNetworks.read(file, Map.of("A", 1.0, "B", 1.0), dir.resolve("m.json")));
        assertTrue(e.getMessage().contains("algebraic rule") && e.getMessage().contains("rule.xml"), e.getMessage());
        Path delay = dir.resolve("delay.xml");
        Files.writeString(delay, reversible(1, 1, 1).replace("<ci>kf</ci><ci>A</ci>",
                "<ci>kf</ci><apply><csymbol encoding=\"text\" definitionURL=\"http://www.sbml.org/sbml/symbols/delay\">"
                        + "delay</csymbol><ci>A</ci><cn>1</cn></apply>"));
        InputException d = assertThrows(InputException.class,
                () -> SbmlNetworks.read(delay, Map.of("A", 1.0, "B", 1.0), dir.resolve("m.json")));
        assertTrue(d.getMessage().contains("delay") && d.getMessage().contains("flip"), d.getMessage());
        Path ok = dir.resolve("ok.xml");
        Files.writeString(ok, reversible(1, 1, 1));
        InputException missing = assertThrows(InputException.class,
                () -> SbmlNetworks.read(ok, Map.of("A", 1.0), dir.resolve("m.json")));
        assertTrue(missing.getMessage().contains("m.json") && missing.getMessage().contains("species B"),
                missing.getMessage());
    }
}
