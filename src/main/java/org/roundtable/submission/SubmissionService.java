package org.roundtable.submission;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import io.quarkus.narayana.jta.QuarkusTransaction;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import org.hibernate.Session;
import org.roundtable.account.CurrentUser;
import org.roundtable.account.SessionKey;
import org.roundtable.audit.AuditTrail;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.IdempotencyStore;
import org.roundtable.platform.Secrets;
import org.roundtable.scheme.ResultTiming;
import org.roundtable.scheme.RoundAccess;
import org.roundtable.submission.intake.Detection;
import org.roundtable.submission.intake.IntakeResult;
import org.roundtable.submission.intake.IntakeWarning;
import org.roundtable.submission.intake.PrecisionIntake;
import org.roundtable.submission.intake.ReportedNumber;
import org.roundtable.submission.intake.ReportedResult;
import org.roundtable.submission.intake.ResultIntake;
import org.roundtable.submission.intake.UploadFormat;

import java.nio.charset.StandardCharsets;
import java.sql.PreparedStatement;
import java.sql.Types;
import java.time.Clock;
import java.time.Duration;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.HexFormat;
import java.util.List;
import java.util.Optional;
import java.util.stream.Collectors;

/**
 * Accepting a laboratory's results: one validation path for every channel (form, CSV, XLSX, JSON API), all or
 * nothing, each accepted submit a new immutable revision with a receipt given only after commit.
 *
 * <p>Order of work: the upload is parsed and validated first, outside any transaction, with the round's upload
 * rules as {@link SubmissionRules} keeps them (a rejected upload writes nothing). Then, in one transaction: the round
 * row is read under a shared lock in one statement with the laboratory's enrolment and the stamp of the upload rules
 * (a lifecycle step waits for writes in flight, so a submit racing the close is fully in or refused); a laboratory
 * not enrolled gets 404 before any verdict on its upload; if the rules changed (or were not kept yet) the upload is
 * read again with the new ones; the Idempotency-Key, if any, is claimed (a retry gets the original receipt); the
 * laboratory's submission row is created or locked by one upsert (so two simultaneous submits become revisions n and
 * n+1); the current revision is read with what it reports in one statement; the revision, its results (one JDBC
 * batch) and the uploaded file are written; review flags are raised; one audit event records the revision with its
 * payload hash. A first submission without Idempotency-Key sends 7 statements in this transaction
 * ({@code SubmissionStatementsTest} holds the whole request to its budget).
 */
@ApplicationScoped
public class SubmissionService {

    /** How close two submissions from one client address must be to be flagged. */
    static final Duration NEAR_SIMULTANEOUS = Duration.ofMinutes(2);

    public enum Channel { FORM, CSV, XLSX, JSON, CORRECTION }

    /** What was sent: the bytes as received, their format and (for files) a name for the record. */
    public record Upload(Channel channel, UploadFormat format, byte[] content, String fileName, String contentType) {
    }

    private final org.roundtable.platform.Admission admission;
    private final RoundAccess rounds;
    private final SubmissionRules rules;
    private final IdempotencyStore idempotency;
    private final AuditTrail audit;
    private final CurrentUser currentUser;
    private final EntityManager entityManager;
    private final ObjectMapper mapper;
    private final Clock clock;
    private final byte[] fingerprintKey;
    private final ResultIntake intake = new ResultIntake();
    private final PrecisionIntake precisionIntake = new PrecisionIntake();

    /**
     * What a validated upload stores, whatever the kind of round: the canonical payload and its hash, the hash of the
     * values alone, the warnings, how the file was read, how many results, what it reports (element, item; none for
     * a precision experiment), and the writer of its result rows.
     */
    private record Payload(String canonicalJson, String sha256, String valuesHash, List<IntakeWarning> warnings,
                           Detection detection, int count, List<String[]> keys,
                           java.util.function.LongConsumer rows) {
    }

    public SubmissionService(RoundAccess rounds, SubmissionRules rules, IdempotencyStore idempotency, AuditTrail audit,
                             CurrentUser currentUser, EntityManager entityManager, ObjectMapper mapper,
                             SessionKey sessionKey, Clock clock, org.roundtable.platform.Admission admission) {
        this.admission = admission;
        this.rounds = rounds;
        this.rules = rules;
        this.idempotency = idempotency;
        this.audit = audit;
        this.currentUser = currentUser;
        this.entityManager = entityManager;
        this.mapper = mapper;
        this.clock = clock;
        this.fingerprintKey = sessionKey.derive("client-address");
    }

