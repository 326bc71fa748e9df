package org.roundtable.web;

import io.quarkus.qute.TemplateExtension;
import org.roundtable.platform.Labels;
import org.roundtable.platform.NumberFormats;

import java.net.URLEncoder;
import java.nio.charset.StandardCharsets;

/**
 * What templates may call on values: numbers (delegating to {@link NumberFormats}, the product's one set of
 * number rules, so a page prints what a report prints) and labels (delegating to {@link Labels}, so no
 * constant name reaches a reader). No rule of its own lives here.
 */
@TemplateExtension
public final class PageFormats {

    private PageFormats() {
    }

    /** {@code {x.result(digits)}}: a laboratory's result at the measurand's reporting digits. */
    static String result(Number value, int reportingDigits) {
        return NumberFormats.result(asDouble(value), reportingDigits);
    }

    /** {@code {x.statistic(digits)}}: x_pt, σpt, u(x_pt), s*, U at reporting digits + 1. */
    static String statistic(Number value, int reportingDigits) {
        return NumberFormats.statistic(asDouble(value), reportingDigits);
    }

    /** {@code {z.score(decimals)}}: a score at the plan's score decimals. */
    static String score(Number value, int scoreDecimals) {
        return NumberFormats.signedScore(asDouble(value), scoreDecimals);
    }

    /** {@code {x.decimals(n)}}: a plain figure at {@code n} decimals (counts, percentages). */
    static String decimals(Number value, int decimals) {
        return NumberFormats.decimal(asDouble(value), decimals);
    }

    /** {@code {state.label}}: an enum constant in words. */
    static String label(Enum<?> constant) {
        return Labels.of(constant);
    }

    /** {@code {round.state.label('RoundState')}}: a constant carried as text, in words. */
    static String label(String name, String kind) {
        return Labels.of(kind, name);
    }

    /** {@code {verdict.verdictWords}}: a classification (the enum or its name) in words. */
    static String verdictWords(Object verdict) {
        return verdict instanceof Enum<?> e ? Labels.of(e) : Labels.of("Classification", String.valueOf(verdict));
    }

    /** {@code {verdict.verdictClass}}: the CSS class suffix of a classification ({@code questionable}). */
    static String verdictClass(Object verdict) {
        String name = verdict instanceof Enum<?> e ? e.name() : String.valueOf(verdict);
        return name.toLowerCase(java.util.Locale.ROOT).replace('_', '-');
    }

    /** {@code {query.urlEncoded}}: for a query parameter in a link. */
    static String urlEncoded(String text) {
        return text == null ? "" : URLEncoder.encode(text, StandardCharsets.UTF_8);
    }

    private static Double asDouble(Number value) {
        return value == null ? null : value.doubleValue();
    }
}
