/**
 * Pure statistics core of Roundtable: descriptive and robust estimators, performance scores,
 * homogeneity and stability checks, ISO 5725-2 precision statistics and kernel density.
 *
 * <p>Plain Java: this package and its subpackages depend on nothing but {@code java.*} and
 * {@code org.hipparchus.*} (for distribution quantiles). All classes are immutable and
 * thread-safe. Arrays passed in are never modified.
 *
 * <p>Policy for bad input, applied throughout: a {@code null} array, a NaN or infinite value, or
 * fewer values than a method needs throw {@link java.lang.IllegalArgumentException} with a
 * message naming the problem. Zero spread is not an error of the caller; methods that need a
 * scale return a result record carrying a warning (see each class) and the bare-number methods
 * throw.
 */
package org.roundtable.statistics;