    /**
     * What a laboratory is shown before a revision is stored, and must agree to: the warnings of the upload and the
     * measurands its current revision reports that the new one would no longer report.
     *
     * @param payloadSha256 SHA-256 of the canonical payload the agreement is about
     * @param dropped       the measurands (with the item where a round has several) no longer reported, in the
     *                      scheme's order, e.g. {@code Ni, Mo}
     * @param replacedCount how many results the current revision reports
     */
    public record Shown(String payloadSha256, List<SubmissionViews.Warning> warnings, List<String> dropped,
                        int replacedCount) {
    }

    /**
     * How a laboratory agrees to what it was {@link Shown}: the API's flags ({@code confirmWarnings=true},
     * {@code replaceAll=true}) for a LIMS; on the pages a signed token bound to exactly what was shown
     * ({@link ConfirmationTokens}).
     */
    public interface Consent {
        boolean confirmsWarnings(Shown shown);

        boolean replacesAll(Shown shown);

        static Consent flags(boolean confirmWarnings, boolean replaceAll) {
            return new Consent() {
                @Override
                public boolean confirmsWarnings(Shown shown) {
                    return confirmWarnings;
                }

                @Override
                public boolean replacesAll(Shown shown) {
                    return replaceAll;
                }
            };
        }
    }

    /**
     * A submit that needs the laboratory's agreement first: 422 with the warnings ({@code warning.} keys), or 409
     * listing the measurands it would no longer report ({@code replace.not-reported}). Nothing was saved.
     */
    public static final class NeedsConfirmation extends DomainException {
        private final Shown shown;

        NeedsConfirmation(int status, String title, String detail, List<Detail> details, Shown shown) {
            super(status, title, detail, details);
            this.shown = shown;
        }

        public Shown shown() {
            return shown;
        }
    }

    /** Key of the detail that names a measurand a submit would no longer report. */
    public static final String NOT_REPORTED_KEY = "replace.not-reported";

    /**
     * A laboratory submits results for a round it is enrolled in.
     *
     * @param confirmWarnings the laboratory has seen and confirms the warnings (values outside the expected range…)
     * @param idempotencyKey  optional; a retry with the same key and payload returns the first receipt
     * @throws DomainException.NotFound      the laboratory is not enrolled (same answer as for a missing round)
     * @throws DomainException.Unprocessable the upload has errors (every one listed with row, column, value, key), or
     *                                       warnings not yet confirmed (listed the same way, key prefix
     *                                       {@code warning.})
     * @throws DomainException.Conflict      the round is not open for results, or the deadline passed and the round
     *                                       refuses late results
     */
    public SubmissionViews.Receipt submit(long roundId, Upload upload, boolean confirmWarnings, String idempotencyKey,
                                          String clientAddress) {
        return submit(roundId, upload, Consent.flags(confirmWarnings, false), idempotencyKey, clientAddress);
    }

    /**
     * As {@link #submit(long, Upload, boolean, String, String)}, with the laboratory's agreement to warnings and to
     * results no longer reported given by {@code consent}. Values identical to the current revision's store nothing
     * and answer that revision's receipt marked {@code unchanged}.
     *
     * @throws NeedsConfirmation warnings not confirmed (422), or measurands of the current revision left out
     *                           without {@code replaceAll} (409)
     */
    public SubmissionViews.Receipt submit(long roundId, Upload upload, Consent consent, String idempotencyKey,
                                          String clientAddress) {
        return submitFor(currentUser.requireLaboratoryId(), prepare(roundId, upload), consent, idempotencyKey, clientAddress);
    }

    /**
     * An upload read against the round's rules as they are kept, before any transaction: the costly part of a
     * submission, done inside an upload slot by the endpoints; its verdict is given by {@link #submit(Prepared,
     * Consent, String, String)} once the laboratory's enrolment is checked.
     */
    public static final class Prepared {
        private final long roundId;
        private final Upload upload;
        private final SubmissionRules.Basis basis;
        private final Reading reading;

        private Prepared(long roundId, Upload upload, SubmissionRules.Basis basis, Reading reading) {
            this.roundId = roundId;
            this.upload = upload;
            this.basis = basis;
            this.reading = reading;
        }
    }

