package org.roundtable.report;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.enterprise.event.Event;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.platform.Timestamps;
import org.roundtable.audit.Actor;
import org.roundtable.audit.AuditTrail;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;
import org.roundtable.report.model.ReportIdentity;
import org.roundtable.report.model.ReportStatus;

import java.time.Clock;
import java.time.Instant;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.time.temporal.ChronoUnit;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import java.util.regex.Pattern;

/**
 * The store of issued documents: the exact bytes handed out and their SHA-256 (table {@code issued_document},
 * append-only for every role). Issuing is the only write; an amendment is a new document that names the one
 * it replaces, and "superseded by" is always read from that newer document.
 */
@ApplicationScoped
public class IssuedDocuments {

    /** A SHA-256 as this service stores and accepts it: 64 lower-case hex digits. */
    public static final Pattern SHA256 = Pattern.compile("[0-9a-f]{64}");

    private static final String COLUMNS = """
            SELECT d.id, d.report_id, d.kind, d.status, d.round_id, d.laboratory_id, r.report_id, d.amendment_reason,
                   d.sha256, d.issued_at,
                   COALESCE(n.report_id, CASE WHEN d.status = 'PRELIMINARY' AND d.round_id IS NOT NULL THEN
                       (SELECT f.report_id FROM issued_document f
                         WHERE f.round_id = d.round_id AND f.kind = d.kind AND f.status = 'FINAL'
                           AND f.laboratory_id IS NOT DISTINCT FROM d.laboratory_id
                         ORDER BY f.issued_at, f.id LIMIT 1) END)
              FROM issued_document d
              LEFT JOIN issued_document r ON r.id = d.replaces_document_id
              LEFT JOIN issued_document n ON n.replaces_document_id = d.id
            """;

    private final EntityManager entityManager;
    private final AuditTrail audit;
    private final Clock clock;
    private final Event<RoundReportIssued> roundReportIssued;

    public IssuedDocuments(EntityManager entityManager, AuditTrail audit, Clock clock,
                           Event<RoundReportIssued> roundReportIssued) {
        this.entityManager = entityManager;
        this.audit = audit;
        this.clock = clock;
        this.roundReportIssued = roundReportIssued;
    }

    /**
     * A document to issue.
     *
     * @param identity the identity printed on the document (report number, status, what it replaces and why)
     * @param kind round, laboratory or history export
     * @param roundId the round, if any
     * @param laboratoryId the laboratory, for laboratory reports and history exports
     * @param contentType the media type of {@code bytes}, e.g. {@code application/pdf}
     * @param bytes the exact bytes handed out
     * @param evaluationRunId the evaluation run (row id) a round or laboratory report was rendered from, if any
     */
    public record Issue(ReportIdentity identity, DocumentKind kind, Long roundId, Long laboratoryId, String contentType,
                        byte[] bytes, Long evaluationRunId) {

        /** A document that reports no evaluation run. */
        public Issue(ReportIdentity identity, DocumentKind kind, Long roundId, Long laboratoryId, String contentType,
                     byte[] bytes) {
            this(identity, kind, roundId, laboratoryId, contentType, bytes, null);
        }

        public Issue {
            Objects.requireNonNull(identity, "identity");
            Objects.requireNonNull(kind, "kind");
            Objects.requireNonNull(contentType, "contentType");
            Objects.requireNonNull(bytes, "bytes");
            if (bytes.length == 0) {
                throw new IllegalArgumentException("an issued document has content");
            }
        }
    }

