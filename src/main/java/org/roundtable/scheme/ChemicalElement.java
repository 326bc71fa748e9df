package org.roundtable.scheme;

import org.roundtable.submission.intake.ChemicalElements;
import org.roundtable.platform.DomainException;

import java.util.List;

/**
 * Element symbols a measurand may name: the periodic table from hydrogen (1) to uranium (92). Symbols are
 * matched exactly as written in the table (first letter upper case, second lower case), so "CO" is refused
 * rather than read as cobalt or carbon monoxide.
 */
public final class ChemicalElement {

    /** Symbols in order of atomic number, H (1) to U (92): the one table, kept by the result intake. */
    public static final List<String> SYMBOLS = ChemicalElements.SYMBOLS;

    private ChemicalElement() {
    }

    /** The symbol, stripped, if it names an element from H to U; otherwise a clear refusal. */
    public static String require(String symbol) {
        String clean = symbol == null ? "" : symbol.strip();
        if (!SYMBOLS.contains(clean)) {
            throw new DomainException.BadRequest("'" + abbreviate(clean)
                    + "' is not an element symbol from H to U (write it as in the periodic table, e.g. Mn or C).");
        }
        return clean;
    }

    public static int atomicNumber(String symbol) {
        return SYMBOLS.indexOf(symbol) + 1;
    }

    private static String abbreviate(String text) {
        return text.length() <= 12 ? text : text.substring(0, 12) + "…";
    }
}
