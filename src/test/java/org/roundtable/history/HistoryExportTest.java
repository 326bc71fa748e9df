package org.roundtable.history;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.platform.Secrets;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.testing.World;

import java.nio.charset.StandardCharsets;
import java.util.Arrays;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;

/** The assessor's export: issued as HISTORY_EXPORT documents, verifiable, and a one-byte change is not. */
@QuarkusTest
class HistoryExportTest {

    private static final String VERIFY = "/api/v1/reports/verify";

    @Inject
    World world;

    @Inject
    HistoryRounds rounds;

    private static io.restassured.path.json.JsonPath verifyHash(byte[] document) {
        return given().contentType("application/json").body("{\"sha256\":\"" + Secrets.sha256Hex(document) + "\"}")
                .post(VERIFY).then().statusCode(200).extract().jsonPath();
    }

    @Test
    void theExportIsIssuedAsAPdfAndACsvThatVerifyAndAOneByteChangeDoesNot() throws java.io.IOException {
        long lab = world.laboratory();
        long scheme = rounds.scheme();
        rounds.published(scheme, lab, "18.10", ReportStatus.FINAL);
        rounds.published(scheme, lab, "18.35", ReportStatus.FINAL);
        World.Browser member = world.signIn(world.user("lab-member", lab));

        Response unconfirmed = member.form().formParam("from", "2020-01-01").post("/my-laboratory/history/exports");
        assertThat(unconfirmed.statusCode()).isEqualTo(400);
        assertThat(unconfirmed.asString()).contains("Confirm", "2020-01-01");
        assertThat(world.text("SELECT count(*) FROM issued_document WHERE kind = 'HISTORY_EXPORT' AND laboratory_id = ?", lab))
                .isEqualTo("0");

        Response issued = member.form().formParam("confirm", "yes").post("/my-laboratory/history/exports");
        assertThat(issued.statusCode()).isEqualTo(200);
        assertThat(world.text("SELECT count(*) FROM issued_document WHERE kind = 'HISTORY_EXPORT' AND laboratory_id = ?", lab))
                .isEqualTo("2");
        long pdfId = world.insert("SELECT id FROM issued_document WHERE kind = 'HISTORY_EXPORT' AND laboratory_id = ? "
                + "AND content_type = 'application/pdf'", lab);
        long csvId = world.insert("SELECT id FROM issued_document WHERE kind = 'HISTORY_EXPORT' AND laboratory_id = ? "
                + "AND content_type = 'text/csv'", lab);
        byte[] pdf = member.request().get("/my-laboratory/history/exports/" + pdfId).then().statusCode(200).extract().asByteArray();
        byte[] csv = member.request().get("/my-laboratory/history/exports/" + csvId).then().statusCode(200).extract().asByteArray();
        assertThat(new String(pdf, 0, 5, StandardCharsets.US_ASCII)).isEqualTo("%PDF-");
        // the scores over rounds are drawn in the PDF, as on the history page, with their caption
        try (org.apache.pdfbox.pdmodel.PDDocument document = org.apache.pdfbox.Loader.loadPDF(pdf)) {
            assertThat(new org.apache.pdfbox.text.PDFTextStripper().getText(document))
                    .contains("score used (z or z′) over rounds");
        }
        String text = new String(csv, StandardCharsets.UTF_8);
        assertThat(text).startsWith(String.join(",", HistoryExports.COLUMNS));
        assertThat(text.lines()).hasSize(3);
        // each round report is named with its SHA-256
        String roundReportSha = world.text("SELECT report_sha256 FROM history_publication p JOIN history_score s "
                + "ON s.document_id = p.document_id WHERE s.laboratory_id = ? LIMIT 1", lab);
        assertThat(text).contains(roundReportSha.strip());

        // the PDF as uploaded, the CSV by its SHA-256 (the API takes PDFs or a hash)
        assertThat(given().contentType("application/pdf").body(pdf).post(VERIFY).jsonPath().getBoolean("issued")).isTrue();
        byte[] changedPdf = Arrays.copyOf(pdf, pdf.length);
        changedPdf[changedPdf.length / 2] ^= 0x01;
        assertThat(given().contentType("application/pdf").body(changedPdf).post(VERIFY).jsonPath().getBoolean("issued"))
                .isFalse();
        byte[] changedCsv = Arrays.copyOf(csv, csv.length);
        changedCsv[changedCsv.length / 2] ^= 0x01;
        assertThat(verifyHash(csv).getBoolean("issued")).isTrue();
        assertThat(verifyHash(csv).getString("kind")).isEqualTo("HISTORY_EXPORT");
        assertThat(verifyHash(changedCsv).getBoolean("issued")).isFalse();
        assertThat(verifyHash(pdf).getString("kind")).isEqualTo("HISTORY_EXPORT");

        // another laboratory cannot download it
        World.Browser other = world.signIn(world.user("lab-member", world.laboratory()));
        assertThat(other.request().get("/my-laboratory/history/exports/" + pdfId).statusCode()).isEqualTo(404);
    }
}
