package org.roundtable.submission.intake;

import java.math.BigDecimal;
import java.util.Optional;

/**
 * The units a mass fraction may be reported in. 1 % = 10 000 mg/kg; conversions move the decimal point and are
 * exact (no rounding, {@link BigDecimal}).
 */
public enum MassFractionUnit {
    /** Percent by mass, % m/m. */
    PERCENT("%"),
    /** Milligrams per kilogram. */
    MILLIGRAM_PER_KILOGRAM("mg/kg");

    /** 100 % expressed in each unit: the largest possible mass fraction. */
    private static final BigDecimal HUNDRED_PERCENT = new BigDecimal("100");

    private final String symbol;

    MassFractionUnit(String symbol) {
        this.symbol = symbol;
    }

    /** The symbol as written in uploads: {@code %} or {@code mg/kg}. */
    public String symbol() {
        return symbol;
    }

    /** The unit with exactly this symbol (case-sensitive: {@code MG/KG} is not accepted). */
    public static Optional<MassFractionUnit> fromSymbol(String text) {
        for (MassFractionUnit unit : values()) {
            if (unit.symbol.equals(text)) {
                return Optional.of(unit);
            }
        }
        return Optional.empty();
    }

    /** Converts {@code value} given in this unit to {@code target}, exactly: % → mg/kg multiplies by 10 000. */
    public BigDecimal convert(BigDecimal value, MassFractionUnit target) {
        if (this == target) {
            return value;
        }
        return this == PERCENT ? value.movePointRight(4) : value.movePointLeft(4);
    }

    /** Whether {@code value} in this unit is above 100 % (1 000 000 mg/kg). */
    public boolean isAbove100Percent(BigDecimal value) {
        return convert(value, PERCENT).compareTo(HUNDRED_PERCENT) > 0;
    }
}
