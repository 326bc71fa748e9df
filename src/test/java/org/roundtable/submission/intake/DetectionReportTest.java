package org.roundtable.submission.intake;

import static org.assertj.core.api.Assertions.assertThat;
import static org.roundtable.submission.intake.IntakeTestSupport.rejected;
import static org.roundtable.submission.intake.IntakeTestSupport.utf8;

import java.nio.charset.StandardCharsets;
import org.junit.jupiter.api.Test;

/** What was detected about a file is reported back with a rejection too, and encoding messages say what to do. */
class DetectionReportTest {

    private final ResultIntake intake = new ResultIntake();

    @Test
    void aRejectedSemicolonFileWithByteOrderMarkStillReportsItsDetection() {
        byte[] upload = ("\uFEFFmeasurand;value;unit;method;replicates\nXx;0,5;%;spark-oes;3\n")
                .getBytes(StandardCharsets.UTF_8);

        IntakeResult.Rejected rejected = rejected(intake.read(upload, UploadFormat.CSV,
                LowAlloySteelRound.singleItem()));

        assertThat(rejected.detection()).isEqualTo(new Detection(UploadFormat.CSV, "UTF-8", true, ';', ','));
        assertThat(rejected.problems()).extracting(IntakeProblem::key).containsExactly("measurand.unknown-element");
    }

    @Test
    void aUtf16FileIsRefusedWithAHintToSaveItAsUtf8() {
        byte[] upload = "\uFEFFmeasurand,value\n".getBytes(StandardCharsets.UTF_16LE);

        IntakeResult.Rejected rejected = rejected(intake.read(upload, UploadFormat.CSV,
                LowAlloySteelRound.singleItem()));

        assertThat(rejected.problems()).singleElement().satisfies(problem -> {
            assertThat(problem.key()).isEqualTo("file.not-utf8");
            assertThat(problem.message()).contains("UTF-16", "UTF-8");
        });
    }

    @Test
    void aLatin1FileIsRefusedAtTheRowOfTheFirstBadByte() {
        byte[] upload = "measurand,value,unit,method,replicates\nMn,1.215,%,spark-oes,3\nN,85,µg/g,x,2\n"
                .getBytes(StandardCharsets.ISO_8859_1);

        IntakeResult.Rejected rejected = rejected(intake.read(upload, UploadFormat.CSV,
                LowAlloySteelRound.singleItem()));

        assertThat(rejected.problems()).singleElement().satisfies(problem -> {
            assertThat(problem.key()).isEqualTo("file.not-utf8");
            assertThat(problem.row()).isEqualTo(3);
            assertThat(problem.value()).contains("0xB5");
        });
    }

    @Test
    void theDeclaredTypeMustMatchTheContent() {
        IntakeResult.Rejected asXlsx = rejected(intake.read(utf8("measurand,value\n"), UploadFormat.XLSX,
                LowAlloySteelRound.singleItem()));
        IntakeResult.Rejected asJson = rejected(intake.read(new byte[] {'M', 'Z', 0, 0}, UploadFormat.JSON,
                LowAlloySteelRound.singleItem()));

        assertThat(asXlsx.problems()).extracting(IntakeProblem::key).containsExactly("file.type-mismatch");
        assertThat(asJson.problems()).extracting(IntakeProblem::key).containsExactly("file.type-mismatch");
        assertThat(UploadFormat.fromFileName("Results.XLSX")).contains(UploadFormat.XLSX);
        assertThat(UploadFormat.fromFileName("results.xlsm")).isEmpty();
    }
}
