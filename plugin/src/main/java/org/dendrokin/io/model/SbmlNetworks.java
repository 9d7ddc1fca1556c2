package org.dendrokin.io.model;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import javax.xml.stream.XMLStreamException;

import org.dendrokin.core.model.Expression;
import org.dendrokin.core.model.ReactionNetwork;
import org.dendrokin.io.InputException;
import org.sbml.jsbml.ASTNode;
import org.sbml.jsbml.Compartment;
import org.sbml.jsbml.KineticLaw;
import org.sbml.jsbml.LocalParameter;
import org.sbml.jsbml.Model;
import org.sbml.jsbml.ModifierSpeciesReference;
import org.sbml.jsbml.Parameter;
import org.sbml.jsbml.Reaction;
import org.sbml.jsbml.Rule;
import org.sbml.jsbml.SBMLDocument;
import org.sbml.jsbml.SBMLReader;
import org.sbml.jsbml.Species;
import org.sbml.jsbml.SpeciesReference;

/**
 * Reads an SBML model (through JSBML) into a {@link ReactionNetwork}: compartments (their sizes), species
 * (initial concentration, or initial amount / compartment size), global and local parameters, reactions
 * with stoichiometries and kinetic laws. The rate of change of a species is sum(stoichiometry x kinetic
 * law) / size of its compartment, as SBML defines it (kinetic laws give substance per time). Diffusion
 * coefficients do not exist in SBML: they come from the model JSON, one per species.
 * <p>
 * Refused, with the element named: events, rules of any kind, initial assignments, constraints, function
 * definitions, delays, piecewise and time-dependent math, species with only substance units, reactions
 * without a kinetic law. Boundary-condition and constant species keep their value (no reaction changes
 * them), as SBML says.
 */
public final class SbmlNetworks {
    private SbmlNetworks() {
    }

