package org.dendrokin.core.model;

import java.util.Arrays;

/**
 * An {@link Expression} flattened into postfix instructions over a small value stack, so a rate is evaluated
 * by one loop without virtual calls or pointer chasing. Each instruction is an opcode in the low 4 bits and
 * an operand index above them. Not thread-safe (it owns its stack); {@link #copy()} gives another.
 */
final class Program {
    static final int CONST = 0;
    static final int SPECIES = 1;
    static final int ADD = 2;
    static final int SUB = 3;
    static final int MUL = 4;
    static final int DIV = 5;
    static final int POW = 6;
    static final int SQUARE = 7;
    static final int CUBE = 8;
    static final int EXP = 9;
    static final int LOG = 10;

    private final int[] code;
    private final double[] constants;
    private final double[] stack;

    private Program(int[] code, double[] constants, int depth) {
        this.code = code;
        this.constants = constants;
        this.stack = new double[Math.max(depth, 1)];
    }

    Program copy() {
        return new Program(code, constants, stack.length);
    }

    /** True when the program is a single constant 0. */
    boolean isZero() {
        return code.length == 1 && (code[0] & 15) == CONST && constants[code[0] >>> 4] == 0;
    }

    double value(double[] c) {
        double[] st = stack;
        int top = -1;
        for (int instruction : code) {
            int arg = instruction >>> 4;
            switch (instruction & 15) {
                case CONST -> st[++top] = constants[arg];
                case SPECIES -> st[++top] = c[arg];
                case ADD -> {
                    top--;
                    st[top] += st[top + 1];
                }
                case SUB -> {
                    top--;
                    st[top] -= st[top + 1];
                }
                case MUL -> {
                    top--;
                    st[top] *= st[top + 1];
                }
                case DIV -> {
                    top--;
                    st[top] /= st[top + 1];
                }
                case POW -> {
                    top--;
                    st[top] = Math.pow(st[top], st[top + 1]);
                }
                case SQUARE -> st[top] *= st[top];
                case CUBE -> st[top] = st[top] * st[top] * st[top];
                case EXP -> st[top] = Math.exp(st[top]);
                default -> st[top] = Math.log(st[top]);
            }
        }
        return st[0];
    }

    int depth() {
        return stack.length;
    }

    /**
     * The same program over many nodes at once: each instruction sweeps nodes [from, to) of whole rows, so the
     * dispatch is paid once per instruction instead of once per node and the sweeps vectorise.
     *
     * @param c     {@code c[species][node]}
     * @param lanes scratch rows, at least {@link #depth()} of them, each at least {@code to} long
     * @param refs  scratch, at least {@link #depth()} long
     * @param sc    scratch, at least {@link #depth()} long
     * @return the row holding the values at [from, to) (one of {@code lanes} or of {@code c}: read it before
     *         the next evaluation and do not write it), or null when the value is the constant {@code sc[0]}
     */
    double[] values(double[][] c, int from, int to, double[][] lanes, double[][] refs, double[] sc) {
        int top = -1;
        for (int instruction : code) {
            int arg = instruction >>> 4;
            int op = instruction & 15;
            switch (op) {
                case CONST -> {
                    top++;
                    refs[top] = null;
                    sc[top] = constants[arg];
                }
                case SPECIES -> {
                    top++;
                    refs[top] = c[arg];
                }
                case ADD, SUB, MUL, DIV, POW -> {
                    top--;
                    double[] a = refs[top];
                    double[] b = refs[top + 1];
                    if (a == null && b == null) {
                        sc[top] = scalar(op, sc[top], sc[top + 1]);
                    } else {
                        double[] o = lanes[top];
                        sweep(op, a, sc[top], b, sc[top + 1], o, from, to);
                        refs[top] = o;
                    }
                }
                default -> {
                    double[] a = refs[top];
                    if (a == null) {
                        sc[top] = scalar(op, sc[top], 0);
                    } else {
                        double[] o = lanes[top];
                        unarySweep(op, a, o, from, to);
                        refs[top] = o;
                    }
                }
            }
        }
        return refs[0];
    }

