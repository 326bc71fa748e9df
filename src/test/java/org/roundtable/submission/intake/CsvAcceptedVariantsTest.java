package org.roundtable.submission.intake;

import static org.assertj.core.api.Assertions.assertThat;
import static org.roundtable.submission.intake.IntakeTestSupport.accepted;
import static org.roundtable.submission.intake.IntakeTestSupport.resource;

import java.math.BigDecimal;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.junit.jupiter.api.Test;

/** The accepted CSV variants under {@code uploads/accepted/}: each is read completely and detected correctly. */
class CsvAcceptedVariantsTest {

    private final ResultIntake intake = new ResultIntake();

    private IntakeResult.Accepted read(String file) {
        return accepted(intake.read(resource("accepted/" + file), UploadFormat.CSV, LowAlloySteelRound.singleItem()));
    }

    @Test
    void commaSeparatedFileIsAcceptedWithEveryResultAndNoWarning() {
        IntakeResult.Accepted accepted = read("comma.csv");

        assertThat(accepted.results()).hasSize(10);
        assertThat(accepted.warnings()).isEmpty();
        assertThat(accepted.detection()).isEqualTo(new Detection(UploadFormat.CSV, "UTF-8", false, ',', '.'));
        ReportedResult carbon = accepted.results().get(0);
        assertThat(carbon.row()).isEqualTo(2);
        assertThat(carbon.measurand()).isEqualTo("C");
        assertThat(carbon.item()).isEqualTo("1");
        assertThat(carbon.valueAsReported()).isEqualTo("0.412");
        assertThat(carbon.value().value()).isEqualTo(new BigDecimal("0.412"));
        assertThat(carbon.unit()).isEqualTo(MassFractionUnit.PERCENT);
        assertThat(carbon.massFraction()).isEqualTo(new BigDecimal("0.412"));
        assertThat(carbon.expandedUncertainty()).contains(new ReportedNumber("0.012", new BigDecimal("0.012")));
        assertThat(carbon.coverageFactor().value()).isEqualTo(new BigDecimal("2"));
        assertThat(carbon.coverageFactorReported()).isTrue();
        assertThat(carbon.method()).isEqualTo(MethodGroup.COMBUSTION);
        assertThat(carbon.replicateCount()).isEqualTo(2);
        assertThat(carbon.replicateValues()).extracting(ReportedNumber::asReported).containsExactly("0.410", "0.414");
        assertThat(carbon.lessThan()).isFalse();
        assertThat(carbon.lessThanLimit()).isEmpty();
    }

    @Test
    void chromiumKeepsItsTrailingZeroAsReported() {
        ReportedResult chromium = read("comma.csv").results().get(5);

        assertThat(chromium.measurand()).isEqualTo("Cr");
        assertThat(chromium.value().asReported()).isEqualTo("1.050");
        assertThat(chromium.value().value().scale()).isEqualTo(3);
        assertThat(chromium.value().decimalText()).isEqualTo("1.050");
    }

    @Test
    void nitrogenInMilligramsPerKilogramStaysInItsCanonicalUnit() {
        ReportedResult nitrogen = read("comma.csv").results().get(9);

        assertThat(nitrogen.unit()).isEqualTo(MassFractionUnit.MILLIGRAM_PER_KILOGRAM);
        assertThat(nitrogen.canonicalUnit()).isEqualTo(MassFractionUnit.MILLIGRAM_PER_KILOGRAM);
        assertThat(nitrogen.massFraction()).isEqualByComparingTo("85");
        assertThat(nitrogen.method()).isEqualTo(MethodGroup.INERT_GAS_FUSION);
    }

    @Test
    void semicolonFileWithDecimalCommaIsAcceptedAndItsSeparatorsAreReported() {
        IntakeResult.Accepted accepted = read("semicolon-decimal-comma.csv");

        assertThat(accepted.detection()).isEqualTo(new Detection(UploadFormat.CSV, "UTF-8", false, ';', ','));
        ReportedResult carbon = accepted.results().get(0);
        assertThat(carbon.valueAsReported()).isEqualTo("0,412");
        assertThat(carbon.value().asReported()).isEqualTo("0,412");
        assertThat(carbon.value().value()).isEqualTo(new BigDecimal("0.412"));
        assertThat(carbon.replicateValues()).extracting(ReportedNumber::value)
                .containsExactly(new BigDecimal("0.410"), new BigDecimal("0.414"));
    }

