package org.roundtable.scheme;

/** The kind of material a scheme's items are made of. */
public enum MaterialFamily {
    LOW_ALLOY_STEEL, STAINLESS_STEEL, CAST_IRON, ALUMINIUM_ALLOY, COPPER_ALLOY, NICKEL_ALLOY, OTHER
}
