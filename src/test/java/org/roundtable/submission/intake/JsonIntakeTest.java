package org.roundtable.submission.intake;

import static org.assertj.core.api.Assertions.assertThat;
import static org.roundtable.submission.intake.IntakeTestSupport.accepted;
import static org.roundtable.submission.intake.IntakeTestSupport.rejected;
import static org.roundtable.submission.intake.IntakeTestSupport.resource;
import static org.roundtable.submission.intake.IntakeTestSupport.utf8;

import java.math.BigDecimal;
import org.junit.jupiter.api.Test;

/** The JSON channel: strings and numbers, the same validation and canonical payload as CSV. */
class JsonIntakeTest {

    private final ResultIntake intake = new ResultIntake();

    @Test
    void jsonWithStringValuesGivesTheSameCanonicalPayloadAsTheCsv() {
        IntakeResult.Accepted fromJson = accepted(intake.read(resource("accepted/results.json"), UploadFormat.JSON,
                LowAlloySteelRound.singleItem()));
        IntakeResult.Accepted fromCsv = accepted(intake.read(resource("accepted/comma.csv"), UploadFormat.CSV,
                LowAlloySteelRound.singleItem()));

        assertThat(fromJson.results()).hasSize(10);
        assertThat(fromJson.detection()).isEqualTo(new Detection(UploadFormat.JSON, "UTF-8", false, null, '.'));
        assertThat(fromJson.canonicalJson()).isEqualTo(fromCsv.canonicalJson());
        assertThat(fromJson.sha256()).isEqualTo(fromCsv.sha256());
    }

    @Test
    void jsonNumbersKeepTheirDecimalsAsReadIntoBigDecimal() {
        String upload = "{\"results\":[{\"measurand\":\"Cr\",\"value\":1.050,\"unit\":\"%\","
                + "\"expandedUncertainty\":0.025,\"method\":\"spark-oes\",\"replicates\":3,"
                + "\"replicateValues\":[1.048,1.050,1.052]}]}";

        ReportedResult chromium = accepted(intake.read(utf8(upload), UploadFormat.JSON,
                LowAlloySteelRound.singleItem())).results().get(0);

        assertThat(chromium.valueAsReported()).isEqualTo("1.050");
        assertThat(chromium.value().value()).isEqualTo(new BigDecimal("1.050"));
        assertThat(chromium.expandedUncertainty().orElseThrow().asReported()).isEqualTo("0.025");
        assertThat(chromium.replicateValues()).extracting(ReportedNumber::asReported)
                .containsExactly("1.048", "1.050", "1.052");
        assertThat(chromium.replicateCount()).isEqualTo(3);
    }

    @Test
    void aJsonNumberWithAnExponentIsReadAsItsPlainDecimal() {
        String upload = "{\"results\":[{\"measurand\":\"S\",\"value\":8e-3,\"unit\":\"%\",\"method\":\"combustion\","
                + "\"replicates\":2}]}";

        ReportedResult sulfur = accepted(intake.read(utf8(upload), UploadFormat.JSON,
                LowAlloySteelRound.singleItem())).results().get(0);

        assertThat(sulfur.valueAsReported()).isEqualTo("0.008");
    }

    @Test
    void aUtf8ByteOrderMarkBeforeJsonIsSkippedAndReported() {
        byte[] bom = {(byte) 0xEF, (byte) 0xBB, (byte) 0xBF};
        byte[] json = utf8("{\"results\":[{\"measurand\":\"Mn\",\"value\":\"1.215\",\"unit\":\"%\","
                + "\"method\":\"spark-oes\",\"replicates\":3}]}");
        byte[] upload = new byte[bom.length + json.length];
        System.arraycopy(bom, 0, upload, 0, bom.length);
        System.arraycopy(json, 0, upload, bom.length, json.length);

        IntakeResult.Accepted accepted = accepted(intake.read(upload, UploadFormat.JSON,
                LowAlloySteelRound.singleItem()));

        assertThat(accepted.detection().byteOrderMark()).isTrue();
    }

    @Test
    void everyProblemOfEveryResultIsListedWithIndexPlusOneAndTheFieldName() {
        String upload = "{\"results\":["
                + "{\"measurand\":\"Mn\",\"value\":\"1.215\",\"unit\":\"%\",\"method\":\"spark-oes\",\"replicates\":3},"
                + "{\"measurand\":\"Xq\",\"value\":\"0.2\",\"unit\":\"%\",\"method\":\"spark-oes\",\"replicates\":3},"
                + "{\"measurand\":\"Si\",\"value\":\"abc\",\"unit\":\"ppm\",\"method\":\"spark-oes\",\"replicates\":3}"
                + "]}";

        IntakeResult.Rejected rejected = rejected(intake.read(utf8(upload), UploadFormat.JSON,
                LowAlloySteelRound.singleItem()));

        assertThat(rejected.problems()).extracting(p -> p.row() + " " + p.column() + " " + p.key())
                .containsExactly("2 measurand measurand.unknown-element", "3 unit unit.unknown",
                        "3 value value.not-a-number");
    }

    @Test
    void aPairedRoundNeedsTheItemOfEachJsonResult() {
        String upload = "{\"results\":[{\"measurand\":\"Mn\",\"value\":\"1.215\",\"unit\":\"%\","
                + "\"method\":\"spark-oes\",\"replicates\":3}]}";

        IntakeResult.Rejected rejected = rejected(intake.read(utf8(upload), UploadFormat.JSON,
                LowAlloySteelRound.pairedItems()));

        assertThat(rejected.problems()).extracting(IntakeProblem::row, IntakeProblem::column, IntakeProblem::key)
                .containsExactly(org.assertj.core.groups.Tuple.tuple(1, "item", "value.missing"));
    }
}