    /** Reads and checks {@code upload} for the round (no database work while the round's rules are kept). */
    public Prepared prepare(long roundId, Upload upload) {
        SubmissionRules.Basis early = rules.cached(roundId);
        return new Prepared(roundId, upload, early, early == null ? null : read(early, upload));
    }

    /** As {@link #submit(long, Upload, Consent, String, String)} for an upload already {@link #prepare prepared}. */
    public SubmissionViews.Receipt submit(Prepared prepared, Consent consent, String idempotencyKey, String clientAddress) {
        return submitFor(currentUser.requireLaboratoryId(), prepared, consent, idempotencyKey, clientAddress);
    }

    /** As {@link #submit}, for a laboratory named by the caller: only the demo loader, which acts for the laboratories. */
    SubmissionViews.Receipt submitFor(long laboratoryId, long roundId, Upload upload, boolean confirmWarnings,
                                      String idempotencyKey, String clientAddress) {
        return submitFor(laboratoryId, prepare(roundId, upload), Consent.flags(confirmWarnings, false), idempotencyKey,
                clientAddress);
    }

    private SubmissionViews.Receipt submitFor(long laboratoryId, Prepared prepared, Consent consent,
                                              String idempotencyKey, String clientAddress) {
        // read with the rules kept for the round, before any transaction (prepare); its verdict is given only once
        // the enrolment is known (another laboratory learns nothing of the round), and it is read again under the
        // lock if the round's rules changed meanwhile (or were not kept yet)
        long roundId = prepared.roundId;
        Upload upload = prepared.upload;
        SubmissionRules.Basis early = prepared.basis;
        Reading earlyReading = prepared.reading;
        String requestHash = Secrets.sha256Hex(roundId + "\n" + upload.channel() + "\n" + Secrets.sha256Hex(upload.content()));
        return QuarkusTransaction.requiringNew().call(() -> {
            RoundAccess.SubmissionHead head = rounds.lockForSubmission(roundId, laboratoryId);
            if (head.participantCode().isEmpty()) {
                throw new DomainException.NotFound("The round");
            }
            SubmissionRules.Basis basis = rules.current(roundId, head);
            Payload accepted = (basis == early ? earlyReading : readAgain(basis, upload)).accepted();
            RoundAccess.SubmissionWindow window = head.window();
            if (idempotencyKey != null) {
                // a retry gets its original receipt even if the round closed in between
                Optional<IdempotencyStore.StoredAnswer> earlier = idempotency.claim(scope(laboratoryId), idempotencyKey, requestHash);
                if (earlier.isPresent()) {
                    return read(earlier.get().body());
                }
            }
            if (!window.openForResults()) {
                throw new DomainException.Conflict("The round " + window.roundCode() + " is not open for results (it is "
                        + window.state().toLowerCase().replace('_', ' ') + ").");
            }
            OffsetDateTime now = now();
            ResultTiming timing = window.timingAt(now.toInstant());
            if (timing == ResultTiming.REFUSED) {
                throw new DomainException.Conflict("The result deadline passed at " + deadlineText(window)
                        + ". This round does not accept late results.");
            }
            Head submission = lockSubmission(roundId, laboratoryId, now);
            Current current = current(submission);
            SubmissionViews.Receipt receipt;
            if (current != null && current.sha256().equals(accepted.sha256())) {
                // the same values again: no new revision, the current one's receipt
                receipt = current.receipt();
            } else {
                agree(basis, window, accepted, current, consent);
                boolean late = timing != ResultTiming.ON_TIME;
                // only browser sessions are compared by address: LIMS integrations of many laboratories often share one host
                receipt = store(roundId, laboratoryId, submission, upload, accepted, late, now, null, null,
                        currentUser.viaApiToken() ? null : fingerprint(clientAddress));
            }
            if (idempotencyKey != null) {
                idempotency.complete(scope(laboratoryId), idempotencyKey, receipt.unchanged() ? 200 : 201, write(receipt));
            }
            return receipt;
        });
    }

    /** An upload read against one set of rules: what it stores, or why it is refused (given only after the enrolment check). */
    private record Reading(Payload payload, DomainException refusal) {
        Payload accepted() {
            if (refusal != null) {
                throw refusal;
            }
            return payload;
        }
    }