    /**
     * @param file      the SBML file
     * @param diffusion D (um^2/s) for every species, by id
     * @param jsonFile  the model JSON that named the SBML file (for messages about diffusion keys)
     */
    public static ReactionNetwork read(Path file, Map<String, Double> diffusion, Path jsonFile) {
        SBMLDocument doc;
        try {
            doc = new SBMLReader().readSBML(file.toFile());
        } catch (IOException | XMLStreamException | RuntimeException e) {
            throw new InputException(file, "cannot be read as SBML (" + e.getMessage() + ")", e);
        }
        Model model = doc.getModel();
        if (model == null) {
            throw new InputException(file, "the SBML document has no model element");
        }
        refuse(file, model.getNumEvents(), "event", model.getNumEvents() > 0 ? model.getEvent(0).getId() : "");
        if (model.getNumRules() > 0) {
            Rule rule = model.getRule(0);
            String kind = rule.isAlgebraic() ? "algebraic rule" : rule.isRate() ? "rate rule" : "assignment rule";
            throw new InputException(file, "the model has an " + kind + " (" + rule.getElementName()
                    + "), which Dendrokin does not support; only reactions with kinetic laws are simulated");
        }
        refuse(file, model.getNumInitialAssignments(), "initialAssignment", "");
        refuse(file, model.getNumConstraints(), "constraint", "");
        refuse(file, model.getNumFunctionDefinitions(), "functionDefinition",
                model.getNumFunctionDefinitions() > 0 ? model.getFunctionDefinition(0).getId() : "");
        Map<String, Double> values = new HashMap<>();
        for (Compartment c : model.getListOfCompartments()) {
            values.put(c.getId(), c.isSetSize() ? c.getSize() : 1.0);
        }
        for (Parameter p : model.getListOfParameters()) {
            if (!p.isSetValue()) {
                throw new InputException(file, "parameter " + p.getId() + " has no value");
            }
            values.put(p.getId(), p.getValue());
        }
        List<String> ids = new ArrayList<>();
        List<Double> initial = new ArrayList<>();
        List<Double> compartmentSize = new ArrayList<>();
        List<Boolean> fixed = new ArrayList<>();
        for (Species s : model.getListOfSpecies()) {
            if (s.isSetHasOnlySubstanceUnits() && s.getHasOnlySubstanceUnits()) {
                throw new InputException(file, "species " + s.getId() + " has hasOnlySubstanceUnits=true, which is"
                        + " not supported; give species as concentrations");
            }
            double size = values.getOrDefault(s.getCompartment(), 1.0);
            double init;
            if (s.isSetInitialConcentration()) {
                init = s.getInitialConcentration();
            } else if (s.isSetInitialAmount()) {
                init = s.getInitialAmount() / size;
            } else {
                throw new InputException(file, "species " + s.getId() + " has no initial concentration or amount");
            }
            ids.add(s.getId());
            initial.add(init);
            compartmentSize.add(size);
            fixed.add(s.getBoundaryCondition() || s.getConstant());
        }
        if (ids.isEmpty()) {
            throw new InputException(file, "the model has no species");
        }
        double[] d = new double[ids.size()];
        for (int i = 0; i < ids.size(); i++) {
            Double v = diffusion.get(ids.get(i));
            if (v == null) {
                throw new InputException(jsonFile, "sbml.diffusion_um2_per_s has no diffusion coefficient for species "
                        + ids.get(i) + " of " + file.getFileName() + " (give 0 for an immobile species)");
            }
            if (!(v >= 0) || !Double.isFinite(v)) {
                throw new InputException(jsonFile, "sbml.diffusion_um2_per_s." + ids.get(i)
                        + " must be zero or positive, got " + v);
            }
            d[i] = v;
        }
        for (String key : diffusion.keySet()) {
            if (!ids.contains(key)) {
                throw new InputException(jsonFile, "sbml.diffusion_um2_per_s names species " + key + ", which "
                        + file.getFileName() + " does not define");
            }
        }
        List<ReactionNetwork.Reaction> reactions = new ArrayList<>();
        for (Reaction r : model.getListOfReactions()) {
            KineticLaw law = r.getKineticLaw();
            if (law == null || !law.isSetMath()) {
                throw new InputException(file, "reaction " + r.getId() + " has no kinetic law");
            }
            Map<String, Double> local = new LinkedHashMap<>(values);
            for (LocalParameter p : law.getListOfLocalParameters()) {
                local.put(p.getId(), p.getValue());
            }
            Expression rate;
            try {
                rate = Formulas.translate(law.getMath(), ids, local);
            } catch (Formulas.Unsupported e) {
                throw new InputException(file, "reaction " + r.getId() + ": " + e.getMessage());
            }
            double[] net = new double[ids.size()];
            double[] reactantOrders = new double[ids.size()];
            for (SpeciesReference sr : r.getListOfReactants()) {
                add(file, r, net, ids, sr.getSpecies(), -stoich(sr));
                add(file, r, reactantOrders, ids, sr.getSpecies(), stoich(sr));
            }
            for (SpeciesReference sr : r.getListOfProducts()) {
                add(file, r, net, ids, sr.getSpecies(), stoich(sr));
            }
            for (ModifierSpeciesReference mr : r.getListOfModifiers()) {
                if (!ids.contains(mr.getSpecies())) {
                    throw new InputException(file, "reaction " + r.getId() + " names unknown modifier "
                            + mr.getSpecies());
                }
            }
            double scale = rateScale(rate, ids.size(), initial);
            Monomial product = monomial(law.getMath(), ids, local);
            double size = sharedSize(net, fixed, compartmentSize);
            if (product != null && sameOrders(product.orders(), reactantOrders) && !Double.isNaN(size)) {
                // Plain mass action in one compartment: d[S]/dt = stoichiometry x (constant / size) x product of
                // the concentrations, built as a mass-action law so the stochastic mode counts molecule
                // combinations, with whole stoichiometries (the compartment size moves into the constant).
                for (int s = 0; s < net.length; s++) {
                    net[s] = fixed.get(s) ? 0 : net[s];
                }
                rate = ReactionNetwork.massAction(reactantOrders, new double[ids.size()], product.constant() / size,
                        0);
            } else if (!Double.isNaN(size)) {
                // one compartment: the division by its size moves into the rate, so stoichiometries stay whole
                // molecule changes for the stochastic mode
                for (int s = 0; s < net.length; s++) {
                    net[s] = fixed.get(s) ? 0 : net[s];
                }
                if (size != 1) {
                    rate = Expression.multiply(Expression.constant(1 / size), rate);
                }
            } else {
                for (int s = 0; s < net.length; s++) {
                    // d[S]/dt = stoichiometry x rate / compartment size; boundary and constant species do not change
                    net[s] = fixed.get(s) ? 0 : net[s] / compartmentSize.get(s);
                }
            }
            reactions.add(new ReactionNetwork.Reaction(r.getId(), net, rate, scale));
        }
        return new ReactionNetwork(ids, d, initial.stream().mapToDouble(Double::doubleValue).toArray(), reactions);
    }

    /** A kinetic law of the form constant x prod_s [S]^order_s. */
    record Monomial(double constant, double[] orders) {
    }

