package org.roundtable.report;

import io.agroal.api.AgroalDataSource;
import io.quarkus.agroal.DataSource;
import io.quarkus.narayana.jta.QuarkusTransaction;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.roundtable.audit.Actor;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;
import org.roundtable.report.model.LaboratoryReport;
import org.roundtable.report.model.ReportIdentity;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.report.model.RoundReport;
import org.roundtable.report.render.PdfReportRenderer;
import org.roundtable.testing.World;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

/**
 * Issuing stores the exact bytes and their SHA-256, once; an amendment is a new document linked to the one it
 * replaces; nothing issued can be changed or removed, by the application role or by the owner.
 * Documents: real PDFs of the invented low-alloy steel round ({@link SampleRoundBuilder#lowAlloySteel()}).
 */
@QuarkusTest
class IssuedDocumentsTest {

    static final Actor COORDINATOR = new Actor("coordinator-test", "coordinator", null);

    private static RoundReport round;
    private static final PdfReportRenderer RENDERER = new PdfReportRenderer();

    @Inject
    IssuedDocuments documents;

    @Inject
    AgroalDataSource application;

    @Inject
    @DataSource("owner")
    AgroalDataSource owner;

    @BeforeAll
    static void sampleRound() {
        round = SampleRoundBuilder.lowAlloySteel().build();
    }

    /** The sample round re-identified, so that each test issues its own report numbers and bytes. */
    static RoundReport withIdentity(ReportStatus status, String reportId, String replaces, String reason) {
        ReportIdentity identity = new ReportIdentity(reportId, status, replaces, reason, round.identity().issueDate(),
                round.identity().providerName());
        return new RoundReport(identity, round.scheme(), round.round(), round.item(), round.measurands(), round.pairs(),
                round.evaluation(), round.coordinatorComments(), round.signatures(), round.confidentialityStatement(),
                round.advice());
    }

    static String reportId() {
        return World.unique("LAS-T");
    }

    IssuedDocument issue(RoundReport report, DocumentKind kind, Long laboratoryId, byte[] bytes) {
        return QuarkusTransaction.requiringNew().call(() -> documents.issue(new IssuedDocuments.Issue(report.identity(),
                kind, null, laboratoryId, "application/pdf", bytes), COORDINATOR));
    }

    @Test
    void issuingStoresTheExactBytesAndTheirSha256() {
        RoundReport report = withIdentity(ReportStatus.FINAL, reportId(), null, null);
        byte[] pdf = RENDERER.render(report);
        IssuedDocument issued = issue(report, DocumentKind.ROUND, null, pdf);

        assertThat(issued.sha256()).isEqualTo(Secrets.sha256Hex(pdf));
        assertThat(issued.reportId()).isEqualTo(report.identity().reportId());
        assertThat(issued.status()).isEqualTo(ReportStatus.FINAL);
        assertThat(issued.supersededBy()).isNull();
        assertThat(documents.content(issued.id())).hasValueSatisfying(b -> assertThat(b).isEqualTo(pdf));
        assertThat(documents.verify(issued.sha256())).hasValueSatisfying(d -> assertThat(d.id()).isEqualTo(issued.id()));
    }

    @Test
    void issuingIsAuditedOnce() throws SQLException {
        RoundReport report = withIdentity(ReportStatus.PRELIMINARY, reportId(), null, null);
        IssuedDocument issued = issue(report, DocumentKind.ROUND, null, RENDERER.render(report));
        try (Connection c = application.getConnection(); PreparedStatement s = c.prepareStatement(
                "SELECT count(*), max(after_hash) FROM audit_event WHERE action = 'report.issue' AND object_id = ?")) {
            s.setString(1, Long.toString(issued.id()));
            try (ResultSet rs = s.executeQuery()) {
                rs.next();
                assertThat(rs.getInt(1)).isEqualTo(1);
                assertThat(rs.getString(2)).isEqualTo(issued.sha256());
            }
        }
    }

    @Test
    void aLaboratoryReportIsIssuedWithItsLaboratory() {
        RoundReport report = withIdentity(ReportStatus.FINAL, reportId(), null, null);
        byte[] pdf = RENDERER.render(new LaboratoryReport(report, "P05"));
        IssuedDocument issued = issue(report, DocumentKind.LABORATORY, 42L, pdf);
        assertThat(issued.kind()).isEqualTo(DocumentKind.LABORATORY);
        assertThat(issued.laboratoryId()).isEqualTo(42L);
    }

