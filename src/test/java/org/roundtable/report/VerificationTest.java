package org.roundtable.report;

import io.quarkus.narayana.jta.QuarkusTransaction;
import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.roundtable.platform.Secrets;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.report.model.RoundReport;
import org.roundtable.report.render.PdfReportRenderer;
import org.roundtable.testing.World;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.OutputStream;
import java.net.Socket;
import java.net.URL;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.Map;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;
import static org.hamcrest.Matchers.containsString;
import static org.hamcrest.Matchers.equalTo;
import static org.hamcrest.Matchers.nullValue;

/**
 * Public verification, over HTTP and without signing in: an issued PDF (by its bytes or its hash) is
 * recognised; a one-byte change or an unknown hash is not, and then only the hash is echoed; a malformed hash
 * is 400, an oversized body 413; an amended report points to its newer version. Documents: real PDFs of the
 * invented low-alloy steel round.
 */
@QuarkusTest
class VerificationTest {

    private static final PdfReportRenderer RENDERER = new PdfReportRenderer();
    private static final String API = "/api/v1/reports/verify";

    @Inject
    IssuedDocuments documents;

    @Inject
    VerificationRateLimit rateLimit;

    @Inject
    World world;

    @TestHTTPResource("/")
    URL baseUrl;

    private String reportId;
    private byte[] pdf;
    private IssuedDocument issued;

    @BeforeEach
    void anIssuedRoundReport() {
        IssuedDocumentsTest.sampleRound();
        reportId = World.unique("LAS-V");
        RoundReport report = IssuedDocumentsTest.withIdentity(ReportStatus.FINAL, reportId, null, null);
        pdf = RENDERER.render(report);
        issued = QuarkusTransaction.requiringNew().call(() -> documents.issue(new IssuedDocuments.Issue(report.identity(),
                DocumentKind.ROUND, 7L, null, "application/pdf", pdf), IssuedDocumentsTest.COORDINATOR));
    }

    @Test
    void theIssuedDocumentItselfVerifies() {
        Response response = given().contentType("application/pdf").body(pdf).post(API);
        response.then().statusCode(200)
                .body("issued", equalTo(true))
                .body("reportId", equalTo(reportId))
                .body("kind", equalTo("ROUND"))
                .body("status", equalTo("FINAL"))
                .body("issuedAt", equalTo(issued.issuedAt().toString()))
                .body("supersededBy", nullValue())
                .body("sha256", equalTo(Secrets.sha256Hex(pdf)));
        Map<String, Object> body = response.jsonPath().getMap("$");
        assertThat(body).containsOnlyKeys("issued", "reportId", "kind", "status", "issuedAt", "supersededBy", "sha256");
    }

    @Test
    void itsHashVerifiesWithoutSigningInOrACsrfToken() {
        given().contentType("application/json").header("Origin", "https://elsewhere.example")
                .body("{\"sha256\":\"" + issued.sha256() + "\"}").post(API)
                .then().statusCode(200).body("issued", equalTo(true)).body("reportId", equalTo(reportId));
    }

    @Test
    void aOneByteChangeIsNotIssued() {
        byte[] changed = Arrays.copyOf(pdf, pdf.length);
        changed[changed.length / 2] ^= 0x01;
        Response response = given().contentType("application/pdf").body(changed).post(API);
        response.then().statusCode(200).body("issued", equalTo(false)).body("sha256", equalTo(Secrets.sha256Hex(changed)));
        assertThat(response.jsonPath().getMap("$")).containsOnlyKeys("issued", "sha256");
    }

    @Test
    void anUnknownHashIsNotIssuedAndOnlyTheHashIsEchoed() {
        String unknown = Secrets.sha256Hex("never issued " + reportId);
        Response response = given().contentType("application/json").body("{\"sha256\":\"" + unknown + "\"}").post(API);
        response.then().statusCode(200).body("issued", equalTo(false)).body("sha256", equalTo(unknown));
        assertThat(response.jsonPath().getMap("$")).containsOnlyKeys("issued", "sha256");
    }

