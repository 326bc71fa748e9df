/**
 * The in-memory report model: plain immutable records that carry everything a round report or a
 * per-laboratory report shows, already evaluated and classified.
 *
 * <p>The model knows participants only by their participant codes. Laboratory names, addresses and
 * the code-to-identity map never enter it, so no renderer can disclose an identity (ISO/IEC
 * 17043:2023 4.2.5, confidentiality of participants).
 *
 * <p>Numbers are carried unrounded as {@code double}; renderers round them for display with
 * {@code platform.NumberFormats} (reporting digits of the measurand for values, digits + 1 for
 * statistics and uncertainties, the plan's score decimals for scores). Classifications are carried as
 * evaluated — on the score <em>as printed</em> (rounded half away from zero to the plan's score
 * decimals, then compared with the limits), so they always agree with the printed figure — and are
 * never recomputed here. A score for information only (a consensus or data-derived σpt below the
 * plan's minimum) has a {@code null} classification and counts in no verdict.
 * Optional numbers are {@code null} when they do not exist (a score that was not computed, a
 * result reported without an uncertainty).
 */
package org.roundtable.report.model;
