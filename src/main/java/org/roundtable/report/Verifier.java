package org.roundtable.report;

import io.vertx.core.http.HttpServerRequest;
import jakarta.enterprise.context.RequestScoped;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;

import java.util.LinkedHashMap;
import java.util.Map;

/**
 * The public verification shared by the API and the page: size and rate limits, then a look-up by SHA-256.
 * The answer names only what the document itself says (report number, kind, status, date of issue) plus
 * the newer version if there is one — never the round's or the laboratory's id or name.
 */
@RequestScoped
public class Verifier {

    /**
     * The largest document accepted: 20 MiB. The same value as {@code quarkus.http.limits.max-body-size},
     * which refuses larger bodies before they reach the application; this check keeps the answer 413 if
     * the global limit is ever raised.
     */
    public static final int MAX_DOCUMENT_BYTES = 20 * 1024 * 1024;

    /**
     * The verification of one SHA-256: the issued document, or {@code null} when it was not issued here; {@code newer}
     * the document that replaced it (an amendment, or the final report for a preliminary one), else {@code null}.
     */
    public record Answer(String sha256, IssuedDocument document, IssuedDocument newer) {

        public Answer(String sha256, IssuedDocument document) {
            this(sha256, document, null);
        }

        public boolean issued() {
            return document != null;
        }

        /** Whether the final report replaced this preliminary one (else an amendment replaced it). */
        public boolean replacedByFinal() {
            return superseded() && document.status() == org.roundtable.report.model.ReportStatus.PRELIMINARY;
        }

        /** Whether a later document replaced this one. */
        public boolean superseded() {
            return document != null && document.supersededBy() != null;
        }

        /** The JSON body: every field when issued; only {@code issued} and {@code sha256} when not. */
        public Map<String, Object> json() {
            Map<String, Object> body = new LinkedHashMap<>();
            body.put("issued", issued());
            if (issued()) {
                body.put("reportId", document.reportId());
                body.put("kind", document.kind().name());
                body.put("status", document.status().name());
                body.put("issuedAt", document.issuedAt().toString());
                body.put("supersededBy", document.supersededBy());
            }
            body.put("sha256", sha256);
            return body;
        }
    }

    /** Too many verifications from one client in a minute. */
    public static class TooManyRequests extends DomainException {
        public TooManyRequests() {
            super(429, "Too many requests", "Too many verifications from this address; try again in a minute.");
        }
    }

    /** The body is larger than {@link #MAX_DOCUMENT_BYTES}. */
    public static class TooLarge extends DomainException {
        public TooLarge() {
            super(413, "Too large", "A document to verify may be at most 20 MiB.");
        }
    }

    private final IssuedDocuments documents;
    private final VerificationRateLimit rateLimit;
    private final HttpServerRequest request;

    public Verifier(IssuedDocuments documents, VerificationRateLimit rateLimit, HttpServerRequest request) {
        this.documents = documents;
        this.rateLimit = rateLimit;
        this.request = request;
    }

    /** Verifies a document by its bytes (counted against the caller's rate limit). */
    public Answer document(byte[] bytes) {
        admit();
        if (bytes.length > MAX_DOCUMENT_BYTES) {
            throw new TooLarge();
        }
        return lookUp(Secrets.sha256Hex(bytes));
    }

    /**
     * Verifies a SHA-256 given as 64 lower-case hex digits (counted against the caller's rate limit).
     *
     * @throws DomainException.BadRequest for anything else
     */
    public Answer hash(String sha256) {
        admit();
        if (sha256 == null || !IssuedDocuments.SHA256.matcher(sha256).matches()) {
            throw new DomainException.BadRequest("A SHA-256 is 64 lower-case hexadecimal digits.");
        }
        return lookUp(sha256);
    }

    private Answer lookUp(String sha256) {
        IssuedDocument found = documents.verify(sha256).orElse(null);
        IssuedDocument newer = found == null || found.supersededBy() == null ? null
                : documents.byReportId(found.supersededBy()).orElse(null);
        return new Answer(sha256, found, newer);
    }

    /** Counts this request against the caller's limit. */
    public void admit() {
        String address = request.remoteAddress() == null ? null : request.remoteAddress().hostAddress();
        if (!rateLimit.admit(address)) {
            throw new TooManyRequests();
        }
    }
}