    /**
     * Stores the document's bytes and SHA-256 and records one audit event, in the caller's transaction (or a
     * new one). An amendment must name an issued report that no other document has replaced yet.
     *
     * @throws DomainException.Conflict when the report number or the exact bytes were issued before, or the
     *                                  replaced report is unknown or already superseded
     */
    @Transactional
    public IssuedDocument issue(Issue issue, Actor actor) {
        ReportIdentity identity = issue.identity();
        if (find("WHERE d.report_id = :v", identity.reportId()).isPresent()) {
            throw new DomainException.Conflict("Report " + identity.reportId() + " has been issued already; issue an amendment with a new report number.");
        }
        String sha256 = Secrets.sha256Hex(issue.bytes());
        if (find("WHERE d.sha256 = :v", sha256).isPresent()) {
            throw new DomainException.Conflict("A document with exactly these bytes has been issued already.");
        }
        Long replaces = null;
        if (identity.status() == ReportStatus.AMENDED) {
            IssuedDocument replaced = find("WHERE d.report_id = :v", identity.replacesReportId())
                    .orElseThrow(() -> new DomainException.Conflict("The replaced report " + identity.replacesReportId() + " has not been issued."));
            if (replaced.supersededBy() != null) {
                throw new DomainException.Conflict("Report " + replaced.reportId() + " has already been replaced by " + replaced.supersededBy() + ".");
            }
            replaces = replaced.id();
        }
        Instant now = Instant.now(clock).truncatedTo(ChronoUnit.MICROS);
        Number id = (Number) entityManager.createNativeQuery("""
                INSERT INTO issued_document (report_id, kind, status, round_id, laboratory_id, replaces_document_id,
                       amendment_reason, content_type, bytes, sha256, issued_at, issued_by, evaluation_run_id)
                VALUES (:reportId, :kind, :status, :round, :lab, :replaces, :reason, :type, :bytes, :sha, :at, :by,
                        :run)
                RETURNING id
                """)
                .setParameter("reportId", identity.reportId())
                .setParameter("kind", issue.kind().name())
                .setParameter("status", identity.status().name())
                .setParameter("round", issue.roundId())
                .setParameter("lab", issue.laboratoryId())
                .setParameter("replaces", replaces)
                .setParameter("reason", identity.status() == ReportStatus.AMENDED ? identity.amendmentReason() : null)
                .setParameter("type", issue.contentType())
                .setParameter("bytes", issue.bytes())
                .setParameter("sha", sha256)
                .setParameter("at", OffsetDateTime.ofInstant(now, ZoneOffset.UTC))
                .setParameter("by", actor.name())
                .setParameter("run", issue.evaluationRunId())
                .getSingleResult();
        audit.record(new AuditTrail.Event(actor, "report.issue", "issued_document", Long.toString(id.longValue()),
                null, sha256, issue.kind().name() + " " + identity.status().name() + " " + identity.reportId()
                + (identity.replacesReportId() == null ? "" : " replaces " + identity.replacesReportId())));
        if (issue.kind() == DocumentKind.ROUND && issue.roundId() != null && issue.evaluationRunId() != null) {
            Number version = (Number) entityManager.createNativeQuery("SELECT version FROM evaluation_run WHERE id = :id")
                    .setParameter("id", issue.evaluationRunId()).getSingleResult();
            roundReportIssued.fire(new RoundReportIssued(id.longValue(), identity.reportId(), identity.status().name(),
                    issue.roundId(), issue.evaluationRunId(), version.intValue(), sha256, now, replaces));
        }
        return byId(id.longValue()).orElseThrow();
    }

    /** The issued document with this row id. */
    @Transactional
    public Optional<IssuedDocument> byId(long documentId) {
        return find("WHERE d.id = :v", documentId);
    }

    /** The issued document with this report number. */
    @Transactional
    public Optional<IssuedDocument> byReportId(String reportId) {
        return find("WHERE d.report_id = :v", reportId);
    }

    /** The round's issued documents, oldest first. */
    @Transactional
    public List<IssuedDocument> ofRound(long roundId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery(COLUMNS + "WHERE d.round_id = :v ORDER BY d.issued_at, d.id")
                .setParameter("v", roundId).getResultList();
        return rows.stream().map(IssuedDocuments::read).toList();
    }

