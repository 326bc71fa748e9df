package org.roundtable.submission.intake;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatIllegalArgumentException;
import static org.assertj.core.groups.Tuple.tuple;
import static org.roundtable.submission.intake.IntakeTestSupport.accepted;
import static org.roundtable.submission.intake.IntakeTestSupport.rejected;
import static org.roundtable.submission.intake.IntakeTestSupport.utf8;

import java.math.BigDecimal;
import java.util.EnumSet;
import java.util.List;
import org.junit.jupiter.api.Test;

/** The rules shared by all channels: warnings the lab confirms, all-or-nothing rejection, unit conversion, catalogue. */
class ValidationRulesTest {

    private static final String HEADER = "measurand,value,unit,expanded_uncertainty,method,replicates\n";

    private final ResultIntake intake = new ResultIntake();

    private IntakeResult read(String csv) {
        return intake.read(utf8(csv), UploadFormat.CSV, LowAlloySteelRound.singleItem());
    }

    @Test
    void aUnitSlipOutsideTheExpectedRangeIsAWarningSoTheResultReachesTheEvaluation() {
        IntakeResult.Accepted accepted = accepted(read(HEADER + "N,85,%,6,inert-gas-fusion,2\n"));

        assertThat(accepted.results().get(0).massFraction()).isEqualTo(new BigDecimal("850000"));
        assertThat(accepted.warnings()).filteredOn(w -> w.key().equals("value.outside-expected-range"))
                .singleElement()
                .satisfies(warning -> {
                    assertThat(warning.row()).isEqualTo(2);
                    assertThat(warning.column()).isEqualTo("value");
                    assertThat(warning.message()).contains("N", "20", "150", "mg/kg");
                });
    }

    @Test
    void anUncertaintyLargerThanTheValueIsAWarning() {
        IntakeResult.Accepted accepted = accepted(read(HEADER + "S,0.008,%,0.010,combustion,2\n"));

        assertThat(accepted.warnings()).extracting(IntakeWarning::key).contains("uncertainty.larger-than-value");
    }

    @Test
    void moreDecimalsThanRequestedIsAWarning() {
        IntakeResult.Accepted accepted = accepted(read(HEADER + "Mn,1.2153,%,0.030,spark-oes,3\n"));

        assertThat(accepted.warnings()).extracting(IntakeWarning::key).contains("value.reporting-digits");
    }

    @Test
    void oneBadRowRejectsTheWholeUploadAndEveryProblemIsListed() {
        IntakeResult.Rejected rejected = rejected(read(HEADER
                + "C,0.412,%,0.012,combustion,2\n"
                + "Mn,-1.2,mg/kg,0.030,spark-oes,9\n"
                + "Si,0.245,%,0.010,spark-oes,3\n"));

        assertThat(rejected.problems()).extracting(IntakeProblem::row, IntakeProblem::column, IntakeProblem::key)
                .containsExactly(
                        tuple(3, "unit", "unit.not-allowed"),
                        tuple(3, "value", "value.negative"),
                        tuple(3, "replicates", "replicates.out-of-range"));
        assertThat(rejected.problems()).allSatisfy(problem -> assertThat(problem.message()).isNotBlank());
    }

    /** Cu blank-corrected (negative values allowed, expected −0.010 to 0.050 %), Ni as usual. */
    private static UploadRules blankCorrectedCopper() {
        java.util.Set<MethodGroup> methods = EnumSet.of(MethodGroup.ICP_OES);
        return new UploadRules(List.of(
                new MeasurandRule("Cu", MassFractionUnit.PERCENT, EnumSet.of(MassFractionUnit.PERCENT), 3,
                        new BigDecimal("-0.010"), new BigDecimal("0.050"), methods, true, true),
                new MeasurandRule("Ni", MassFractionUnit.PERCENT, EnumSet.of(MassFractionUnit.PERCENT), 3,
                        new BigDecimal("0"), new BigDecimal("0.050"), methods, true)), List.of("1"), 4);
    }

