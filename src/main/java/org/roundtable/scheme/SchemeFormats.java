package org.roundtable.scheme;

import io.quarkus.qute.TemplateExtension;

import java.math.BigDecimal;
import java.math.MathContext;
import java.util.Locale;

/** Number formats for the scheme and round pages. */
@TemplateExtension
public final class SchemeFormats {

    private SchemeFormats() {
    }

    /** A computed figure to 6 significant digits, plain notation ({@code 0.0166333}); a dash for none. */
    static String fig(Double value) {
        if (value == null || value.isNaN()) {
            return "–";
        }
        return new BigDecimal(value).round(new MathContext(6)).stripTrailingZeros().toPlainString();
    }

    /** An action or state name in words: {@code OPEN_FOR_RESULTS} → "Open for results". */
    static String words(String name) {
        String text = name.toLowerCase(Locale.ROOT).replace('_', ' ');
        return Character.toUpperCase(text.charAt(0)) + text.substring(1);
    }
}