    /** How many documents the round has issued (for paging {@link #pageOfRound}). */
    @Transactional
    public long countOfRound(long roundId) {
        return ((Number) entityManager.createNativeQuery("SELECT count(*) FROM issued_document WHERE round_id = :v")
                .setParameter("v", roundId).getSingleResult()).longValue();
    }

    /** One page of the round's issued documents, newest first: {@code limit} rows after the first {@code offset}. */
    @Transactional
    public List<IssuedDocument> pageOfRound(long roundId, int offset, int limit) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery(COLUMNS
                        + "WHERE d.round_id = :v ORDER BY d.issued_at DESC, d.id DESC LIMIT :limit OFFSET :offset")
                .setParameter("v", roundId).setParameter("limit", limit).setParameter("offset", offset)
                .getResultList();
        return rows.stream().map(IssuedDocuments::read).toList();
    }

    /** The evaluation run (row id) a document reports, if any. */
    @Transactional
    public Optional<Long> evaluationRunOf(long documentId) {
        @SuppressWarnings("unchecked")
        List<Number> rows = entityManager.createNativeQuery(
                        "SELECT evaluation_run_id FROM issued_document WHERE id = :id AND evaluation_run_id IS NOT NULL")
                .setParameter("id", documentId).getResultList();
        return rows.stream().findFirst().map(Number::longValue);
    }

    /** The issued document with exactly this SHA-256 (lower-case hex), if any. */
    @Transactional
    public Optional<IssuedDocument> verify(String sha256) {
        if (sha256 == null || !SHA256.matcher(sha256).matches()) {
            throw new DomainException.BadRequest("A SHA-256 is 64 lower-case hexadecimal digits.");
        }
        return find("WHERE d.sha256 = :v", sha256);
    }

    /**
     * The report number of the newer document that replaces this one, read from that document's link (an amendment);
     * a preliminary report is replaced by the final report of the same kind (and laboratory) once that is issued.
     */
    @Transactional
    public Optional<String> supersededBy(long documentId) {
        return byId(documentId).map(IssuedDocument::supersededBy);
    }

    /** Keeps the HTML view of an issued document beside it (once; a document's view never changes). */
    @Transactional
    public void attachHtml(long documentId, String html) {
        entityManager.createNativeQuery("INSERT INTO issued_document_html (document_id, html) VALUES (:id, :html)")
                .setParameter("id", documentId).setParameter("html", html).executeUpdate();
    }

    /** The HTML view of an issued document; empty for documents issued before views were kept. */
    @Transactional
    public Optional<String> html(long documentId) {
        @SuppressWarnings("unchecked")
        List<String> rows = entityManager.createNativeQuery("SELECT html FROM issued_document_html WHERE document_id = :id")
                .setParameter("id", documentId).getResultList();
        return rows.stream().findFirst();
    }

    /** The exact bytes issued. */
    @Transactional
    public Optional<byte[]> content(long documentId) {
        @SuppressWarnings("unchecked")
        List<byte[]> rows = entityManager.createNativeQuery("SELECT bytes FROM issued_document WHERE id = :id")
                .setParameter("id", documentId).getResultList();
        return rows.stream().findFirst();
    }

    private Optional<IssuedDocument> find(String where, Object value) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery(COLUMNS + where).setParameter("v", value).getResultList();
        return rows.stream().findFirst().map(IssuedDocuments::read);
    }

    private static IssuedDocument read(Object[] row) {
        return new IssuedDocument(((Number) row[0]).longValue(), (String) row[1], DocumentKind.valueOf((String) row[2]),
                ReportStatus.valueOf((String) row[3]), row[4] == null ? null : ((Number) row[4]).longValue(),
                row[5] == null ? null : ((Number) row[5]).longValue(), (String) row[6], (String) row[7],
                row[8].toString().strip(), Timestamps.utc(row[9]).toInstant(), (String) row[10]);
    }
}