    @Test
    void aNegativeValueIsAResultOnlyOfAMeasurandWhoseRuleAllowsIt() {
        String header = "measurand,value,unit,expanded_uncertainty,method,replicates,replicate_values\n";
        IntakeResult.Accepted accepted = accepted(intake.read(utf8(header
                + "Cu,-0.004,%,0.003,icp-oes,2,-0.003|-0.005\nNi,0.010,%,,icp-oes,1,\n"), UploadFormat.CSV,
                blankCorrectedCopper()));
        assertThat(accepted.results().get(0).massFraction()).isEqualTo(new BigDecimal("-0.004"));
        assertThat(accepted.results().get(0).replicateValues()).extracting(ReportedNumber::value)
                .containsExactly(new BigDecimal("-0.003"), new BigDecimal("-0.005"));
        // −0.004 lies inside the expected −0.010 … 0.050, and U = 0.003 is not larger than |−0.004|
        assertThat(accepted.warnings()).extracting(IntakeWarning::key)
                .doesNotContain("value.outside-expected-range", "uncertainty.larger-than-value");

        IntakeResult.Rejected rejected = rejected(intake.read(utf8(header + "Ni,-0.004,%,,icp-oes,1,\n"
                + "Cu,-0.004,%,-0.003,icp-oes,1,\n" + "Cu,<-0.001,%,,icp-oes,1,\n"), UploadFormat.CSV,
                blankCorrectedCopper()));
        assertThat(rejected.problems()).extracting(IntakeProblem::row, IntakeProblem::column, IntakeProblem::key,
                        IntakeProblem::message)
                .containsExactly(
                        tuple(2, "value", "value.negative", "Ni = -0.004 is negative; the round's plan does not accept"
                                + " negative results for Ni. Check the sign, or ask the coordinator whether negative"
                                + " blank-corrected results are accepted."),
                        tuple(3, "expanded_uncertainty", "value.negative", "An expanded uncertainty cannot be negative."),
                        tuple(4, "value", "value.negative", "A 'less than' limit cannot be negative."));
    }

    @Test
    void anExpectedRangeBelowZeroIsOnlyForAMeasurandThatAllowsNegativeValues() {
        assertThatIllegalArgumentException().isThrownBy(() -> new MeasurandRule("Cu", MassFractionUnit.PERCENT,
                EnumSet.of(MassFractionUnit.PERCENT), 3, new BigDecimal("-0.010"), BigDecimal.ONE,
                EnumSet.of(MethodGroup.ICP_OES), false));
    }

    @Test
    void aPairedRoundRequiresTheItemColumn() {
        IntakeResult.Rejected rejected = rejected(intake.read(utf8(HEADER + "Mn,1.215,%,0.030,spark-oes,3\n"),
                UploadFormat.CSV, LowAlloySteelRound.pairedItems()));

        assertThat(rejected.problems()).extracting(IntakeProblem::row, IntakeProblem::column, IntakeProblem::key)
                .containsExactly(tuple(1, "item", "header.missing-column"));
    }

    @Test
    void theSameMeasurandOnBothItemsOfAPairIsNoDuplicate() {
        IntakeResult.Accepted accepted = accepted(intake.read(utf8("measurand,item,value,unit,method,replicates\n"
                + "Mn,A,1.215,%,spark-oes,3\nMn,B,1.187,%,spark-oes,3\n"), UploadFormat.CSV,
                LowAlloySteelRound.pairedItems()));

        assertThat(accepted.results()).extracting(ReportedResult::item).containsExactly("A", "B");
    }

    @Test
    void aCaseSlipInAnElementSymbolSuggestsTheRightSymbol() {
        IntakeResult.Rejected rejected = rejected(read(HEADER + "MN,1.215,%,0.030,spark-oes,3\n"));

        assertThat(rejected.problems().get(0).message()).contains("Did you mean Mn?");
    }

    @Test
    void percentAndMilligramsPerKilogramConvertExactly() {
        assertThat(MassFractionUnit.PERCENT.convert(new BigDecimal("0.0085"), MassFractionUnit.MILLIGRAM_PER_KILOGRAM))
                .isEqualTo(new BigDecimal("85"));
        assertThat(MassFractionUnit.MILLIGRAM_PER_KILOGRAM.convert(new BigDecimal("3"), MassFractionUnit.PERCENT))
                .isEqualTo(new BigDecimal("0.0003"));
        assertThat(MassFractionUnit.MILLIGRAM_PER_KILOGRAM.isAbove100Percent(new BigDecimal("1000000"))).isFalse();
        assertThat(MassFractionUnit.MILLIGRAM_PER_KILOGRAM.isAbove100Percent(new BigDecimal("1000000.1"))).isTrue();
    }

    @Test
    void theCatalogueAcceptsOnlyElementSymbolsFromHydrogenToUranium() {
        assertThat(ChemicalElements.SYMBOLS).hasSize(92).startsWith("H").endsWith("U");
        assertThatIllegalArgumentException().isThrownBy(() -> new MeasurandRule("Pu", MassFractionUnit.PERCENT,
                EnumSet.of(MassFractionUnit.PERCENT), 3, BigDecimal.ZERO, BigDecimal.ONE,
                EnumSet.of(MethodGroup.SPARK_OES), false));
        assertThatIllegalArgumentException().isThrownBy(() -> new UploadRules(List.of(), List.of("1"), 3));
    }

    @Test
    void everyErrorKeyIsUniqueAndWarningsAreMarked() {
        assertThat(EnumSet.allOf(IntakeKey.class)).extracting(IntakeKey::key).doesNotHaveDuplicates()
                .allMatch(key -> key.matches("[a-z0-9-]+\\.[a-z0-9-]+"));
        assertThat(IntakeKey.WARNING_OUTSIDE_EXPECTED_RANGE.isWarning()).isTrue();
        assertThat(IntakeKey.VALUE_NEGATIVE.isWarning()).isFalse();
    }
}
