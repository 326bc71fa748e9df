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