    @Test
    void utf8ByteOrderMarkIsSkippedAndReported() {
        IntakeResult.Accepted accepted = read("utf8-bom.csv");

        assertThat(accepted.detection().byteOrderMark()).isTrue();
        assertThat(accepted.detection().encoding()).isEqualTo("UTF-8");
        assertThat(accepted.results().get(0).measurand()).isEqualTo("C");
    }

    @ParameterizedTest
    @ValueSource(strings = {"semicolon-decimal-comma.csv", "utf8-bom.csv", "crlf-line-endings.csv",
        "quoted-fields.csv", "trailing-blank-lines.csv", "shuffled-columns.csv"})
    void everyAcceptedVariantOfTheSameResultsGivesTheSameCanonicalPayload(String file) {
        IntakeResult.Accepted reference = read("comma.csv");
        IntakeResult.Accepted variant = read(file);

        assertThat(variant.results()).hasSize(10);
        assertThat(variant.canonicalJson()).isEqualTo(reference.canonicalJson());
        assertThat(variant.sha256()).isEqualTo(reference.sha256());
    }

    @Test
    void crlfLineEndingsGiveTheSameRowNumbersAsLineFeeds() {
        assertThat(read("crlf-line-endings.csv").results()).extracting(ReportedResult::row)
                .containsExactly(2, 3, 4, 5, 6, 7, 8, 9, 10, 11);
    }

    @Test
    void shuffledColumnsKeepTheRowsOfTheFile() {
        IntakeResult.Accepted accepted = read("shuffled-columns.csv");

        assertThat(accepted.results().get(0).measurand()).isEqualTo("N");
        assertThat(accepted.results().get(0).row()).isEqualTo(2);
        assertThat(accepted.results().get(0).replicateValues()).hasSize(2);
    }

    @Test
    void nitrogenReportedInPercentIsConvertedExactlyToMilligramsPerKilogram() {
        ReportedResult nitrogen = read("nitrogen-in-percent.csv").results().get(9);

        assertThat(nitrogen.unit()).isEqualTo(MassFractionUnit.PERCENT);
        assertThat(nitrogen.value().asReported()).isEqualTo("0.0085");
        assertThat(nitrogen.massFraction()).isEqualTo(new BigDecimal("85"));
        assertThat(nitrogen.expandedUncertaintyInCanonicalUnit()).contains(new BigDecimal("6"));
    }

    @Test
    void lessThanResultsKeepTheirLimitAndTheReportedText() {
        IntakeResult.Accepted accepted = read("less-than.csv");

        ReportedResult phosphorus = accepted.results().get(1);
        assertThat(phosphorus.lessThan()).isTrue();
        assertThat(phosphorus.valueAsReported()).isEqualTo("< 0.005");
        assertThat(phosphorus.lessThanLimit()).contains(new BigDecimal("0.005"));
        ReportedResult sulfur = accepted.results().get(2);
        assertThat(sulfur.lessThanLimit()).contains(new BigDecimal("0.002"));
        assertThat(sulfur.coverageFactorReported()).isFalse();
        assertThat(sulfur.coverageFactor().value()).isEqualTo(new BigDecimal("2"));
    }

    @Test
    void unreportedMeasurandsAreWarningsNotErrors() {
        IntakeResult.Accepted accepted = read("less-than.csv");

        assertThat(accepted.warnings()).filteredOn(w -> w.key().equals("measurand.not-reported"))
                .extracting(IntakeWarning::value)
                .containsExactlyInAnyOrder("Si", "Mn", "Cr", "Ni", "Mo", "Cu", "N");
    }

    @Test
    void pairedItemsAreReadPerItem() {
        IntakeResult.Accepted accepted = accepted(intake.read(resource("accepted/paired-items.csv"),
                UploadFormat.CSV, LowAlloySteelRound.pairedItems()));

        assertThat(accepted.results()).extracting(r -> r.measurand() + "/" + r.item())
                .containsExactly("C/A", "Si/A", "Mn/A", "C/B", "Si/B", "Mn/B");
        assertThat(accepted.warnings()).filteredOn(w -> w.key().equals("measurand.not-reported")).hasSize(14);
    }

    @Test
    void requiredColumnsAloneAreEnoughAndTheCoverageFactorDefaultsToTwo() {
        IntakeResult.Accepted accepted = read("required-columns-only.csv");

        ReportedResult manganese = accepted.results().get(0);
        assertThat(manganese.expandedUncertainty()).isEmpty();
        assertThat(manganese.coverageFactor()).isEqualTo(ReportedResult.DEFAULT_COVERAGE_FACTOR);
        assertThat(manganese.coverageFactorReported()).isFalse();
        assertThat(manganese.replicateValues()).isEmpty();
    }
}
