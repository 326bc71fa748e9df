package org.roundtable.submission.intake;

import java.util.List;
import java.util.Locale;
import java.util.Optional;
import java.util.Set;

/** The element symbols from hydrogen (Z = 1) to uranium (Z = 92); measurands are element symbols. */
public final class ChemicalElements {

    /** Symbols in order of atomic number, H = 1 … U = 92. */
    public static final List<String> SYMBOLS = List.of(
            "H", "He", "Li", "Be", "B", "C", "N", "O", "F", "Ne",
            "Na", "Mg", "Al", "Si", "P", "S", "Cl", "Ar", "K", "Ca",
            "Sc", "Ti", "V", "Cr", "Mn", "Fe", "Co", "Ni", "Cu", "Zn",
            "Ga", "Ge", "As", "Se", "Br", "Kr", "Rb", "Sr", "Y", "Zr",
            "Nb", "Mo", "Tc", "Ru", "Rh", "Pd", "Ag", "Cd", "In", "Sn",
            "Sb", "Te", "I", "Xe", "Cs", "Ba", "La", "Ce", "Pr", "Nd",
            "Pm", "Sm", "Eu", "Gd", "Tb", "Dy", "Ho", "Er", "Tm", "Yb",
            "Lu", "Hf", "Ta", "W", "Re", "Os", "Ir", "Pt", "Au", "Hg",
            "Tl", "Pb", "Bi", "Po", "At", "Rn", "Fr", "Ra", "Ac", "Th",
            "Pa", "U");

    private static final Set<String> SYMBOL_SET = Set.copyOf(SYMBOLS);
    private static final java.util.Map<String, String> BY_LOWER_CASE = SYMBOLS.stream()
            .collect(java.util.stream.Collectors.toUnmodifiableMap(s -> s.toLowerCase(Locale.ROOT), s -> s));

    private ChemicalElements() {
    }

    /** Whether {@code symbol} is an element symbol spelled exactly (case matters: {@code Co} is not {@code CO}). */
    public static boolean isSymbol(String symbol) {
        return SYMBOL_SET.contains(symbol);
    }

    /** The correctly spelled symbol when {@code text} differs from one only in case, e.g. {@code MN} → {@code Mn}. */
    public static Optional<String> symbolIgnoringCase(String text) {
        return text.length() > 2 ? Optional.empty()
                : Optional.ofNullable(BY_LOWER_CASE.get(text.toLowerCase(Locale.ROOT)));
    }
}
