/**
 * The in-memory report model: plain immutable records that carry everything a round report or a
 * per-laboratory report shows, already evaluated and classified.
 *
 * <p>The model knows participants only by their participant codes. Laboratory names, addresses and
 * the code-to-identity map never enter it, so no renderer can disclose an identity (ISO/IEC
 * 17043:2023 4.2.5, confidentiality of participants).
 *
 * <p>Numbers are carried unrounded as {@code double}; renderers round them for display
 * (reporting digits of the measurand for values, two decimals for scores). Classifications are
 * carried as evaluated, on unrounded scores, and are never recomputed from the rounded figures.
 * Optional numbers are {@code null} when they do not exist (a score that was not computed, a
 * result reported without an uncertainty).
 */
package org.roundtable.report.model;
