package org.roundtable.scheme;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.apache.poi.xssf.usermodel.XSSFRow;
import org.apache.poi.xssf.usermodel.XSSFSheet;
import org.apache.poi.xssf.usermodel.XSSFWorkbook;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * The sample qualification page: homogeneity and stability data as a CSV or XLSX file or pasted text, read by the
 * intake's readers; a bad file is refused with its reason beside the field and the pasted text kept.
 * Figures: the worked example of {@link HomogeneityWorkedExampleTest} (statistics reference §14.8, CALC:
 * s_s = 0.0116905, s_w = 0.0167332, √c = 0.0444382 for σpt = 0.10 %), shown at Cr's 2 reporting digits + 1.
 */
@QuarkusTest
class QualificationPagesTest {

    @Inject
    World world;

    private long round;
    private World.Browser coordinator;

    @BeforeEach
    void round() {
        round = world.round(RoundState.ENROLLING, world.laboratory());
        coordinator = world.signIn(world.user("coordinator", null));
    }

    @Test
    void aHomogeneityCsvFileIsCheckedAndEachCriterionShowsWithItsVerdict() {
        Response page = upload("homogeneity", "homogeneity.csv", HomogeneityWorkedExampleTest.csv().getBytes(StandardCharsets.UTF_8), "");
        assertThat(page.statusCode()).as(page.asString()).isEqualTo(200);
        String html = page.asString();
        assertThat(html).contains("Homogeneity data checked.").contains("id=\"checks-Cr\"");
        // §14.8: s_s 0.0116905 → 0.012, 0.3 σpt = 0.030, √c 0.0444382 → 0.044, s_w 0.0167332 → 0.017
        assertThat(html).contains(">0.012<").contains(">0.030<").contains(">0.044<").contains(">0.017<")
                .contains("sufficient").doesNotContain("0.0116905");
        assertThat(world.insert("SELECT count(*) FROM qualification_check WHERE round_id = ? AND kind = 'HOMOGENEITY'", round))
                .isEqualTo(1);
    }

    @Test
    void anXlsxWorkbookOfHomogeneityAndStabilityDataIsReadLikeTheCsv() {
        Response homogeneity = upload("homogeneity", "homogeneity.xlsx", workbook(HomogeneityWorkedExampleTest.csv()), "");
        assertThat(homogeneity.statusCode()).as(homogeneity.asString()).isEqualTo(200);
        Response stability = upload("stability", "stability.xlsx",
                workbook(HomogeneityWorkedExampleTest.resource("/scheme/stability-cr-stainless.csv")), "");
        assertThat(stability.statusCode()).as(stability.asString()).isEqualTo(200);
        assertThat(stability.asString()).contains("Stability data checked.").contains("Stability |ȳ1 − ȳ2|");
        assertThat(world.insert("SELECT count(*) FROM qualification_check WHERE round_id = ?", round)).isEqualTo(2);
        // the stored data are the same canonical lines whichever way they came
        assertThat(world.text("SELECT data_csv FROM qualification_check WHERE round_id = ? AND kind = 'HOMOGENEITY'", round))
                .startsWith("item,replicate,measurand,value\nH01,1,Cr,18.12\n");
    }

    @Test
    void aMalformedFileIsRefusedWithItsReasonBesideTheFieldAndNothingIsStored() {
        Response wrongHeader = upload("homogeneity", "homogeneity.csv",
                HomogeneityWorkedExampleTest.csv().replace("item,replicate", "sample,replicate").getBytes(StandardCharsets.UTF_8), "");
        assertThat(wrongHeader.statusCode()).isEqualTo(400);
        assertThat(wrongHeader.asString()).contains("id=\"homogeneity-problem\"").contains("Line 1: the header must be");

        Response notAWorkbook = upload("homogeneity", "homogeneity.xlsx", "item,replicate\n".getBytes(StandardCharsets.UTF_8), "");
        assertThat(notAWorkbook.statusCode()).isEqualTo(400);
        assertThat(notAWorkbook.asString()).contains("id=\"homogeneity-problem\"").contains("not a workbook");

        Response latin1 = upload("stability", "stability.csv", "item,measurand,value\nS1,Cr,18.1\u00e9\n"
                .getBytes(StandardCharsets.ISO_8859_1), "");
        assertThat(latin1.statusCode()).isEqualTo(400);
        assertThat(latin1.asString()).contains("id=\"stability-problem\"").contains("not valid UTF-8");

        Response pdf = upload("homogeneity", "homogeneity.txt", "x".getBytes(StandardCharsets.UTF_8), "");
        assertThat(pdf.statusCode()).isEqualTo(400);
        assertThat(pdf.asString()).contains("Upload a .csv or .xlsx file.");
        assertThat(world.insert("SELECT count(*) FROM qualification_check WHERE round_id = ?", round)).isZero();
    }

    @Test
    void pastedTextWithAMistakeIsRefusedAndKeptInTheTextArea() {
        String pasted = HomogeneityWorkedExampleTest.csv().replace("H02,1,Cr,18.15", "H02,1,Cr,eighteen");
        Response refused = upload("homogeneity", null, null, pasted);
        assertThat(refused.statusCode()).isEqualTo(400);
        assertThat(refused.asString()).contains("Line 4, column value").contains("H02,1,Cr,eighteen")
                .contains("aria-invalid=\"true\"");
        Response both = upload("homogeneity", "homogeneity.csv", HomogeneityWorkedExampleTest.csv().getBytes(StandardCharsets.UTF_8), pasted);
        assertThat(both.statusCode()).isEqualTo(400);
        assertThat(both.asString()).contains("not both").contains("H02,1,Cr,eighteen");
        assertThat(world.insert("SELECT count(*) FROM qualification_check WHERE round_id = ?", round)).isZero();
    }

    @Test
    void aDecisionWithoutTheReasonItNeedsIsRefusedBesideItsFieldWithTheChoiceKept() {
        Response refused = coordinator.form().formParam("element", "Cr").formParam("decision", "WIDEN_SIGMA_PT")
                .formParam("reason", "").post("/rounds/" + round + "/qualification/decisions");
        assertThat(refused.statusCode()).isEqualTo(400);
        assertThat(refused.asString()).contains("id=\"decision-problem-Cr\"").contains("needs a reason")
                .contains("value=\"WIDEN_SIGMA_PT\" selected");
    }

    private Response upload(String kind, String fileName, byte[] content, String text) {
        var request = coordinator.request().header("X-CSRF-Token", coordinator.csrfToken())
                .multiPart("_csrf", coordinator.csrfToken()).multiPart("csv", text);
        if (fileName != null) {
            request = request.multiPart("file", fileName, content, "application/octet-stream");
        }
        return request.post("/rounds/" + round + "/qualification/" + kind);
    }

    /** The CSV lines as the first sheet of a workbook, numbers as number cells (as a spreadsheet saves them). */
    private static byte[] workbook(String csv) {
        try (XSSFWorkbook book = new XSSFWorkbook(); ByteArrayOutputStream out = new ByteArrayOutputStream()) {
            XSSFSheet sheet = book.createSheet("data");
            String[] lines = csv.split("\n");
            for (int i = 0; i < lines.length; i++) {
                XSSFRow row = sheet.createRow(i);
                String[] cells = lines[i].strip().split(",");
                for (int c = 0; c < cells.length; c++) {
                    if (i > 0 && cells[c].matches("[0-9.]+")) {
                        row.createCell(c).setCellValue(Double.parseDouble(cells[c]));
                    } else {
                        row.createCell(c).setCellValue(cells[c]);
                    }
                }
            }
            book.write(out);
            return out.toByteArray();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
