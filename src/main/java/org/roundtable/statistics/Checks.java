package org.roundtable.statistics;

/**
 * Argument checks shared by the statistics classes (internal use; public only so that the
 * subpackages can reach it).
 */
public final class Checks {

    private Checks() {
    }

    /**
     * Checks that {@code values} is non-null, holds at least {@code minimum} values and that every
     * value is finite.
     *
     * @throws IllegalArgumentException if one of these conditions fails
     */
    public static void requireFinite(double[] values, int minimum, String what) {
        if (values == null) {
            throw new IllegalArgumentException(what + ": values must not be null");
        }
        if (values.length < minimum) {
            throw new IllegalArgumentException(what + ": needs at least " + minimum
                    + " value(s), got " + values.length);
        }
        for (int i = 0; i < values.length; i++) {
            if (!Double.isFinite(values[i])) {
                throw new IllegalArgumentException(what + ": value at index " + i
                        + " is not a finite number (" + values[i] + ")");
            }
        }
    }

    /**
     * Checks that a single number is finite.
     *
     * @throws IllegalArgumentException if it is NaN or infinite
     */
    public static void requireFinite(double value, String name) {
        if (!Double.isFinite(value)) {
            throw new IllegalArgumentException(name + " must be a finite number, got " + value);
        }
    }

    /**
     * Checks that a number is finite and strictly positive.
     *
     * @throws IllegalArgumentException otherwise
     */
    public static void requirePositive(double value, String name) {
        if (!(Double.isFinite(value) && value > 0)) {
            throw new IllegalArgumentException(name + " must be a finite number > 0, got " + value);
        }
    }
}