    /**
     * The kinetic law as constant x product of species powers, when it is one: a product (or quotient by
     * constants) of numbers, parameters, compartment sizes and species raised to whole positive powers, with a
     * non-negative finite constant. Anything else (sums, Michaelis-Menten, species in a denominator, fractional
     * powers, functions) gives null.
     */
    static Monomial monomial(ASTNode node, List<String> species, Map<String, Double> values) {
        double[] orders = new double[species.size()];
        double constant = factor(node, species, values, orders, 1);
        if (!(constant >= 0) || !Double.isFinite(constant)) {
            return null;
        }
        for (double o : orders) {
            if (o < 0 || o != Math.rint(o)) {
                return null;
            }
        }
        return new Monomial(constant, orders);
    }

    /**
     * Multiplies the orders of {@code node}'s species, raised to {@code power}, into {@code orders} and returns
     * its constant part raised to {@code power}; NaN when the node is not such a product.
     */
    private static double factor(ASTNode node, List<String> species, Map<String, Double> values, double[] orders,
            double power) {
        switch (node.getType()) {
            case INTEGER:
                return Math.pow(node.getInteger(), power);
            case REAL:
            case REAL_E:
            case RATIONAL:
                return Math.pow(node.getReal(), power);
            case NAME: {
                int s = species.indexOf(node.getName());
                if (s >= 0) {
                    orders[s] += power;
                    return 1;
                }
                Double v = values.get(node.getName());
                return v == null ? Double.NaN : Math.pow(v, power);
            }
            case TIMES: {
                double c = 1;
                for (int i = 0; i < node.getChildCount(); i++) {
                    c *= factor(node.getChild(i), species, values, orders, power);
                }
                return c;
            }
            case DIVIDE:
                return factor(node.getChild(0), species, values, orders, power)
                        * factor(node.getChild(1), species, values, orders, -power);
            case POWER:
            case FUNCTION_POWER: {
                ASTNode exponent = node.getChild(1);
                double e;
                if (exponent.getType() == ASTNode.Type.INTEGER) {
                    e = exponent.getInteger();
                } else if (exponent.isReal()) {
                    e = exponent.getReal();
                } else {
                    return Double.NaN;
                }
                return factor(node.getChild(0), species, values, orders, power * e);
            }
            default:
                return Double.NaN;
        }
    }

    private static boolean sameOrders(double[] a, double[] b) {
        for (int s = 0; s < a.length; s++) {
            if (a[s] != b[s]) {
                return false;
            }
        }
        return true;
    }

    /**
     * The compartment size shared by every species the reaction changes (1 when it changes none), or NaN when
     * they sit in compartments of different sizes.
     */
    private static double sharedSize(double[] net, List<Boolean> fixed, List<Double> compartmentSize) {
        double size = Double.NaN;
        for (int s = 0; s < net.length; s++) {
            if (net[s] != 0 && !fixed.get(s)) {
                if (Double.isNaN(size)) {
                    size = compartmentSize.get(s);
                } else if (size != compartmentSize.get(s)) {
                    return Double.NaN;
                }
            }
        }
        return Double.isNaN(size) ? 1 : size;
    }

    private static void refuse(Path file, int count, String element, String id) {
        if (count > 0) {
            throw new InputException(file, "the model has " + count + " " + element + " element(s)"
                    + (id == null || id.isEmpty() ? "" : " (first: " + id + ")")
                    + ", which Dendrokin does not support; only reactions with kinetic laws are simulated");
        }
    }

    private static double stoich(SpeciesReference sr) {
        return sr.isSetStoichiometry() ? sr.getStoichiometry() : 1.0;
    }

    private static void add(Path file, Reaction r, double[] net, List<String> ids, String species, double amount) {
        int s = ids.indexOf(species);
        if (s < 0) {
            throw new InputException(file, "reaction " + r.getId() + " names unknown species " + species);
        }
        net[s] += amount;
    }

    /**
     * A rate scale for the step rule: the largest |d rate / d c| at the initial state and at twice it,
     * which for first-order mass action is the rate constant.
     */
    static double rateScale(Expression rate, int m, List<Double> initial) {
        double[] c = new double[m];
        double scale = 0;
        for (double factor : new double[] {1, 2}) {
            for (int s = 0; s < m; s++) {
                c[s] = Math.max(initial.get(s), 0) * factor + (factor == 2 ? 1 : 0);
            }
            for (int s = 0; s < m; s++) {
                double v = Math.abs(rate.derivative(s).value(c));
                if (Double.isFinite(v)) {
                    scale = Math.max(scale, v);
                }
            }
        }
        return scale;
    }
}
