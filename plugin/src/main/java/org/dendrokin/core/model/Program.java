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