    /**
     * Reads the upload again under the lock, with rules that were not kept yet or have changed since it was prepared:
     * in an upload slot, as the first reading was, so that many submissions arriving while the rules are cold (the
     * first ones of a round, or just after its plan changed) are not parsed all at once.
     */
    private Reading readAgain(SubmissionRules.Basis basis, Upload upload) {
        try (org.roundtable.platform.Admission.Slot ignored = admission.uploadSlot()) {
            return read(basis, upload);
        }
    }

    private Reading read(SubmissionRules.Basis basis, Upload upload) {
        try {
            return new Reading(validate(basis, upload), null);
        } catch (DomainException refused) {
            return new Reading(null, refused);
        }
    }

    /** The laboratory's submission row, created if need be, locked until the transaction ends. */
    private record Head(long id, int currentRevision) {
    }

    /**
     * Creates or locks the laboratory's submission row in one statement (an upsert takes the row lock, like
     * {@code FOR UPDATE}): two simultaneous submits of one laboratory become revisions n and n+1, each seeing the
     * other's as current.
     */
    private Head lockSubmission(long roundId, long laboratoryId, OffsetDateTime now) {
        Object[] row = (Object[]) entityManager.createNativeQuery("""
                INSERT INTO submission (round_id, laboratory_id, created_at, updated_at) VALUES (:r, :l, :now, :now)
                ON CONFLICT (round_id, laboratory_id) DO UPDATE SET round_id = EXCLUDED.round_id
                RETURNING id, current_revision
                """).setParameter("r", roundId).setParameter("l", laboratoryId).setParameter("now", now).getSingleResult();
        return new Head(((Number) row[0]).longValue(), ((Number) row[1]).intValue());
    }

    /** Refuses the submit unless the laboratory agreed to its warnings and to the measurands it would drop. */
    private void agree(SubmissionRules.Basis basis, RoundAccess.SubmissionWindow window, Payload accepted, Current current,
                       Consent consent) {
        List<String> dropped = current == null ? List.of() : dropped(basis.measurandOrder(), window, current.keys(), accepted.keys());
        List<SubmissionViews.Warning> warnings = accepted.warnings().stream()
                .map(w -> new SubmissionViews.Warning(w.row(), w.column(), w.value(), w.key(), w.message())).toList();
        Shown shown = new Shown(accepted.sha256(), warnings, dropped, current == null ? 0 : current.keys().size());
        if (!warnings.isEmpty() && !consent.confirmsWarnings(shown)) {
            List<DomainException.Detail> details = warnings.stream()
                    .map(w -> new DomainException.Detail(w.row() == 0 ? null : w.row(), w.column(), w.value(),
                            "warning." + w.key(), w.message()))
                    .toList();
            throw new NeedsConfirmation(422, "Unprocessable",
                    "Please check these values and confirm them. Nothing was saved yet.", details, shown);
        }
        if (!dropped.isEmpty() && !consent.replacesAll(shown)) {
            List<DomainException.Detail> details = dropped.stream()
                    .map(m -> new DomainException.Detail(null, "measurand", m, NOT_REPORTED_KEY,
                            m + " would no longer be reported."))
                    .toList();
            throw new NeedsConfirmation(409, "Not possible now", "This replaces your " + shown.replacedCount()
                    + (shown.replacedCount() == 1 ? " result" : " results") + "; " + String.join(", ", dropped)
                    + " would no longer be reported. Send them again, or confirm that they are to be left out"
                    + " (replaceAll=true). Nothing was saved.", details, shown);
        }
    }

    /** The measurands of {@code before} missing from {@code after}, in the scheme's order, with the item where needed. */
    private static List<String> dropped(List<String> order, RoundAccess.SubmissionWindow window, List<String[]> before,
                                        List<String[]> after) {
        java.util.Set<String> kept = after.stream().map(k -> k[0] + "|" + k[1]).collect(Collectors.toSet());
        boolean paired = window.itemLabels().size() > 1;
        return before.stream().filter(k -> !kept.contains(k[0] + "|" + k[1]))
                .sorted(java.util.Comparator.<String[]>comparingInt(k -> order.contains(k[0]) ? order.indexOf(k[0]) : order.size())
                        .thenComparing(k -> k[0]).thenComparing(k -> k[1]))
                .map(k -> paired ? k[0] + " (item " + k[1] + ")" : k[0])
                .toList();
    }

    /** The laboratory's current revision: payload hash, what it reports (element, item) and its receipt. */
    private record Current(String sha256, List<String[]> keys, SubmissionViews.Receipt receipt) {
    }