    @Test
    void aMalformedHashIs400() {
        for (String body : new String[]{"{}", "{\"sha256\":\"abc\"}", "{\"sha256\":\"" + issued.sha256().toUpperCase() + "\"}",
                "{\"sha256\":\"" + "g".repeat(64) + "\"}", "{\"sha256\":42}", "not json"}) {
            assertThat(given().contentType("application/json").body(body).post(API).statusCode()).as(body).isEqualTo(400);
        }
    }

    /**
     * A body over 20 MiB is refused with 413 as soon as its length is announced, before it is read; the
     * request is written by hand because HTTP clients give up when the server closes the unread upload.
     */
    @Test
    void anOversizedDocumentIs413() throws IOException {
        try (Socket socket = new Socket(baseUrl.getHost(), baseUrl.getPort())) {
            socket.setSoTimeout(10_000);
            OutputStream out = socket.getOutputStream();
            out.write(("POST " + API + " HTTP/1.1\r\nHost: " + baseUrl.getHost() + ":" + baseUrl.getPort()
                    + "\r\nContent-Type: application/pdf\r\nContent-Length: " + (Verifier.MAX_DOCUMENT_BYTES + 1)
                    + "\r\nExpect: 100-continue\r\n\r\n").getBytes(StandardCharsets.US_ASCII));
            out.flush();
            String statusLine = new BufferedReader(new InputStreamReader(socket.getInputStream(), StandardCharsets.US_ASCII))
                    .readLine();
            assertThat(statusLine).startsWith("HTTP/1.1 413");
        }
    }

    @Test
    void aDocumentAtTheLimitIsRead() {
        byte[] large = new byte[Verifier.MAX_DOCUMENT_BYTES];
        given().contentType("application/pdf").body(large).post(API)
                .then().statusCode(200).body("issued", equalTo(false)).body("sha256", equalTo(Secrets.sha256Hex(large)));
    }

    @Test
    void anAmendedReportPointsToItsNewerVersion() {
        String newer = World.unique("LAS-V");
        RoundReport amended = IssuedDocumentsTest.withIdentity(ReportStatus.AMENDED, newer, reportId, "Mn result of P03 corrected");
        byte[] amendedPdf = RENDERER.render(amended);
        QuarkusTransaction.requiringNew().run(() -> documents.issue(new IssuedDocuments.Issue(amended.identity(),
                DocumentKind.ROUND, 7L, null, "application/pdf", amendedPdf), IssuedDocumentsTest.COORDINATOR));

        given().contentType("application/pdf").body(pdf).post(API)
                .then().statusCode(200).body("issued", equalTo(true)).body("supersededBy", equalTo(newer));
        given().contentType("application/pdf").body(amendedPdf).post(API)
                .then().statusCode(200).body("status", equalTo("AMENDED")).body("supersededBy", nullValue());
    }

    @Test
    void nothingConfidentialIsRevealed() {
        String answer = given().contentType("application/pdf").body(pdf).post(API).asString();
        assertThat(answer).doesNotContain("roundId", "laboratoryId", "issuedBy", IssuedDocumentsTest.COORDINATOR.name(),
                "\"id\"");
    }

    @Test
    void theRateLimitCountsPerClientAndMinuteInTheDatabase() {
        String client = World.unique("client");
        for (int i = 0; i < 3; i++) {
            assertThat(rateLimit.admit(client, 3)).isTrue();
        }
        assertThat(rateLimit.admit(client, 3)).isFalse();
        assertThat(rateLimit.admit(World.unique("another-client"), 3)).isTrue();
    }

    @Test
    void aPersonCanPasteTheHashOrUploadTheDocumentOnThePage() {
        String[] form = world.anonymousForm();
        given().get("/verify").then().statusCode(200).body(containsString("name=\"_csrf\""));
        given().cookie("rt_form", form[0]).multiPart("_csrf", form[1])
                .multiPart("sha256", "  " + issued.sha256().toUpperCase() + " ").post("/verify")
                .then().statusCode(200).body(containsString("Issued here")).body(containsString(reportId));
        given().cookie("rt_form", form[0]).multiPart("_csrf", form[1])
                .multiPart("file", "report.pdf", pdf, "application/pdf").post("/verify")
                .then().statusCode(200).body(containsString("Issued here")).body(containsString(reportId));
        byte[] changed = Arrays.copyOf(pdf, pdf.length);
        changed[10] ^= 0x01;
        given().cookie("rt_form", form[0]).multiPart("_csrf", form[1])
                .multiPart("file", "report.pdf", changed, "application/pdf").post("/verify")
                .then().statusCode(200).body(containsString("Not issued here"));
        given().cookie("rt_form", form[0]).multiPart("_csrf", form[1]).multiPart("sha256", "xyz").post("/verify")
                .then().statusCode(400).body(containsString("64 lower-case hexadecimal"));
    }

