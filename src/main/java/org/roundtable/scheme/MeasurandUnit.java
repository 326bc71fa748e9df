package org.roundtable.scheme;

import org.roundtable.platform.DomainException;

/** The unit a measurand is reported in: mass fraction in % (m/m) or mg/kg. */
public enum MeasurandUnit {
    PERCENT("%"), MILLIGRAM_PER_KILOGRAM("mg/kg");

    private final String symbol;

    MeasurandUnit(String symbol) {
        this.symbol = symbol;
    }

    public String symbol() {
        return symbol;
    }

    public static MeasurandUnit fromSymbol(String symbol) {
        for (MeasurandUnit unit : values()) {
            if (unit.symbol.equals(symbol == null ? null : symbol.strip())) {
                return unit;
            }
        }
        throw new DomainException.BadRequest("The unit is % or mg/kg.");
    }
}