    /** The current revision of the locked submission row with what it reports, in one statement; null before the first. */
    private Current current(Head submission) {
        if (submission.currentRevision() == 0) {
            return null;
        }
        Object[] h = (Object[]) entityManager.createNativeQuery("""
                SELECT v.receipt_id, v.payload_sha256, v.submitted_at, v.late, v.channel, v.warnings_json, v.detection_json,
                       (SELECT string_agg(r.element || '|' || r.item_label, ',' ORDER BY r.element, r.item_label)
                          FROM reported_result r WHERE r.revision_id = v.id)
                  FROM submission_revision v WHERE v.submission_id = :s AND v.revision = :revision
                """).setParameter("s", submission.id()).setParameter("revision", submission.currentRevision())
                .getSingleResult();
        List<String[]> keys = h[7] == null ? List.of()
                : java.util.Arrays.stream(((String) h[7]).split(",")).map(k -> k.split("\\|", 2)).toList();
        String sha = h[1].toString().strip();
        List<SubmissionViews.Warning> warnings = readWarnings((String) h[5]);
        String detected = h[6] == null ? null : describe(readDetection((String) h[6]));
        SubmissionViews.Receipt receipt = new SubmissionViews.Receipt(submission.id(), submission.currentRevision(),
                (String) h[0], sha, org.roundtable.platform.Timestamps.utc(h[2]), (Boolean) h[3], (String) h[4], warnings,
                detected, true);
        return new Current(sha, keys, receipt);
    }

    private List<SubmissionViews.Warning> readWarnings(String json) {
        if (json == null || json.isBlank()) {
            return List.of();
        }
        try {
            return List.of(mapper.readValue(json, SubmissionViews.Warning[].class));
        } catch (JsonProcessingException e) {
            return List.of();
        }
    }

    private Detection readDetection(String json) {
        try {
            return mapper.readValue(json, Detection.class);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException("stored detection unreadable", e);
        }
    }

    /**
     * A coordinator stores a confirmed transcription correction after the close (before any report): a new revision
     * with the reason and the evidence, audited. Validation as for the laboratory; warnings count as confirmed.
     */
    public SubmissionViews.Receipt correct(long roundId, long laboratoryId, byte[] json, String reason, String evidence) {
        if (reason == null || reason.isBlank() || evidence == null || evidence.isBlank()) {
            throw new DomainException.BadRequest("A correction needs a reason and the evidence (e.g. the lab's raw data).");
        }
        Upload upload = new Upload(Channel.CORRECTION, UploadFormat.JSON, json, null, null);
        SubmissionRules.Basis early = rules.cached(roundId);
        Reading earlyReading = early == null ? null : read(early, upload);
        return QuarkusTransaction.requiringNew().call(() -> {
            RoundAccess.SubmissionHead head = rounds.lockForSubmission(roundId, laboratoryId);
            if (head.participantCode().isEmpty()) {
                throw new DomainException.NotFound("The laboratory's submission");
            }
            SubmissionRules.Basis basis = rules.current(roundId, head);
            Payload accepted = (basis == early ? earlyReading : readAgain(basis, upload)).accepted();
            RoundAccess.SubmissionWindow window = head.window();
            if (!window.closedBeforeIssue()) {
                throw new DomainException.Conflict("Corrections are made after the round closes and before a report is"
                        + " issued; the round is " + window.state().toLowerCase().replace('_', ' ') + ".");
            }
            OffsetDateTime now = now();
            return store(roundId, laboratoryId, lockSubmission(roundId, laboratoryId, now), upload, accepted, false, now,
                    strip(reason, 2000), strip(evidence, 2000), null);
        });
    }

