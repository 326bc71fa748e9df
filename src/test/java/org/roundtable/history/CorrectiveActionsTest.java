package org.roundtable.history;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.testing.World;

import java.nio.charset.StandardCharsets;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

/** The corrective-action record on PostgreSQL: who may do what, attachments by signature, frozen once closed. */
@QuarkusTest
class CorrectiveActionsTest {

    private static final byte[] PDF = "%PDF-1.7\n% evidence\n%%EOF\n".getBytes(StandardCharsets.US_ASCII);
    private static final byte[] PNG = {(byte) 0x89, 'P', 'N', 'G', 0x0D, 0x0A, 0x1A, 0x0A, 0, 0, 0, 0};
    private static final byte[] GIF = "GIF89a....".getBytes(StandardCharsets.US_ASCII);

    @Inject
    World world;

    @Inject
    HistoryRounds rounds;

    record Lab(long id, long round, World.Browser member, World.Browser manager) {
    }

    /** A laboratory with one unsatisfactory result (z = +3.5) and one satisfactory (z = +0.5). */
    private Lab lab() {
        long lab = world.laboratory();
        long scheme = rounds.scheme();
        long bad = rounds.published(scheme, lab, "18.35", ReportStatus.FINAL);
        rounds.published(scheme, lab, "18.05", ReportStatus.FINAL);
        return new Lab(lab, bad, world.signIn(world.user("lab-member", lab)), world.signIn(world.user("lab-manager", lab)));
    }

    private long open(Lab lab) {
        Response created = lab.member().form().formParam("result", lab.round() + ":Cr:A")
                .formParam("cause", "Drift of the spectrometer after a lamp change")
                .formParam("actionTaken", "Recalibrated; added a check sample to every shift")
                .formParam("evidence", "Calibration record 2026-11").post("/my-laboratory/corrective-actions");
        assertThat(created.statusCode()).isEqualTo(303);
        String location = created.header("Location");
        return Long.parseLong(location.substring(location.lastIndexOf('/') + 1));
    }

    private Response attach(World.Browser who, long id, String name, byte[] bytes, String type) {
        return who.request().multiPart("_csrf", who.csrfToken()).multiPart("file", name, bytes, type)
                .post("/my-laboratory/corrective-actions/" + id + "/attachments");
    }

    @Test
    void aMemberRecordsAnEntryForAnUnsatisfactoryResultAndAttachesEvidenceCheckedBySignature() {
        Lab lab = lab();
        long id = open(lab);
        String page = lab.member().request().get("/my-laboratory/corrective-actions/" + id).then().statusCode(200)
                .extract().asString();
        assertThat(page).contains("Drift of the spectrometer", "unsatisfactory");

        assertThat(attach(lab.member(), id, "record.pdf", PDF, "application/pdf").statusCode()).isEqualTo(200);
        assertThat(attach(lab.member(), id, "photo.png", PNG, "image/png").statusCode()).isEqualTo(200);
        // named and typed as a PDF, but its bytes are a GIF
        Response refused = attach(lab.member(), id, "fake.pdf", GIF, "application/pdf");
        assertThat(refused.statusCode()).isEqualTo(422);
        assertThat(refused.asString()).contains("PDF, PNG or JPEG");
        Response large = attach(lab.member(), id, "big.pdf", bigPdf(), "application/pdf");
        assertThat(large.statusCode()).isEqualTo(413);

        assertThat(world.text("SELECT count(*) FROM corrective_action_attachment WHERE action_id = ?", id)).isEqualTo("2");
        assertThat(world.text("SELECT count(*) FROM audit_event WHERE object_type = 'corrective-action' AND object_id = ?",
                Long.toString(id))).isEqualTo("3");
        // the attachment comes back as stored
        long attachment = world.insert("SELECT min(id) FROM corrective_action_attachment WHERE action_id = ?", id);
        byte[] back = lab.member().request().get("/my-laboratory/corrective-actions/" + id + "/attachments/" + attachment)
                .then().statusCode(200).extract().asByteArray();
        assertThat(back).isEqualTo(PDF);
    }

    private static byte[] bigPdf() {
        byte[] b = new byte[CorrectiveActions.MAX_ATTACHMENT_BYTES + 1];
        System.arraycopy(PDF, 0, b, 0, PDF.length);
        return b;
    }

    @Test
    void anEntryIsOnlyForQuestionableOrUnsatisfactoryResultsOfTheLaboratory() {
        Lab lab = lab();
        long satisfactoryRound = world.insert("SELECT max(round_id) FROM history_score WHERE laboratory_id = ?", lab.id());
        Response refused = lab.member().form().formParam("result", satisfactoryRound + ":Cr:A")
                .formParam("cause", "typed text is kept").post("/my-laboratory/corrective-actions");
        assertThat(refused.statusCode()).isEqualTo(422);
        assertThat(refused.asString()).contains("questionable or unsatisfactory", "typed text is kept");
        Lab other = lab();
        assertThat(other.member().form().formParam("result", lab.round() + ":Cr:A").post("/my-laboratory/corrective-actions")
                .statusCode()).isEqualTo(422);
        long id = open(lab);
        assertThat(other.member().request().get("/my-laboratory/corrective-actions/" + id).statusCode()).isEqualTo(404);
    }