    @Test
    void thePageFormNeedsItsCsrfToken() {
        given().multiPart("sha256", issued.sha256()).post("/verify").then().statusCode(403);
    }

    @Test
    void aPreliminaryReportReplacedByTheFinalOneSaysSoAndLinksTheFinalOne() {
        long round = world.round(org.roundtable.scheme.RoundState.CLOSED, world.laboratory());
        String preliminaryId = World.unique("LAS-P");
        RoundReport preliminary = IssuedDocumentsTest.withIdentity(ReportStatus.PRELIMINARY, preliminaryId, null, null);
        byte[] preliminaryPdf = RENDERER.render(preliminary);
        QuarkusTransaction.requiringNew().run(() -> documents.issue(new IssuedDocuments.Issue(preliminary.identity(),
                DocumentKind.ROUND, round, null, "application/pdf", preliminaryPdf), IssuedDocumentsTest.COORDINATOR));
        // before the final report the preliminary one is current
        given().contentType("application/pdf").body(preliminaryPdf).post(API)
                .then().statusCode(200).body("supersededBy", nullValue());

        String finalId = World.unique("LAS-F");
        RoundReport finalReport = IssuedDocumentsTest.withIdentity(ReportStatus.FINAL, finalId, null, null);
        byte[] finalPdf = RENDERER.render(finalReport);
        IssuedDocument issuedFinal = QuarkusTransaction.requiringNew().call(() -> documents.issue(new IssuedDocuments.Issue(
                finalReport.identity(), DocumentKind.ROUND, round, null, "application/pdf", finalPdf),
                IssuedDocumentsTest.COORDINATOR));

        given().contentType("application/pdf").body(preliminaryPdf).post(API)
                .then().statusCode(200).body("status", equalTo("PRELIMINARY")).body("supersededBy", equalTo(finalId));
        String[] form = world.anonymousForm();
        given().cookie("rt_form", form[0]).multiPart("_csrf", form[1])
                .multiPart("file", "report.pdf", preliminaryPdf, "application/pdf").post("/verify")
                .then().statusCode(200).body(containsString("no longer the current version"))
                .body(containsString("The final report"))
                .body(containsString(finalId))
                .body(containsString("/verify?sha256=" + issuedFinal.sha256()));
        // the link fills in the newer document's fingerprint, ready to verify
        given().get("/verify?sha256=" + issuedFinal.sha256()).then().statusCode(200)
                .body(containsString("value=\"" + issuedFinal.sha256() + "\""));
    }

    @Test
    void anAmendedReportSaysOnThePageThatItWasReplaced() {
        String newer = World.unique("LAS-V");
        RoundReport amended = IssuedDocumentsTest.withIdentity(ReportStatus.AMENDED, newer, reportId, "Mn result of P03 corrected");
        byte[] amendedPdf = RENDERER.render(amended);
        QuarkusTransaction.requiringNew().run(() -> documents.issue(new IssuedDocuments.Issue(amended.identity(),
                DocumentKind.ROUND, 7L, null, "application/pdf", amendedPdf), IssuedDocumentsTest.COORDINATOR));
        String[] form = world.anonymousForm();
        given().cookie("rt_form", form[0]).multiPart("_csrf", form[1]).multiPart("sha256", issued.sha256()).post("/verify")
                .then().statusCode(200).body(containsString("no longer the current version"))
                .body(containsString("The amended report")).body(containsString(newer));
        given().cookie("rt_form", form[0]).multiPart("_csrf", form[1]).multiPart("sha256", Secrets.sha256Hex(amendedPdf))
                .post("/verify").then().statusCode(200).body(org.hamcrest.Matchers.not(containsString("no longer the current")));
    }
}