    /** Parses and validates the upload (errors refuse it at once); warnings are agreed to later, under the lock. */
    private Payload validate(SubmissionRules.Basis basis, Upload upload) {
        if (basis.precision() != null) {
            PrecisionIntake.Outcome outcome = precisionIntake.read(upload.content(), upload.format(), basis.precision());
            if (outcome instanceof PrecisionIntake.Rejected rejected) {
                throw refused(rejected.problems(), rejected.detection());
            }
            PrecisionIntake.Accepted ok = (PrecisionIntake.Accepted) outcome;
            return new Payload(ok.canonicalJson(), ok.sha256(), Secrets.sha256Hex(ok.replicates().stream()
                    .map(r -> r.measurand() + "|" + r.level() + "|" + r.replicate() + "|"
                            + r.value().stripTrailingZeros().toPlainString()).sorted().collect(Collectors.joining("\n"))),
                    ok.warnings(), ok.detection(), ok.replicates().size(), List.of(),
                    id -> insertReplicates(id, ok.replicates()));
        }
        IntakeResult result = intake.read(upload.content(), upload.format(), basis.upload());
        if (result instanceof IntakeResult.Rejected rejected) {
            throw refused(rejected.problems(), rejected.detection());
        }
        IntakeResult.Accepted accepted = (IntakeResult.Accepted) result;
        return new Payload(accepted.canonicalJson(), accepted.sha256(), valuesHash(accepted.results()),
                accepted.warnings(), accepted.detection(), accepted.results().size(),
                accepted.results().stream().map(r -> new String[]{r.measurand(), r.item()}).toList(),
                id -> insertResults(id, accepted.results()));
    }

    private static DomainException refused(List<org.roundtable.submission.intake.IntakeProblem> problems, Detection detection) {
        List<DomainException.Detail> details = problems.stream()
                .map(p -> new DomainException.Detail(p.row() == 0 ? null : p.row(), p.column(), p.value(), p.key(), p.message()))
                .toList();
        return new DomainException.Unprocessable("The upload was not accepted: " + details.size()
                + (details.size() == 1 ? " problem" : " problems") + ". Nothing was saved. Read as "
                + describe(detection) + ".", details);
    }

    private SubmissionViews.Receipt store(long roundId, long laboratoryId, Head submission, Upload upload, Payload accepted,
                                         boolean late, OffsetDateTime now, String correctionReason, String evidence,
                                         String clientFingerprint) {
        long submissionId = submission.id();
        int revision = submission.currentRevision() + 1;
        String receiptId = "RT-" + Secrets.randomToken(16);
        String valuesHash = accepted.valuesHash();
        List<SubmissionViews.Warning> warnings = accepted.warnings().stream()
                .map(w -> new SubmissionViews.Warning(w.row(), w.column(), w.value(), w.key(), w.message())).toList();
        long revisionId = ((Number) entityManager.createNativeQuery("""
                INSERT INTO submission_revision (submission_id, revision, channel, receipt_id, payload_sha256,
                       canonical_payload, values_sha256, submitted_by, submitted_role, submitted_at, late, warnings_json,
                       detection_json, client_fingerprint, correction_reason, correction_evidence)
                VALUES (:submission, :revision, :channel, :receipt, :sha, :payload, :values, :by, :role, :at, :late,
                        :warnings, :detection, :fingerprint, :reason, :evidence)
                RETURNING id
                """)
                .setParameter("submission", submissionId).setParameter("revision", revision)
                .setParameter("channel", upload.channel().name()).setParameter("receipt", receiptId)
                .setParameter("sha", accepted.sha256()).setParameter("payload", accepted.canonicalJson())
                .setParameter("values", valuesHash).setParameter("by", currentUser.username())
                .setParameter("role", currentUser.roleName().isEmpty() ? "system" : currentUser.roleName())
                .setParameter("at", now).setParameter("late", late)
                .setParameter("warnings", write(warnings)).setParameter("detection", write(accepted.detection()))
                .setParameter("fingerprint", clientFingerprint).setParameter("reason", correctionReason)
                .setParameter("evidence", evidence)
                .getSingleResult()).longValue();
        accepted.rows().accept(revisionId);
        if (upload.channel() == Channel.CSV || upload.channel() == Channel.XLSX) {
            entityManager.createNativeQuery("""
                    INSERT INTO submission_upload (revision_id, file_name, content_type, size_bytes, sha256, content)
                    VALUES (:revision, :name, :type, :size, :sha, :content)
                    """)
                    .setParameter("revision", revisionId).setParameter("name", safeFileName(upload.fileName()))
                    .setParameter("type", upload.contentType() == null ? "application/octet-stream" : strip(upload.contentType(), 100))
                    .setParameter("size", upload.content().length).setParameter("sha", Secrets.sha256Hex(upload.content()))
                    .setParameter("content", upload.content())
                    .executeUpdate();
        }
        entityManager.createNativeQuery("""
                UPDATE submission SET current_revision = :revision, updated_at = :now, version = version + 1 WHERE id = :id
                """).setParameter("revision", revision).setParameter("now", now).setParameter("id", submissionId).executeUpdate();
        raiseFlags(roundId, laboratoryId, valuesHash, clientFingerprint, now);
        audit.record(new AuditTrail.Event(currentUser.actor(),
                correctionReason == null ? "submission.revision-accepted" : "submission.corrected",
                "submission", submissionId + "/" + revision, null, accepted.sha256(),
                "round=" + roundId + " laboratory=" + laboratoryId + " channel=" + upload.channel()
                        + " results=" + accepted.count() + (late ? " late" : "")
                        + (correctionReason == null ? "" : " reason=" + correctionReason)));
        return new SubmissionViews.Receipt(submissionId, revision, receiptId, accepted.sha256(), now, late,
                upload.channel().name(), warnings, describe(accepted.detection()), false);
    }