    private static double scalar(int op, double x, double y) {
        return switch (op) {
            case ADD -> x + y;
            case SUB -> x - y;
            case MUL -> x * y;
            case DIV -> x / y;
            case POW -> Math.pow(x, y);
            case SQUARE -> x * x;
            case CUBE -> x * x * x;
            case EXP -> Math.exp(x);
            default -> Math.log(x);
        };
    }

    private static void unarySweep(int op, double[] a, double[] o, int from, int to) {
        switch (op) {
            case SQUARE -> {
                for (int i = from; i < to; i++) {
                    o[i] = a[i] * a[i];
                }
            }
            case CUBE -> {
                for (int i = from; i < to; i++) {
                    o[i] = a[i] * a[i] * a[i];
                }
            }
            case EXP -> {
                for (int i = from; i < to; i++) {
                    o[i] = Math.exp(a[i]);
                }
            }
            default -> {
                for (int i = from; i < to; i++) {
                    o[i] = Math.log(a[i]);
                }
            }
        }
    }

    /** o = a op b over [from, to); a null row stands for the constant x, a null b for y (not both null). */
    private static void sweep(int op, double[] a, double x, double[] b, double y, double[] o, int from, int to) {
        if (a != null && b != null) {
            switch (op) {
                case ADD -> {
                    for (int i = from; i < to; i++) {
                        o[i] = a[i] + b[i];
                    }
                }
                case SUB -> {
                    for (int i = from; i < to; i++) {
                        o[i] = a[i] - b[i];
                    }
                }
                case MUL -> {
                    for (int i = from; i < to; i++) {
                        o[i] = a[i] * b[i];
                    }
                }
                case DIV -> {
                    for (int i = from; i < to; i++) {
                        o[i] = a[i] / b[i];
                    }
                }
                default -> {
                    for (int i = from; i < to; i++) {
                        o[i] = Math.pow(a[i], b[i]);
                    }
                }
            }
        } else if (b == null) {
            switch (op) {
                case ADD -> {
                    for (int i = from; i < to; i++) {
                        o[i] = a[i] + y;
                    }
                }
                case SUB -> {
                    for (int i = from; i < to; i++) {
                        o[i] = a[i] - y;
                    }
                }
                case MUL -> {
                    for (int i = from; i < to; i++) {
                        o[i] = a[i] * y;
                    }
                }
                case DIV -> {
                    for (int i = from; i < to; i++) {
                        o[i] = a[i] / y;
                    }
                }
                default -> {
                    for (int i = from; i < to; i++) {
                        o[i] = Math.pow(a[i], y);
                    }
                }
            }
        } else {
            switch (op) {
                case ADD -> {
                    for (int i = from; i < to; i++) {
                        o[i] = x + b[i];
                    }
                }
                case SUB -> {
                    for (int i = from; i < to; i++) {
                        o[i] = x - b[i];
                    }
                }
                case MUL -> {
                    for (int i = from; i < to; i++) {
                        o[i] = x * b[i];
                    }
                }
                case DIV -> {
                    for (int i = from; i < to; i++) {
                        o[i] = x / b[i];
                    }
                }
                default -> {
                    for (int i = from; i < to; i++) {
                        o[i] = Math.pow(x, b[i]);
                    }
                }
            }
        }
    }

    /** Collects instructions while an expression emits itself. */
    static final class Builder {
        private int[] code = new int[16];
        private int length;
        private double[] constants = new double[8];
        private int constantCount;
        private int depth;
        private int maxDepth;

        void constant(double v) {
            if (constantCount == constants.length) {
                constants = Arrays.copyOf(constants, 2 * constants.length);
            }
            constants[constantCount] = v;
            push(CONST | (constantCount++ << 4), 1);
        }

        void species(int index) {
            push(SPECIES | (index << 4), 1);
        }

        void op(int opcode) {
            boolean binary = opcode >= ADD && opcode <= POW;
            push(opcode, binary ? -1 : 0);
        }

        private void push(int instruction, int stackChange) {
            if (length == code.length) {
                code = Arrays.copyOf(code, 2 * code.length);
            }
            code[length++] = instruction;
            depth += stackChange;
            maxDepth = Math.max(maxDepth, depth);
        }

        Program build() {
            return new Program(Arrays.copyOf(code, length), Arrays.copyOf(constants, constantCount), maxDepth);
        }
    }
}
