package org.roundtable.submission.intake;

import java.math.BigDecimal;
import java.util.EnumSet;
import java.util.List;
import java.util.Set;

/**
 * The fixed test catalogue: a low-alloy steel round with C, Si, Mn, P, S, Cr, Ni, Mo, Cu in % and N in mg/kg.
 * Expected ranges are invented, loosely following the scope of spark-OES methods for low-alloy steel.
 */
final class LowAlloySteelRound {

    private static final Set<MethodGroup> OES_XRF_ICP = EnumSet.of(MethodGroup.SPARK_OES, MethodGroup.XRF,
            MethodGroup.ICP_OES);
    private static final Set<MethodGroup> CARBON_SULFUR = EnumSet.of(MethodGroup.SPARK_OES, MethodGroup.COMBUSTION,
            MethodGroup.XRF, MethodGroup.ICP_OES);
    private static final Set<MethodGroup> NITROGEN = EnumSet.of(MethodGroup.SPARK_OES, MethodGroup.INERT_GAS_FUSION);

    private LowAlloySteelRound() {
    }

    /** One item, labelled "1"; at most 4 replicates. "Less than" allowed for P, S, Ni, Mo, Cu. */
    static UploadRules singleItem() {
        return new UploadRules(measurands(), List.of("1"), 4);
    }

    /** The same catalogue for a split-level pair, items "A" and "B". */
    static UploadRules pairedItems() {
        return new UploadRules(measurands(), List.of("A", "B"), 4);
    }

    private static List<MeasurandRule> measurands() {
        return List.of(
                percent("C", CARBON_SULFUR, "0.02", "1.10", false),
                percent("Si", OES_XRF_ICP, "0.02", "1.54", false),
                percent("Mn", OES_XRF_ICP, "0.03", "2.00", false),
                percent("P", OES_XRF_ICP, "0.006", "0.085", true),
                percent("S", CARBON_SULFUR, "0.001", "0.055", true),
                percent("Cr", OES_XRF_ICP, "0.007", "8.14", false),
                percent("Ni", OES_XRF_ICP, "0.006", "5.00", true),
                percent("Mo", OES_XRF_ICP, "0.007", "1.30", true),
                percent("Cu", OES_XRF_ICP, "0.006", "0.50", true),
                new MeasurandRule("N", MassFractionUnit.MILLIGRAM_PER_KILOGRAM,
                        EnumSet.of(MassFractionUnit.MILLIGRAM_PER_KILOGRAM, MassFractionUnit.PERCENT), 0,
                        new BigDecimal("20"), new BigDecimal("150"), NITROGEN, false));
    }

    private static MeasurandRule percent(String element, Set<MethodGroup> methods, String low, String high,
                                         boolean lessThanAllowed) {
        return new MeasurandRule(element, MassFractionUnit.PERCENT, EnumSet.of(MassFractionUnit.PERCENT), 3,
                new BigDecimal(low), new BigDecimal(high), methods, lessThanAllowed);
    }
}