    /** One batched insert for all replicate results of a precision experiment's revision. */
    private void insertReplicates(long revisionId, List<PrecisionIntake.Replicate> replicates) {
        entityManager.unwrap(Session.class).doWork(connection -> {
            try (PreparedStatement insert = connection.prepareStatement("""
                    INSERT INTO precision_replicate (revision_id, element, level_label, replicate, value_as_reported,
                           unit_as_reported, value)
                    VALUES (?, ?, ?, ?, ?, ?, ?)
                    """)) {
                for (PrecisionIntake.Replicate r : replicates) {
                    insert.setLong(1, revisionId);
                    insert.setString(2, r.measurand());
                    insert.setString(3, r.level());
                    insert.setInt(4, r.replicate());
                    insert.setString(5, r.reported().asReported());
                    insert.setString(6, r.unit().symbol());
                    insert.setBigDecimal(7, r.value());
                    insert.addBatch();
                }
                insert.executeBatch();
            }
        });
    }

    /** One batched insert for all results of a revision (no per-row round trips). */
    private void insertResults(long revisionId, List<ReportedResult> results) {
        entityManager.unwrap(Session.class).doWork(connection -> {
            try (PreparedStatement insert = connection.prepareStatement("""
                    INSERT INTO reported_result (revision_id, element, item_label, value_as_reported, unit_as_reported,
                           less_than, reported_number, value_in_measurand_unit, expanded_uncertainty_as_reported,
                           expanded_uncertainty, coverage_factor, method_group, replicates, replicate_values)
                    VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)
                    """)) {
                for (ReportedResult r : results) {
                    insert.setLong(1, revisionId);
                    insert.setString(2, r.measurand());
                    insert.setString(3, r.item());
                    insert.setString(4, r.valueAsReported());
                    insert.setString(5, r.unit().symbol());
                    insert.setBoolean(6, r.lessThan());
                    insert.setBigDecimal(7, r.value().value());
                    insert.setBigDecimal(8, r.massFraction());
                    insert.setString(9, r.expandedUncertainty().map(ReportedNumber::asReported).orElse(null));
                    if (r.expandedUncertaintyInCanonicalUnit().isPresent()) {
                        insert.setBigDecimal(10, r.expandedUncertaintyInCanonicalUnit().get());
                    } else {
                        insert.setNull(10, Types.NUMERIC);
                    }
                    insert.setBigDecimal(11, r.coverageFactor().value());
                    insert.setString(12, r.method().code());
                    insert.setInt(13, r.replicateCount());
                    insert.setString(14, r.replicateValues().isEmpty() ? null
                            : r.replicateValues().stream().map(ReportedNumber::asReported).collect(Collectors.joining("|")));
                    insert.addBatch();
                }
                insert.executeBatch();
            }
        });
    }

