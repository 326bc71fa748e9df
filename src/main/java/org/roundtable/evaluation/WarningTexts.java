package org.roundtable.evaluation;

import org.roundtable.platform.Labels;
import org.roundtable.platform.NumberFormats;

import java.math.BigDecimal;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * The words and numbers of an evaluation warning as people read them. A warning keeps its stable code (the key in
 * JSON and exports); its text is for people: the trade's symbols (σpt, xpt, u(xpt), ss…) instead of the plain-text
 * spellings of code and formulas ({@code sigma_pt}, {@code u(x_pt)}, {@code s_s}), a qualification decision or a
 * method group by its label instead of its constant, and numbers through {@link NumberFormats}: quantities of the measurand as
 * statistics (reporting digits + 1), other numbers at {@value #SIGNIFICANT} significant digits when they carry
 * more than {@value #MAX_SIGNIFICANT}. Texts of runs stored before the warnings were written this way read the
 * same after this pass.
 */
public final class WarningTexts {

    /** Significant digits of a number that is not a quantity of the measurand (a share, a ratio). */
    public static final int SIGNIFICANT = 3;
    /** More significant digits than this in a warning's text are a raw double, never meant for people. */
    public static final int MAX_SIGNIFICANT = 6;

    /** Warnings whose numbers are quantities of the measurand (in its unit). */
    private static final Set<String> QUANTITIES = Set.of("method-groups-differ", "sigma-pt-widened", "u-hom-added",
            "u-hom-u-stab-added");

    /** Plain-text spellings and how the trade writes them; longer ones first. */
    private static final String[][] SYMBOLS = {
            {"u(x_pt)", "u(xpt)"}, {"sigma_pt", "σpt"}, {"sigma_R", "σR"}, {"sigma_r", "σr"}, {"x_pt", "xpt"},
            {"u_hom", "uhom"}, {"u_stab", "ustab"}, {"u_char", "uchar"}, {"s_s", "ss"}, {"s_w", "sw"}, {"s_x", "sx"},
            {"s_r", "sr"}, {"s_d", "sd"}, {"s_R", "sR"}, {"s_L", "sL"},
    };
    private static final Pattern CONSTANT = Pattern.compile("(?<![A-Za-z0-9_])[A-Z][A-Z0-9]*(?:_[A-Z0-9]+)+(?![A-Za-z0-9_])");
    private static final Pattern NUMBER = Pattern.compile("(?<![\\w.])-?\\d+\\.\\d+(?![\\w.])");
    private static final Pattern SQRT = Pattern.compile("sqrt\\(");

    private WarningTexts() {
    }

    /** The warning's text for people; {@code reportingDigits} of the measurand, or null where unknown. */
    public static String forPeople(EvaluationViews.Warning warning, Integer reportingDigits) {
        return forPeople(warning.code(), warning.message(), reportingDigits);
    }

    /** The text of a warning with code {@code code} for people (see the class). */
    public static String forPeople(String code, String message, Integer reportingDigits) {
        if (message == null) {
            return "";
        }
        String text = message;
        for (String[] s : SYMBOLS) {
            text = text.replaceAll("(?<![A-Za-z0-9_])" + Pattern.quote(s[0]) + "(?![A-Za-z0-9_])",
                    Matcher.quoteReplacement(s[1]));
        }
        text = SQRT.matcher(text).replaceAll("√(").replace("^2", "²").replace("<=", "≤").replace(">=", "≥");
        text = replace(CONSTANT, text, m -> Labels.has("Decision", m) ? "“" + Labels.of("Decision", m) + "”"
                : Labels.has("MethodGroup", m) ? Labels.of("MethodGroup", m) : m);
        boolean quantities = QUANTITIES.contains(code) && reportingDigits != null;
        text = replace(NUMBER, text, n -> {
            double value = Double.parseDouble(n);
            if (quantities) {
                return NumberFormats.statistic(value, reportingDigits);
            }
            return significantDigits(n) > MAX_SIGNIFICANT ? NumberFormats.significant(value, SIGNIFICANT + 1) : n;
        });
        return NumberFormats.minusSigns(text);
    }

    /** A quantity of the measurand in a warning's text: at reporting digits + 1, or 4 significant digits. */
    static String quantity(double value, Integer reportingDigits) {
        return reportingDigits == null ? NumberFormats.significant(value, SIGNIFICANT + 1)
                : NumberFormats.statistic(value, reportingDigits);
    }

    /** A share in per cent or a ratio in a warning's text, at {@value #SIGNIFICANT} significant digits. */
    static String share(double value) {
        return NumberFormats.significant(value, SIGNIFICANT);
    }

    static int significantDigits(String number) {
        return new BigDecimal(number.startsWith("-") ? number.substring(1) : number).stripTrailingZeros().precision();
    }

    private static String replace(Pattern pattern, String text, java.util.function.UnaryOperator<String> by) {
        Matcher m = pattern.matcher(text);
        StringBuilder out = new StringBuilder();
        while (m.find()) {
            m.appendReplacement(out, Matcher.quoteReplacement(by.apply(m.group())));
        }
        m.appendTail(out);
        return out.toString();
    }
}
