package org.dendrokin.core.model;

/**
 * A rate expression in the concentrations of one grid node: a small immutable tree of constants, species
 * references and the operations kinetic laws use (+, -, x, /, power, exp, ln). Parameters are folded into
 * constants when a network is built. {@link #derivative} differentiates symbolically, so Jacobians are
 * exact.
 */
public abstract class Expression {
    Expression() {
    }

    /** Value at the concentrations {@code c} (one per species, in the network's order). */
    public abstract double value(double[] c);

    /** The symbolic derivative with respect to species {@code s}. */
    public abstract Expression derivative(int s);

    /** Appends this expression, in postfix order, to a flat program (see {@link Program}). */
    abstract void emit(Program.Builder b);

    /** A flat, allocation-free evaluator of this expression; faster than walking the tree. */
    Program compile() {
        Program.Builder b = new Program.Builder();
        emit(b);
        return b.build();
    }

    /** True when the expression is the constant 0. */
    boolean isZero() {
        return this instanceof Const k && k.v == 0;
    }

    boolean isConst() {
        return this instanceof Const;
    }

    public static Expression constant(double v) {
        return new Const(v);
    }

    public static Expression species(int index) {
        return new Species(index);
    }

    public static Expression add(Expression a, Expression b) {
        if (a.isZero()) {
            return b;
        }
        if (b.isZero()) {
            return a;
        }
        if (a instanceof Const x && b instanceof Const y) {
            return new Const(x.v + y.v);
        }
        return new Binary('+', a, b);
    }

    public static Expression subtract(Expression a, Expression b) {
        if (b.isZero()) {
            return a;
        }
        if (a instanceof Const x && b instanceof Const y) {
            return new Const(x.v - y.v);
        }
        return new Binary('-', a, b);
    }

    public static Expression multiply(Expression a, Expression b) {
        if (a.isZero() || b.isZero()) {
            return new Const(0);
        }
        if (a instanceof Const x && x.v == 1) {
            return b;
        }
        if (b instanceof Const y && y.v == 1) {
            return a;
        }
        if (a instanceof Const x && b instanceof Const y) {
            return new Const(x.v * y.v);
        }
        return new Binary('*', a, b);
    }

    public static Expression divide(Expression a, Expression b) {
        if (a.isZero()) {
            return new Const(0);
        }
        if (b instanceof Const y && y.v == 1) {
            return a;
        }
        if (a instanceof Const x && b instanceof Const y) {
            return new Const(x.v / y.v);
        }
        return new Binary('/', a, b);
    }

    public static Expression negate(Expression a) {
        return subtract(new Const(0), a);
    }

    /** a^b; the derivative assumes a &gt; 0 where b is not constant. */
    public static Expression power(Expression a, Expression b) {
        if (b instanceof Const y && y.v == 1) {
            return a;
        }
        if (b instanceof Const y && y.v == 0) {
            return new Const(1);
        }
        if (a instanceof Const x && b instanceof Const y) {
            return new Const(Math.pow(x.v, y.v));
        }
        return new Binary('^', a, b);
    }

    public static Expression exp(Expression a) {
        return a instanceof Const x ? new Const(Math.exp(x.v)) : new Unary('e', a);
    }

    public static Expression log(Expression a) {
        return a instanceof Const x ? new Const(Math.log(x.v)) : new Unary('l', a);
    }

    /**
     * A mass-action law kf prod c_s^(a_s) - kr prod c_s^(b_s) that remembers its constants and orders, so the
     * stochastic mode can count molecule combinations instead of raising concentrations to powers. It
     * evaluates, differentiates and compiles as the plain expression it wraps.
     */
    static final class MassAction extends Expression {
        final Expression plain;
        final double kf;
        final double kr;
        final double[] forwardOrders;
        final double[] reverseOrders;

        MassAction(Expression plain, double kf, double kr, double[] forwardOrders, double[] reverseOrders) {
            this.plain = plain;
            this.kf = kf;
            this.kr = kr;
            this.forwardOrders = forwardOrders.clone();
            this.reverseOrders = reverseOrders.clone();
        }

        /** True when every order is a whole number, so molecule combinations are defined. */
        boolean wholeOrders() {
            for (double[] orders : new double[][] {forwardOrders, reverseOrders}) {
                for (double o : orders) {
                    if (o < 0 || o != Math.rint(o)) {
                        return false;
                    }
                }
            }
            return true;
        }

