package org.roundtable.submission.intake;

import static org.assertj.core.api.Assertions.assertThat;
import static org.roundtable.submission.intake.IntakeTestSupport.accepted;
import static org.roundtable.submission.intake.IntakeTestSupport.utf8;

import java.io.IOException;
import java.util.List;
import org.junit.jupiter.api.Test;

/** The canonical JSON of accepted results and its SHA-256: fixed text, independent of channel and row order. */
class CanonicalPayloadTest {

    private final ResultIntake intake = new ResultIntake();

    private static final String CSV = "measurand,value,unit,expanded_uncertainty,method,replicates,replicate_values\n"
            + "S,<0.002,%,,combustion,2,\n"
            + "Mn,1.230,%,0.030,spark-oes,3,1.22|1.23|1.24\n";

    @Test
    void theCanonicalJsonHasSortedKeysSortedResultsAndReportedDecimals() {
        IntakeResult.Accepted accepted = accepted(intake.read(utf8(CSV), UploadFormat.CSV,
                LowAlloySteelRound.singleItem()));

        assertThat(accepted.canonicalJson()).isEqualTo("{\"formatVersion\":1,\"results\":["
                + "{\"coverageFactor\":\"2\",\"expandedUncertainty\":\"0.030\",\"item\":\"1\",\"lessThan\":false,"
                + "\"measurand\":\"Mn\",\"method\":\"spark-oes\",\"replicateValues\":[\"1.22\",\"1.23\",\"1.24\"],"
                + "\"replicates\":3,\"unit\":\"%\",\"value\":\"1.230\"},"
                + "{\"coverageFactor\":\"2\",\"expandedUncertainty\":null,\"item\":\"1\",\"lessThan\":true,"
                + "\"measurand\":\"S\",\"method\":\"combustion\",\"replicateValues\":[],"
                + "\"replicates\":2,\"unit\":\"%\",\"value\":\"0.002\"}]}");
    }

    @Test
    void theHashIsTheSha256OfTheUtf8BytesOfTheCanonicalJson() {
        IntakeResult.Accepted accepted = accepted(intake.read(utf8(CSV), UploadFormat.CSV,
                LowAlloySteelRound.singleItem()));

        assertThat(accepted.sha256()).isEqualTo(CanonicalPayload.sha256Hex(accepted.canonicalJson()));
        assertThat(accepted.sha256()).hasSize(64).matches("[0-9a-f]{64}");
        // FIPS 180-4 example "abc"; the value is the published test vector
        assertThat(CanonicalPayload.sha256Hex("abc"))
                .isEqualTo("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    }

    @Test
    void theSameResultsThroughCsvXlsxAndJsonGiveTheSameHash() throws IOException {
        String json = "{\"results\":["
                + "{\"measurand\":\"Mn\",\"value\":\"1.230\",\"unit\":\"%\",\"expandedUncertainty\":\"0.030\","
                + "\"method\":\"spark-oes\",\"replicates\":3,\"replicateValues\":[\"1.22\",\"1.23\",\"1.24\"]},"
                + "{\"measurand\":\"S\",\"value\":\"<0.002\",\"unit\":\"%\",\"method\":\"combustion\",\"replicates\":2}"
                + "]}";
        byte[] xlsx = XlsxIntakeTest.workbook(List.of(
                List.of("measurand", "value", "unit", "expanded_uncertainty", "method", "replicates",
                        "replicate_values"),
                List.of("S", "<0.002", "%", "", "combustion", "2", ""),
                List.of("Mn", "1.230", "%", "0.030", "spark-oes", "3", "1.22|1.23|1.24")), null, 0);
        String semicolonCsv = CSV.replace(',', ';').replace('.', ',');

        String fromCsv = accepted(intake.read(utf8(CSV), UploadFormat.CSV, LowAlloySteelRound.singleItem())).sha256();
        String fromSemicolonCsv = accepted(intake.read(utf8(semicolonCsv), UploadFormat.CSV,
                LowAlloySteelRound.singleItem())).sha256();
        String fromXlsx = accepted(intake.read(xlsx, UploadFormat.XLSX, LowAlloySteelRound.singleItem())).sha256();
        String fromJson = accepted(intake.read(utf8(json), UploadFormat.JSON, LowAlloySteelRound.singleItem()))
                .sha256();

        assertThat(List.of(fromSemicolonCsv, fromXlsx, fromJson)).containsOnly(fromCsv);
    }

    @Test
    void aDifferentReportedDecimalGivesADifferentHash() {
        String moreDecimals = CSV.replace("1.230", "1.23");

        String original = accepted(intake.read(utf8(CSV), UploadFormat.CSV, LowAlloySteelRound.singleItem())).sha256();
        String changed = accepted(intake.read(utf8(moreDecimals), UploadFormat.CSV, LowAlloySteelRound.singleItem()))
                .sha256();

        assertThat(changed).isNotEqualTo(original);
    }
}