    @Test
    void onlyTheManagerClosesAfterConfirmingAndAClosedEntryIsFrozenInTheApplicationAndTheDatabase() {
        Lab lab = lab();
        long id = open(lab);
        assertThat(lab.member().form().formParam("confirm", "yes").post("/my-laboratory/corrective-actions/" + id + "/close")
                .statusCode()).isEqualTo(403);
        assertThat(lab.manager().form().post("/my-laboratory/corrective-actions/" + id + "/close").statusCode())
                .isEqualTo(400);
        assertThat(lab.manager().form().formParam("confirm", "yes").post("/my-laboratory/corrective-actions/" + id + "/close")
                .statusCode()).isEqualTo(200);

        Response edit = lab.member().form().formParam("version", "1").formParam("cause", "changed")
                .post("/my-laboratory/corrective-actions/" + id);
        assertThat(edit.statusCode()).isEqualTo(409);
        assertThat(attach(lab.member(), id, "late.pdf", PDF, "application/pdf").statusCode()).isEqualTo(409);
        assertThat(world.text("SELECT cause FROM corrective_action WHERE id = ?", id)).startsWith("Drift");

        // the database refuses too: the trigger refuses an update of a closed row for every role; a delete is
        // refused by the revoked privilege (the application role) and by the trigger (any other role)
        assertThatThrownBy(() -> world.sql("UPDATE corrective_action SET cause = 'rewritten' WHERE id = ?", id))
                .hasMessageContaining("closed");
        assertThatThrownBy(() -> world.sql("DELETE FROM corrective_action WHERE id = ?", id))
                .hasMessageMatching("(?s).*(never deleted|permission denied).*");
        byte[] pdf = PDF;
        assertThatThrownBy(() -> world.sql("INSERT INTO corrective_action_attachment (action_id, file_name, content_type, "
                + "bytes, sha256, added_by, added_at) VALUES (?, 'x.pdf', 'application/pdf', ?, ?, 'test', now())", id, pdf,
                org.roundtable.platform.Secrets.sha256Hex(pdf))).hasMessageContaining("closed");

        // a correction is a new entry that names the closed one, once
        Response correction = lab.member().form().post("/my-laboratory/corrective-actions/" + id + "/corrections");
        assertThat(correction.statusCode()).isEqualTo(303);
        String location = correction.header("Location");
        long newId = Long.parseLong(location.substring(location.lastIndexOf('/') + 1));
        assertThat(world.text("SELECT corrects_id FROM corrective_action WHERE id = ?", newId)).isEqualTo(Long.toString(id));
        assertThat(lab.member().form().post("/my-laboratory/corrective-actions/" + id + "/corrections").statusCode())
                .isEqualTo(409);
        assertThat(world.text("SELECT count(*) FROM audit_event WHERE object_type = 'corrective-action' AND action IN "
                + "('corrective-action.closed', 'corrective-action.corrected') AND object_id IN (?, ?)",
                Long.toString(id), Long.toString(newId))).isEqualTo("2");
    }

    @Test
    void aStaleEditIsRefusedAndTheTypedTextKept() {
        Lab lab = lab();
        long id = open(lab);
        assertThat(lab.member().form().formParam("version", "0").formParam("cause", "first edit")
                .formParam("actionTaken", "a").post("/my-laboratory/corrective-actions/" + id).statusCode()).isEqualTo(200);
        Response stale = lab.manager().form().formParam("version", "0").formParam("cause", "second edit, typed")
                .post("/my-laboratory/corrective-actions/" + id);
        assertThat(stale.statusCode()).isEqualTo(409);
        assertThat(stale.asString()).contains("second edit, typed");
    }

    @Test
    void coordinatorsAndGrantedAuditorsReadTheEntriesWithTheHistory() {
        Lab lab = lab();
        open(lab);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        assertThat(coordinator.request().get("/api/v1/laboratories/" + lab.id() + "/corrective-actions").then()
                .statusCode(200).extract().jsonPath().getList("cause")).containsExactly("Drift of the spectrometer after a lamp change");
        String auditor = world.user("auditor", null);
        World.Browser a = world.signIn(auditor);
        assertThat(a.request().get("/api/v1/laboratories/" + lab.id() + "/corrective-actions").statusCode()).isEqualTo(404);
        world.grant(lab.id(), auditor);
        assertThat(a.request().get("/laboratories/" + lab.id() + "/history").then().statusCode(200).extract().asString())
                .contains("Drift of the spectrometer");
    }
}