    /**
     * Flags for the coordinator, never shown to laboratories: the same result vector as another laboratory's current
     * revision; browser submissions from the same client address within {@link #NEAR_SIMULTANEOUS} for different
     * laboratories, once per pair (our reading of "linked accounts": the address is kept only as a keyed hash).
     */
    private void raiseFlags(long roundId, long laboratoryId, String valuesHash, String fingerprint, OffsetDateTime now) {
        entityManager.createNativeQuery("""
                INSERT INTO review_flag (round_id, kind, laboratory_id, other_laboratory_id, detail, raised_at)
                SELECT :r, 'IDENTICAL_RESULTS', :l, s.laboratory_id, 'Every reported value equals the other laboratory''s current revision', :now
                  FROM submission s JOIN submission_revision v ON v.submission_id = s.id AND v.revision = s.current_revision
                 WHERE s.round_id = :r AND s.laboratory_id <> :l AND v.values_sha256 = :values
                """).setParameter("r", roundId).setParameter("l", laboratoryId).setParameter("now", now)
                .setParameter("values", valuesHash).executeUpdate();
        if (fingerprint != null) {
            entityManager.createNativeQuery("""
                    INSERT INTO review_flag (round_id, kind, laboratory_id, other_laboratory_id, detail, raised_at)
                    SELECT DISTINCT :r, 'NEAR_SIMULTANEOUS', :l, s.laboratory_id,
                           'Submitted from the same client address within two minutes of the other laboratory', CAST(:now AS timestamptz)
                      FROM submission s JOIN submission_revision v ON v.submission_id = s.id
                     WHERE s.round_id = :r AND s.laboratory_id <> :l AND v.client_fingerprint = :fingerprint
                       AND v.submitted_at > :since
                       AND NOT EXISTS (SELECT 1 FROM review_flag f WHERE f.round_id = :r AND f.kind = 'NEAR_SIMULTANEOUS'
                                          AND f.laboratory_id = :l AND f.other_laboratory_id = s.laboratory_id)
                    """).setParameter("r", roundId).setParameter("l", laboratoryId).setParameter("now", now)
                    .setParameter("fingerprint", fingerprint).setParameter("since", now.minus(NEAR_SIMULTANEOUS))
                    .executeUpdate();
        }
    }

    /** SHA-256 over the reported values alone (element, item, value in the measurand's unit, less-than), sorted. */
    static String valuesHash(List<ReportedResult> results) {
        return Secrets.sha256Hex(results.stream()
                .map(r -> r.measurand() + "|" + r.item() + "|" + (r.lessThan() ? "<" : "")
                        + r.massFraction().stripTrailingZeros().toPlainString())
                .sorted().collect(Collectors.joining("\n")));
    }

    private String fingerprint(String clientAddress) {
        if (clientAddress == null || clientAddress.isBlank()) {
            return null;
        }
        try {
            javax.crypto.Mac mac = javax.crypto.Mac.getInstance("HmacSHA256");
            mac.init(new javax.crypto.spec.SecretKeySpec(fingerprintKey, "HmacSHA256"));
            return HexFormat.of().formatHex(mac.doFinal(clientAddress.getBytes(StandardCharsets.UTF_8)));
        } catch (java.security.GeneralSecurityException e) {
            throw new IllegalStateException(e);
        }
    }

    /** How the upload was read, in words: format, encoding and byte order mark, delimiter, decimal separator. */
    static String describe(org.roundtable.submission.intake.Detection d) {
        StringBuilder out = new StringBuilder(d.format().name());
        if (d.encoding() != null) {
            out.append(", ").append(d.encoding()).append(d.byteOrderMark() ? " with byte order mark" : "");
        }
        if (d.delimiter() != null) {
            out.append(", delimiter '").append(d.delimiter()).append('\'');
        }
        if (d.decimalSeparator() != null) {
            out.append(", decimal '").append(d.decimalSeparator()).append('\'');
        }
        return out.toString();
    }

    private static String scope(long laboratoryId) {
        return "laboratory:" + laboratoryId;
    }

    private static String deadlineText(RoundAccess.SubmissionWindow window) {
        // the one format for people (platform.TimeDisplay), in the round's zone, named
        return org.roundtable.platform.TimeDisplay.at(window.resultDeadline().toInstant(),
                java.time.ZoneId.of(window.deadlineTimeZone()));
    }

    static String safeFileName(String name) {
        if (name == null || name.isBlank()) {
            return "upload";
        }
        String base = name.replace('\\', '/');
        base = base.substring(base.lastIndexOf('/') + 1).replaceAll("[^A-Za-z0-9._ -]", "_");
        return base.isBlank() ? "upload" : strip(base, 200);
    }

    private static String strip(String text, int max) {
        String clean = text.strip();
        return clean.length() <= max ? clean : clean.substring(0, max);
    }

    private String write(Object value) {
        try {
            return mapper.writeValueAsString(value);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    private SubmissionViews.Receipt read(String json) {
        try {
            return mapper.readValue(json, SubmissionViews.Receipt.class);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException("stored receipt unreadable", e);
        }
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
