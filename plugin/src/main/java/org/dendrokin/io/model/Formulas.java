package org.dendrokin.io.model;

import java.util.List;
import java.util.Map;

import org.dendrokin.core.model.Expression;
import org.sbml.jsbml.ASTNode;
import org.sbml.jsbml.text.parser.ParseException;

/**
 * Turns JSBML math trees (from SBML kinetic laws, or parsed from the infix rate strings of our network
 * JSON by JSBML's formula parser) into core {@link Expression}s. Names resolve to species (their
 * concentration) or to numeric values (parameters, compartment sizes). Anything beyond arithmetic, powers,
 * exp and ln is refused with the name of the construct, never evaluated wrongly.
 */
final class Formulas {
    private Formulas() {
    }

    /** Thrown with a plain description of what cannot be used; callers add the file and the element. */
    static final class Unsupported extends Exception {
        Unsupported(String message) {
            super(message);
        }
    }

    static ASTNode parse(String formula) throws Unsupported {
        try {
            return ASTNode.parseFormula(formula);
        } catch (ParseException | RuntimeException e) {
            throw new Unsupported("the formula '" + formula + "' cannot be read");
        }
    }

    /**
     * @param node    the math tree
     * @param species species names, in network order
     * @param values  numeric values of parameters and compartments by name
     */
    static Expression translate(ASTNode node, List<String> species, Map<String, Double> values) throws Unsupported {
        ASTNode.Type type = node.getType();
        int count = node.getChildCount();
        switch (type) {
            case INTEGER:
                return Expression.constant(node.getInteger());
            case REAL:
            case REAL_E:
            case RATIONAL:
                return Expression.constant(node.getReal());
            case CONSTANT_E:
                return Expression.constant(Math.E);
            case CONSTANT_PI:
                return Expression.constant(Math.PI);
            case NAME: {
                String name = node.getName();
                int s = species.indexOf(name);
                if (s >= 0) {
                    return Expression.species(s);
                }
                Double v = values.get(name);
                if (v == null) {
                    throw new Unsupported("the name '" + name + "' is neither a species nor a parameter");
                }
                return Expression.constant(v);
            }
            case PLUS: {
                Expression e = Expression.constant(0);
                for (int i = 0; i < count; i++) {
                    e = Expression.add(e, translate(node.getChild(i), species, values));
                }
                return e;
            }
            case TIMES: {
                Expression e = Expression.constant(1);
                for (int i = 0; i < count; i++) {
                    e = Expression.multiply(e, translate(node.getChild(i), species, values));
                }
                return e;
            }
            case MINUS: {
                if (count == 1) {
                    return Expression.negate(translate(node.getChild(0), species, values));
                }
                Expression e = translate(node.getChild(0), species, values);
                for (int i = 1; i < count; i++) {
                    e = Expression.subtract(e, translate(node.getChild(i), species, values));
                }
                return e;
            }
            case DIVIDE:
                return Expression.divide(translate(node.getChild(0), species, values),
                        translate(node.getChild(1), species, values));
            case POWER:
            case FUNCTION_POWER:
                return Expression.power(translate(node.getChild(0), species, values),
                        translate(node.getChild(1), species, values));
            case FUNCTION_EXP:
                return Expression.exp(translate(node.getChild(0), species, values));
            case FUNCTION_LN:
                return Expression.log(translate(node.getChild(0), species, values));
            case FUNCTION_ROOT: {
                if (count == 1) {
                    return Expression.power(translate(node.getChild(0), species, values), Expression.constant(0.5));
                }
                Expression degree = translate(node.getChild(0), species, values);
                return Expression.power(translate(node.getChild(1), species, values),
                        Expression.divide(Expression.constant(1), degree));
            }
            case FUNCTION_DELAY:
                throw new Unsupported("delays (the delay function) are not supported");
            case NAME_TIME:
                throw new Unsupported("rates that depend on the time symbol are not supported");
            case FUNCTION:
                throw new Unsupported("function definitions (" + node.getName() + ") are not supported");
            case FUNCTION_PIECEWISE:
                throw new Unsupported("piecewise expressions are not supported");
            default:
                throw new Unsupported("the math construct " + type + " is not supported");
        }
    }
}