    @Test
    void anAmendmentIsANewVersionAndTheOldOneIsUnchanged() throws SQLException {
        String firstId = reportId();
        RoundReport first = withIdentity(ReportStatus.FINAL, firstId, null, null);
        IssuedDocument original = issue(first, DocumentKind.ROUND, null, RENDERER.render(first));
        String before = rowFingerprint(original.id());

        String secondId = reportId();
        RoundReport second = withIdentity(ReportStatus.AMENDED, secondId, firstId, "Cr result of P11 corrected");
        IssuedDocument amendment = issue(second, DocumentKind.ROUND, null, RENDERER.render(second));

        assertThat(amendment.replacesReportId()).isEqualTo(firstId);
        assertThat(amendment.amendmentReason()).isEqualTo("Cr result of P11 corrected");
        assertThat(amendment.supersededBy()).isNull();
        assertThat(documents.supersededBy(original.id())).hasValue(secondId);
        assertThat(documents.byId(original.id()).orElseThrow().supersededBy()).isEqualTo(secondId);
        assertThat(rowFingerprint(original.id())).as("the replaced row itself is untouched").isEqualTo(before);
    }

    @Test
    void aReportIsReplacedOnlyOnceAndOnlyWhenIssued() {
        String firstId = reportId();
        RoundReport first = withIdentity(ReportStatus.FINAL, firstId, null, null);
        issue(first, DocumentKind.ROUND, null, RENDERER.render(first));
        RoundReport second = withIdentity(ReportStatus.AMENDED, reportId(), firstId, "corrected");
        issue(second, DocumentKind.ROUND, null, RENDERER.render(second));

        RoundReport third = withIdentity(ReportStatus.AMENDED, reportId(), firstId, "corrected again");
        assertThatThrownBy(() -> issue(third, DocumentKind.ROUND, null, RENDERER.render(third)))
                .isInstanceOf(DomainException.Conflict.class).hasMessageContaining("already been replaced");
        RoundReport orphan = withIdentity(ReportStatus.AMENDED, reportId(), "NEVER-ISSUED", "corrected");
        assertThatThrownBy(() -> issue(orphan, DocumentKind.ROUND, null, RENDERER.render(orphan)))
                .isInstanceOf(DomainException.Conflict.class).hasMessageContaining("has not been issued");
    }

    @Test
    void nothingIsIssuedTwice() {
        RoundReport report = withIdentity(ReportStatus.FINAL, reportId(), null, null);
        byte[] pdf = RENDERER.render(report);
        issue(report, DocumentKind.ROUND, null, pdf);
        assertThatThrownBy(() -> issue(report, DocumentKind.ROUND, null, pdf))
                .isInstanceOf(DomainException.Conflict.class).hasMessageContaining("issued already");
    }

    @Test
    void theApplicationRoleCannotUpdateDeleteOrTruncateAnIssuedDocument() throws SQLException {
        RoundReport report = withIdentity(ReportStatus.FINAL, reportId(), null, null);
        IssuedDocument issued = issue(report, DocumentKind.ROUND, null, RENDERER.render(report));
        try (Connection c = application.getConnection(); Statement s = c.createStatement()) {
            for (String sql : new String[]{
                    "UPDATE issued_document SET status = 'FINAL', bytes = '\\x00'::bytea WHERE id = " + issued.id(),
                    "DELETE FROM issued_document WHERE id = " + issued.id(),
                    "TRUNCATE issued_document"}) {
                assertThatThrownBy(() -> s.executeUpdate(sql)).as(sql).isInstanceOf(SQLException.class)
                        .satisfies(e -> assertThat(((SQLException) e).getSQLState()).isEqualTo("42501"));
            }
        }
        assertThat(documents.byId(issued.id())).hasValueSatisfying(d -> assertThat(d.sha256()).isEqualTo(issued.sha256()));
    }

    @Test
    void evenTheOwnerIsRefusedByTheAppendOnlyTrigger() throws SQLException {
        RoundReport report = withIdentity(ReportStatus.FINAL, reportId(), null, null);
        IssuedDocument issued = issue(report, DocumentKind.ROUND, null, RENDERER.render(report));
        try (Connection c = owner.getConnection(); Statement s = c.createStatement()) {
            assertThat(c.getMetaData().getUserName()).isNotEqualTo("roundtable_app");
            assertThatThrownBy(() -> s.executeUpdate("UPDATE issued_document SET amendment_reason = 'x' WHERE id = " + issued.id()))
                    .isInstanceOf(SQLException.class).hasMessageContaining("append-only");
            assertThatThrownBy(() -> s.executeUpdate("DELETE FROM issued_document WHERE id = " + issued.id()))
                    .isInstanceOf(SQLException.class).hasMessageContaining("append-only");
            // CASCADE: tables that refer to issued documents (report comments) would otherwise refuse first
            assertThatThrownBy(() -> s.executeUpdate("TRUNCATE issued_document CASCADE"))
                    .isInstanceOf(SQLException.class).hasMessageContaining("append-only");
        }
        assertThat(documents.byId(issued.id())).isPresent();
    }

    private String rowFingerprint(long id) throws SQLException {
        try (Connection c = application.getConnection(); PreparedStatement s = c.prepareStatement(
                "SELECT md5(row(d.*)::text) FROM issued_document d WHERE id = ?")) {
            s.setLong(1, id);
            try (ResultSet rs = s.executeQuery()) {
                rs.next();
                return rs.getString(1);
            }
        }
    }
}