        /**
         * The propensity divided by omega, in concentration per second, for counts n_s = c_s omega:
         * kf prod_s n_s (n_s - 1) ... (n_s - a_s + 1) / omega^(a_s), minus the same for the reverse term
         * (Gillespie 1977: the propensity is c_r times the number of distinct reactant combinations, n (n - 1) / 2
         * for 2A, and matching the deterministic law kf c^2 for large n gives c_r = 2 kf / omega).
         */
        double combinatorial(double[] c, double omega) {
            double forward = kf * fallingProduct(forwardOrders, c, omega);
            double reverse = kr == 0 ? 0 : kr * fallingProduct(reverseOrders, c, omega);
            return forward - reverse;
        }

        private static double fallingProduct(double[] orders, double[] c, double omega) {
            double p = 1;
            for (int s = 0; s < orders.length; s++) {
                int order = (int) orders[s];
                double step = 1 / omega;
                for (int j = 0; j < order; j++) {
                    p *= Math.max(c[s] - j * step, 0);
                }
            }
            return p;
        }

        @Override
        public double value(double[] c) {
            return plain.value(c);
        }

        @Override
        public Expression derivative(int s) {
            return plain.derivative(s);
        }

        @Override
        void emit(Program.Builder b) {
            plain.emit(b);
        }

        @Override
        public String toString() {
            return plain.toString();
        }
    }

    private static final class Const extends Expression {
        final double v;

        Const(double v) {
            this.v = v;
        }

        @Override
        public double value(double[] c) {
            return v;
        }

        @Override
        public Expression derivative(int s) {
            return new Const(0);
        }

        @Override
        void emit(Program.Builder b) {
            b.constant(v);
        }

        @Override
        public String toString() {
            return Double.toString(v);
        }
    }

    private static final class Species extends Expression {
        final int index;

        Species(int index) {
            this.index = index;
        }

        @Override
        public double value(double[] c) {
            return c[index];
        }

        @Override
        public Expression derivative(int s) {
            return new Const(s == index ? 1 : 0);
        }

        @Override
        void emit(Program.Builder b) {
            b.species(index);
        }

        @Override
        public String toString() {
            return "c" + index;
        }
    }

    private static final class Unary extends Expression {
        final char op;
        final Expression a;

        Unary(char op, Expression a) {
            this.op = op;
            this.a = a;
        }

        @Override
        public double value(double[] c) {
            double x = a.value(c);
            return op == 'e' ? Math.exp(x) : Math.log(x);
        }

        @Override
        public Expression derivative(int s) {
            Expression da = a.derivative(s);
            if (da.isZero()) {
                return new Const(0);
            }
            return op == 'e' ? multiply(this, da) : divide(da, a);
        }

        @Override
        void emit(Program.Builder b) {
            a.emit(b);
            b.op(op == 'e' ? Program.EXP : Program.LOG);
        }
    }

    private static final class Binary extends Expression {
        final char op;
        final Expression a;
        final Expression b;

        Binary(char op, Expression a, Expression b) {
            this.op = op;
            this.a = a;
            this.b = b;
        }

        @Override
        void emit(Program.Builder builder) {
            a.emit(builder);
            if (op == '^' && b instanceof Const k && (k.v == 2 || k.v == 3)) {
                builder.op(k.v == 2 ? Program.SQUARE : Program.CUBE);
                return;
            }
            b.emit(builder);
            builder.op(switch (op) {
                case '+' -> Program.ADD;
                case '-' -> Program.SUB;
                case '*' -> Program.MUL;
                case '/' -> Program.DIV;
                default -> Program.POW;
            });
        }

        @Override
        public double value(double[] c) {
            double x = a.value(c);
            double y = b.value(c);
            switch (op) {
                case '+':
                    return x + y;
                case '-':
                    return x - y;
                case '*':
                    return x * y;
                case '/':
                    return x / y;
                default:
                    if (y == 2) {
                        return x * x;
                    }
                    if (y == 3) {
                        return x * x * x;
                    }
                    return Math.pow(x, y);
            }
        }

        @Override
        public Expression derivative(int s) {
            Expression da = a.derivative(s);
            Expression db = b.derivative(s);
            switch (op) {
                case '+':
                    return add(da, db);
                case '-':
                    return subtract(da, db);
                case '*':
                    return add(multiply(da, b), multiply(a, db));
                case '/':
                    return divide(subtract(multiply(da, b), multiply(a, db)), multiply(b, b));
                default:
                    Expression result = new Const(0);
                    if (!da.isZero()) {
                        // d(a^b)/da = b a^(b - 1)
                        result = multiply(multiply(b, power(a, subtract(b, new Const(1)))), da);
                    }
                    if (!db.isZero()) {
                        result = add(result, multiply(multiply(this, log(a)), db));
                    }
                    return result;
            }
        }
    }
}
