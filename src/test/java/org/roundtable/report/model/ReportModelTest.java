package org.roundtable.report.model;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.time.LocalDate;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.roundtable.report.SampleRoundBuilder;

/** The model's own rules: amendments name what they replace, identities stay out, references resolve. */
class ReportModelTest {

    private final RoundReport round = SampleRoundBuilder.lowAlloySteel().build();

    @Test
    void anAmendedReportMustNameTheReportItReplacesAndTheReason() {
        assertThatThrownBy(() -> new ReportIdentity("R2", ReportStatus.AMENDED, null, "typo", LocalDate.of(2026, 11, 20),
                "Provider")).isInstanceOf(IllegalArgumentException.class);
        assertThatThrownBy(() -> new ReportIdentity("R2", ReportStatus.AMENDED, "R1", " ", LocalDate.of(2026, 11, 20),
                "Provider")).isInstanceOf(IllegalArgumentException.class);
    }

    @Test
    void aLaboratoryReportIsOnlyForAParticipantOfTheRound() {
        assertThat(new LaboratoryReport(round, "P03").ownParticipantCode()).isEqualTo("P03");
        assertThatThrownBy(() -> new LaboratoryReport(round, "P99")).isInstanceOf(IllegalArgumentException.class);
    }

    @Test
    void aLaboratoryReportNamesTheRoundReportWithEveryonesResults() {
        assertThat(new LaboratoryReport(round, "P03").roundReportId()).isEqualTo(round.identity().reportId());
        assertThat(new LaboratoryReport(round, "P03", "LAS-2026-2-R-F").roundReportId()).isEqualTo("LAS-2026-2-R-F");
        assertThatThrownBy(() -> new LaboratoryReport(round, "P03", null)).isInstanceOf(NullPointerException.class);
    }

    @Test
    void aSchemeThatRequiresASecondReviewerCannotIssueWithoutOne() {
        Signatures coordinatorOnly = new Signatures(round.signatures().coordinator(), null);
        assertThatThrownBy(() -> new RoundReport(round.identity(), round.scheme(), round.round(), round.item(),
                round.measurands(), round.pairs(), round.evaluation(), "", coordinatorOnly,
                round.confidentialityStatement(), round.advice())).isInstanceOf(IllegalArgumentException.class);
    }

    @Test
    void pairsMustReferToMeasurandsOfTheReport() {
        assertThatThrownBy(() -> new RoundReport(round.identity(), round.scheme(), round.round(), round.item(),
                round.measurands(), List.of(new PairedItems("Mn-A", "Mo-B")), round.evaluation(), "",
                round.signatures(), round.confidentialityStatement(), round.advice()))
                .isInstanceOf(IllegalArgumentException.class);
    }

    @Test
    void participantResultsCarryCodesAndNoIdentityFields() {
        assertThat(ParticipantResult.class.getRecordComponents())
                .extracting(c -> c.getName().toLowerCase())
                .noneMatch(name -> name.contains("name") || name.contains("laboratory") || name.contains("address")
                        || name.contains("email"));
    }

    @Test
    void listsInTheModelCannotBeChangedAfterwards() {
        assertThatThrownBy(() -> round.measurands().clear()).isInstanceOf(UnsupportedOperationException.class);
        assertThatThrownBy(() -> round.measurands().get(0).results().clear())
                .isInstanceOf(UnsupportedOperationException.class);
    }
}
