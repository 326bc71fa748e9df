package org.roundtable.report;

import io.quarkus.narayana.jta.QuarkusTransaction;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.account.AuditorGrantService;
import org.roundtable.account.CurrentUser;
import org.roundtable.account.Role;
import org.roundtable.audit.Actor;
import org.roundtable.audit.AuditTrail;
import org.roundtable.job.Job;
import org.roundtable.job.JobProgress;
import org.roundtable.job.JobService;
import org.roundtable.notice.NoticeKind;
import org.roundtable.notice.NoticeService;
import org.roundtable.platform.DisplaySettings;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Paging;
import org.roundtable.platform.Secrets;
import org.roundtable.platform.Timestamps;
import org.roundtable.report.model.LaboratoryReport;
import org.roundtable.report.model.ReportIdentity;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.report.model.Signatory;
import org.roundtable.report.model.Signatures;
import org.roundtable.report.render.HtmlReportRenderer;
import org.roundtable.report.render.PdfReportRenderer;
import org.roundtable.scheme.RoundAccess;
import org.roundtable.scheme.RoundAction;
import org.roundtable.scheme.RoundService;
import org.roundtable.scheme.RoundState;
import org.roundtable.scheme.RoundStateMachine;
import org.roundtable.scheme.SchemeService;

import java.time.Clock;
import java.time.LocalDate;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.time.temporal.ChronoUnit;
import java.util.ArrayList;
import java.util.EnumSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;

/**
 * The life of a round's reports after evaluation (issue 8):
 * <ol>
 *   <li>issue preliminary — from a closed round (or one being evaluated) and a non-preview evaluation run; the
 *       round report and one laboratory report per participant with results are rendered and stored;</li>
 *   <li>open the comment period — laboratories comment on the preliminary report, coordinators answer;</li>
 *   <li>sign-off — one coordinator, and a second, different coordinator where the scheme requires a second
 *       reviewer; all sign-offs of one issue name the same evaluation run;</li>
 *   <li>issue final — after the sign-off, from the signed run;</li>
 *   <li>amend — with a reason and a new sign-off: new round and laboratory reports with status amended, each
 *       linked to the document it replaces.</li>
 * </ol>
 * Issuing always runs as a background job ({@value #JOB_KIND}): the request is checked and recorded in
 * {@code report_issue}, the job renders and stores the documents with progress, laboratory reports first, the
 * round report and the round's state step last, in one transaction. Report numbers: {@code <round>-R-P1},
 * {@code -R-F}, {@code -R-A1}, …; laboratory reports {@code <round>-<participant code>-P1}, {@code -F}, {@code -A1}.
 * Every request, comment, answer and sign-off is audited; every table is append-only.
 */
@ApplicationScoped
public class ReportLifecycle {

    /** Job kind of an issue request. */
    public static final String JOB_KIND = "report-issue";

    private static final Set<RoundState> SIGNABLE = EnumSet.of(RoundState.PRELIMINARY_ISSUED,
            RoundState.COMMENT_PERIOD, RoundState.FINAL_ISSUED, RoundState.AMENDED);
    private static final Set<ReportStatus> FOR_AUDITORS = EnumSet.of(ReportStatus.FINAL, ReportStatus.AMENDED);
    private static final String PDF = "application/pdf";

    private final EntityManager entityManager;
    private final ReportAssembler assembler;
    private final IssuedDocuments documents;
    private final ReportVisibility visibility;
    private final RoundService rounds;
    private final RoundAccess roundAccess;
    private final SchemeService schemes;
    private final JobService jobs;
    private final AuditorGrantService grants;
    private final AuditTrail audit;
    private final CurrentUser currentUser;
    private final Clock clock;
    private final NoticeService notices;
    private final ReportRenderPool renderPool;
    private final DisplaySettings display;

    public ReportLifecycle(EntityManager entityManager, ReportAssembler assembler, IssuedDocuments documents,
                           ReportVisibility visibility, RoundService rounds, RoundAccess roundAccess,
                           SchemeService schemes, JobService jobs, AuditorGrantService grants, AuditTrail audit,
                           CurrentUser currentUser, Clock clock, NoticeService notices, ReportRenderPool renderPool,
                           DisplaySettings display) {
        this.entityManager = entityManager;
        this.assembler = assembler;
        this.documents = documents;
        this.visibility = visibility;
        this.rounds = rounds;
        this.roundAccess = roundAccess;
        this.schemes = schemes;
        this.jobs = jobs;
        this.grants = grants;
        this.audit = audit;
        this.currentUser = currentUser;
        this.clock = clock;
        this.notices = notices;
        this.renderPool = renderPool;
        this.display = display;
    }

    // ---- views and requests ------------------------------------------------------------------------------

    /** An issued document as listed; {@code participantCode} for laboratory reports. */
    public record DocumentView(long id, String reportId, String kind, String status, String participantCode,
                               String replacesReportId, String amendmentReason, String supersededBy, String sha256,
                               OffsetDateTime issuedAt) {
    }

    public record AnswerView(long id, String body, String answeredBy, OffsetDateTime answeredAt) {
    }

    /** A laboratory's comment, by participant code, with the coordinators' answers. */
    public record CommentView(long id, String reportId, String participantCode, String body, OffsetDateTime writtenAt,
                              List<AnswerView> answers) {
    }

    public record SignOffView(int sequence, int evaluationVersion, String role, String username, String displayName,
                              OffsetDateTime signedAt) {
    }

    /** An issue request with the progress of its job. */
    public record IssueView(long id, String status, int evaluationVersion, String roundReportId, String requestedBy,
                            OffsetDateTime requestedAt, Long jobId, String jobStatus, int progressDone,
                            int progressTotal, String error, boolean done) {
    }

    /** A run reports may be issued from. */
    public record RunChoice(int version, OffsetDateTime createdAt) {
    }

    /**
     * Everything about a round's reports, for its coordinators; {@code documents} is one page of the issued
     * documents, newest first ({@code documentsPaging}); the end of the comment period once it is open, with the
     * round's time zone.
     */
    public record Overview(long roundId, String roundCode, String state, boolean secondReviewerRequired,
                           int nextSignOffSequence, List<RunChoice> runs, List<IssueView> issues,
                           List<SignOffView> signOffs, List<CommentView> comments, List<DocumentView> documents,
                           Paging documentsPaging, OffsetDateTime commentPeriodEndsAt, String timeZone) {

        /** Whether an issue job is running (its page then follows the progress by itself). */
        public boolean issuing() {
            return issues.stream().anyMatch(i -> !i.done() && "RUNNING".equals(i.jobStatus()));
        }

        /** The coordinators' page of the round's reports (the pages of the documents table link it). */
        public String documentsPath() {
            return "/rounds/" + roundId + "/reports";
        }
    }

    /**
     * An issue request: {@code version} the evaluation run (required for a preliminary report; for final and
     * amended reports it must be the signed run if given), {@code comments} the coordinator's comments printed
     * in the report, {@code reason} the reason of an amendment.
     */
    public record IssueRequest(Integer version, String comments, String reason) {
    }

    public record SignOffRequest(Integer version) {
    }

    public record TextRequest(String body) {
    }

    /** A laboratory's view of a round's reports: documents it may read, its own comments and their answers. */
    public record LaboratoryView(long roundId, String roundCode, String state, String participantCode,
                                 boolean commentPeriodOpen, List<DocumentView> documents, List<CommentView> comments,
                                 OffsetDateTime commentPeriodEndsAt, String timeZone) {
    }

    /** Who acts: the audit actor and the name printed on a report. */
    public record Signer(Actor actor, String displayName) {
    }

    /** A document's bytes with its name. */
    public record Content(String fileName, String contentType, byte[] bytes) {
    }

    // ---- coordinators ------------------------------------------------------------------------------------

    /** The overview with the first page of the issued documents. */
    @Transactional
    public Overview overview(long roundId) {
        return overview(roundId, 1);
    }

    /**
     * The overview with page {@code page} (null: the first) of the issued documents, counted and cut in SQL at
     * the page-size budget.
     */
    @Transactional
    public Overview overview(long roundId, Integer page) {
        RoundService.RoundView round = rounds.get(roundId);
        Map<Long, String> codes = roundAccess.participantCodes(roundId);
        Paging paging = Paging.of(page, display.pageSize(), documents.countOfRound(roundId));
        List<DocumentView> docs = documents.pageOfRound(roundId, paging.offset(), paging.size()).stream()
                .map(d -> view(d, codes)).toList();
        @SuppressWarnings("unchecked")
        List<Object[]> runRows = entityManager.createNativeQuery(
                        "SELECT version, created_at FROM evaluation_run WHERE round_id = :r AND NOT preview ORDER BY version")
                .setParameter("r", roundId).getResultList();
        List<RunChoice> runs = runRows.stream().map(r -> new RunChoice(((Number) r[0]).intValue(), Timestamps.utc(r[1])))
                .toList();
        return new Overview(roundId, round.code(), round.state(), schemes.secondReviewerRequired(round.schemeId()),
                nextSequence(roundId), runs, issues(roundId), signOffs(roundId), comments(roundId, null), docs, paging,
                rounds.commentPeriodEnd(roundId).orElse(null), round.timeZone());
    }

    /** Records a request to issue the preliminary reports and queues the job that issues them. */
    @Transactional
    public IssueView requestPreliminary(long roundId, IssueRequest request) {
        return requestPreliminary(roundId, request, signer(), true);
    }

    private IssueView requestPreliminary(long roundId, IssueRequest request, Signer signer, boolean job) {
        RoundState state = rounds.lockState(roundId);
        if (state != RoundState.CLOSED && state != RoundState.EVALUATING) {
            throw new DomainException.Conflict("The round is " + RoundStateMachine.describe(state)
                    + ": a preliminary report is issued from a closed round or one being evaluated.");
        }
        if (request == null || request.version() == null) {
            throw new DomainException.BadRequest("Choose the evaluation run (its version) to report.");
        }
        long runId = assembler.runId(roundId, request.version());
        return record(roundId, ReportStatus.PRELIMINARY, runId, "P1", null, request.comments(), null, signer, job);
    }

    /** Opens the comment period on the preliminary report. */
    @Transactional
    public void openCommentPeriod(long roundId) {
        openCommentPeriod(roundId, signer());
    }

    private void openCommentPeriod(long roundId, Signer signer) {
        rounds.takeReportStep(roundId, RoundAction.OPEN_COMMENT_PERIOD, signer.actor(), null);
    }

    /** A coordinator's answer to a laboratory's comment. */
    @Transactional
    public CommentView answer(long roundId, long commentId, TextRequest request) {
        rounds.get(roundId);
        Number owner = (Number) entityManager.createNativeQuery(
                        "SELECT count(*) FROM report_comment WHERE id = :c AND round_id = :r")
                .setParameter("c", commentId).setParameter("r", roundId).getSingleResult();
        if (owner.intValue() == 0) {
            throw new DomainException.NotFound("The comment");
        }
        String body = text(request, "answer");
        long id = insert("""
                INSERT INTO report_comment_answer (comment_id, body, answered_by, answered_at)
                VALUES (:c, :body, :by, :at) RETURNING id
                """, Map.of("c", commentId, "body", body, "by", currentUser.actor().name(), "at", now()));
        audit.record(new AuditTrail.Event(currentUser.actor(), "report.comment-answered", "report_comment_answer",
                Long.toString(id), null, Secrets.sha256Hex(body), "comment=" + commentId + " round=" + roundId));
        long laboratory = ((Number) entityManager.createNativeQuery(
                "SELECT laboratory_id FROM report_comment WHERE id = :c").setParameter("c", commentId).getSingleResult())
                .longValue();
        notices.notifyLaboratory(NoticeKind.COMMENT_ANSWERED, "answer:" + id, laboratory,
                Map.of("round", rounds.get(roundId).code(), "roundId", roundId));
        return comments(roundId, null).stream().filter(c -> c.id() == commentId).findFirst().orElseThrow();
    }

    /**
     * Signs off the round's next final or amended report for an evaluation run: the first sign-off is the
     * coordinator's; where the scheme requires it, a second, different coordinator signs as second reviewer.
     */
    @Transactional
    public SignOffView signOff(long roundId, SignOffRequest request) {
        return signOff(roundId, request, signer());
    }

    private SignOffView signOff(long roundId, SignOffRequest request, Signer signer) {
        RoundState state = rounds.lockState(roundId);
        if (!SIGNABLE.contains(state)) {
            throw new DomainException.Conflict("The round is " + RoundStateMachine.describe(state)
                    + ": reports are signed off after the preliminary issue.");
        }
        if (request == null || request.version() == null) {
            throw new DomainException.BadRequest("Name the evaluation run (its version) you sign off.");
        }
        refuseWhileIssuing(roundId);
        long runId = assembler.runId(roundId, request.version());
        int sequence = nextSequence(roundId);
        List<SignOffView> current = signOffs(roundId).stream().filter(s -> s.sequence() == sequence).toList();
        if (!current.isEmpty() && current.get(0).evaluationVersion() != request.version()) {
            throw new DomainException.Conflict("This report is being signed off for evaluation run "
                    + current.get(0).evaluationVersion() + "; sign that run, or issue and amend later.");
        }
        String username = signer.actor().name();
        if (current.stream().anyMatch(s -> s.username().equals(username))) {
            throw new DomainException.Conflict("You have signed this report off already; a second reviewer must be "
                    + "another coordinator.");
        }
        boolean second = schemes.secondReviewerRequired(rounds.get(roundId).schemeId());
        String role;
        if (current.isEmpty()) {
            role = "COORDINATOR";
        } else if (second && current.size() == 1) {
            role = "SECOND_REVIEWER";
        } else {
            throw new DomainException.Conflict("This report has every sign-off it needs.");
        }
        OffsetDateTime at = now();
        long id = insert("""
                INSERT INTO report_sign_off (round_id, sequence, evaluation_run_id, role, username, display_name,
                       signed_at)
                VALUES (:r, :s, :run, :role, :u, :name, :at) RETURNING id
                """, Map.of("r", roundId, "s", sequence, "run", runId, "role", role, "u", username,
                "name", signer.displayName(), "at", at));
        audit.record(new AuditTrail.Event(signer.actor(), "report.sign-off", "report_sign_off", Long.toString(id),
                null, null, "round=" + roundId + " sequence=" + sequence + " run=" + request.version() + " role=" + role));
        notifySignOff(roundId, state, sequence, request.version(), second && current.isEmpty(), signer);
        return new SignOffView(sequence, request.version(), role, username, signer.displayName(), at);
    }

    /**
     * Notices of a sign-off: the other coordinators when a second reviewer is needed. (That the comment period is
     * ending is told by the notice checks before its end, notice.NoticeSchedule, not by a sign-off.)
     */
    private void notifySignOff(long roundId, RoundState state, int sequence, int version, boolean secondNeeded,
                               Signer signer) {
        String code = rounds.get(roundId).code();
        if (secondNeeded) {
            notices.notifyCoordinators(NoticeKind.SIGN_OFF_WAITING, "sign-off:" + roundId + ":" + sequence,
                    signer.actor().name(), Map.of("round", code, "roundId", roundId, "version", version,
                            "signer", signer.displayName()));
        }
    }

    /** Records a request to issue the final reports from the signed-off run and queues the job. */
    @Transactional
    public IssueView requestFinal(long roundId, IssueRequest request) {
        return requestFinal(roundId, request, signer(), true);
    }

    private IssueView requestFinal(long roundId, IssueRequest request, Signer signer, boolean job) {
        RoundStateMachine.require(rounds.lockState(roundId), RoundAction.ISSUE_FINAL);
        long runId = signedRun(roundId, 0, request);
        return record(roundId, ReportStatus.FINAL, runId, "F", 0, request == null ? null : request.comments(), null,
                signer, job);
    }

    /** Records a request to amend the final (or last amended) reports and queues the job. */
    @Transactional
    public IssueView requestAmendment(long roundId, IssueRequest request) {
        RoundStateMachine.require(rounds.lockState(roundId), RoundAction.AMEND);
        if (request == null || request.reason() == null || request.reason().isBlank()) {
            throw new DomainException.BadRequest("An amendment needs its reason.");
        }
        if (request.reason().length() > 2000) {
            throw new DomainException.BadRequest("The reason has at most 2000 characters.");
        }
        int sequence = nextSequence(roundId);
        long runId = signedRun(roundId, sequence, request);
        return record(roundId, ReportStatus.AMENDED, runId, "A" + sequence, sequence, request.comments(),
                request.reason().strip(), signer(), true);
    }

    /** One issue request with its job's progress; 404 for a request of another round. */
    @Transactional
    public IssueView issue(long roundId, long issueId) {
        return issues(roundId).stream().filter(i -> i.id() == issueId).findFirst()
                .orElseThrow(() -> new DomainException.NotFound("The report issue"));
    }

    // ---- laboratories ------------------------------------------------------------------------------------

    /** The caller's laboratory's view; a round it is not enrolled in is "not found", like a missing one. */
    @Transactional
    public LaboratoryView forLaboratory(long roundId) {
        long laboratory = currentUser.requireLaboratoryId();
        String code = roundAccess.participantCode(roundId, laboratory)
                .orElseThrow(() -> new DomainException.NotFound("The round"));
        RoundService.RoundView round = rounds.get(roundId);
        List<DocumentView> docs = documents.ofRound(roundId).stream()
                .filter(d -> d.kind() == DocumentKind.ROUND
                        || d.kind() == DocumentKind.LABORATORY && Long.valueOf(laboratory).equals(d.laboratoryId()))
                .map(d -> view(d, Map.of(laboratory, code))).toList();
        return new LaboratoryView(roundId, round.code(), round.state(), code,
                RoundState.COMMENT_PERIOD.name().equals(round.state()), docs, comments(roundId, laboratory),
                rounds.commentPeriodEnd(roundId).orElse(null), round.timeZone());
    }

    /** A laboratory's comment on the preliminary round report, during the comment period. */
    @Transactional
    public CommentView comment(long roundId, TextRequest request) {
        long laboratory = currentUser.requireLaboratoryId();
        String code = roundAccess.participantCode(roundId, laboratory)
                .orElseThrow(() -> new DomainException.NotFound("The round"));
        RoundState state = rounds.lockState(roundId);
        if (state != RoundState.COMMENT_PERIOD) {
            throw new DomainException.Conflict("Comments on the preliminary report are taken during the comment period; "
                    + "the round is " + RoundStateMachine.describe(state) + ".");
        }
        String body = text(request, "comment");
        IssuedDocument preliminary = documents.ofRound(roundId).stream()
                .filter(d -> d.kind() == DocumentKind.ROUND && d.status() == ReportStatus.PRELIMINARY)
                .reduce((a, b) -> b)
                .orElseThrow(() -> new DomainException.Conflict("No preliminary report has been issued."));
        long id = insert("""
                INSERT INTO report_comment (round_id, document_id, laboratory_id, participant_code, body, written_by,
                       written_at)
                VALUES (:r, :d, :l, :code, :body, :by, :at) RETURNING id
                """, Map.of("r", roundId, "d", preliminary.id(), "l", laboratory, "code", code, "body", body,
                "by", currentUser.actor().name(), "at", now()));
        audit.record(new AuditTrail.Event(currentUser.actor(), "report.comment", "report_comment", Long.toString(id),
                null, Secrets.sha256Hex(body), "round=" + roundId + " report=" + preliminary.reportId()));
        return comments(roundId, laboratory).stream().filter(c -> c.id() == id).findFirst().orElseThrow();
    }

    // ---- auditors ----------------------------------------------------------------------------------------
    // ---- documents for any reader ------------------------------------------------------------------------

    /** The round's documents the caller may read: coordinators all, auditors final and amended ones (see class). */
    @Transactional
    public List<DocumentView> documentsOf(long roundId) {
        rounds.get(roundId);
        if (currentUser.is(Role.COORDINATOR)) {
            Map<Long, String> codes = roundAccess.participantCodes(roundId);
            return documents.ofRound(roundId).stream().map(d -> view(d, codes)).toList();
        }
        if (currentUser.is(Role.AUDITOR)) {
            return auditorDocuments(roundId);
        }
        return forLaboratory(roundId).documents();
    }

    /** The exact bytes of a document the caller may read; any other is "not found", like a missing one. */
    @Transactional
    public Content content(long roundId, long documentId) {
        DocumentView doc = readable(roundId, documentId);
        byte[] bytes = documents.content(documentId).orElseThrow(() -> new DomainException.NotFound("The document"));
        return new Content(doc.reportId() + ".pdf", PDF, bytes);
    }

    /**
     * The HTML view of a document the caller may read (the same rule as its PDF); "not found" for others and for
     * documents issued before their views were kept.
     */
    @Transactional
    public String html(long roundId, long documentId) {
        readable(roundId, documentId);
        return documents.html(documentId).orElseThrow(() -> new DomainException.NotFound("The HTML view of the document"));
    }

    private DocumentView readable(long roundId, long documentId) {
        List<DocumentView> readable;
        if (currentUser.laboratoryId().isPresent()) {
            readable = forLaboratory(roundId).documents();
        } else {
            Optional<IssuedDocument> found = documents.byId(documentId).filter(d -> Long.valueOf(roundId).equals(d.roundId()));
            if (found.isEmpty()) {
                throw new DomainException.NotFound("The document");
            }
            readable = documentsOf(roundId);
        }
        return readable.stream().filter(d -> d.id() == documentId).findFirst()
                .orElseThrow(() -> new DomainException.NotFound("The document"));
    }

    /**
     * What an auditor may read of a round: the final and amended laboratory reports of the laboratories whose valid
     * grant's data window holds the round (the day its first final report was issued, UTC — the rule of the
     * auditor's library), and the round reports (which name participant codes only). Every download goes through
     * here, so a laboratory report outside the window answers like a missing one.
     */
    private List<DocumentView> auditorDocuments(long roundId) {
        long auditor = currentUser.requireUserId();
        Map<Long, String> codes = roundAccess.participantCodes(roundId);
        List<IssuedDocument> all = documents.ofRound(roundId);
        java.time.LocalDate firstFinal = all.stream()
                .filter(d -> d.status() == ReportStatus.FINAL)
                .map(d -> d.issuedAt().atZone(ZoneOffset.UTC).toLocalDate()).min(java.util.Comparator.naturalOrder())
                .orElse(null);
        if (firstFinal == null) {
            return List.of();
        }
        Map<Long, Boolean> granted = new LinkedHashMap<>();
        java.util.function.LongPredicate inWindow = lab -> granted.computeIfAbsent(lab, l -> grants
                .activeDataWindows(auditor, l).stream().anyMatch(w -> w.contains(firstFinal)));
        return all.stream()
                .filter(d -> FOR_AUDITORS.contains(d.status()))
                .filter(d -> d.kind() == DocumentKind.ROUND
                        || d.kind() == DocumentKind.LABORATORY && d.laboratoryId() != null && inWindow.test(d.laboratoryId()))
                .map(d -> view(d, codes)).toList();
    }

    // ---- the job -----------------------------------------------------------------------------------------

    private record IssueRow(long id, long roundId, ReportStatus status, long runId, int runVersion,
                            String roundReportId, String suffix, Integer sequence, String comments, String reason,
                            String requestedBy, String requestedByName, String roundCode) {
    }

    /**
     * Carries out an issue request (the job's work): laboratory reports first, each in its own transaction and
     * skipped when issued already (so a retried job continues), then the round report and the round's state step in
     * one transaction. Does nothing when the round report has been issued already.
     *
     * @return a short result for the job: the round report's number and the number of laboratory reports
     */
    public String execute(long issueId, JobProgress progress) {
        IssueRow row = QuarkusTransaction.requiringNew().call(() -> issueRow(issueId));
        if (documents.byReportId(row.roundReportId()).isPresent()) {
            return row.roundReportId() + " issued already";
        }
        Actor actor = new Actor(row.requestedBy(), Role.COORDINATOR_NAME, null);
        LocalDate today = LocalDate.now(clock.withZone(ZoneOffset.UTC));
        Signatures signatures = QuarkusTransaction.requiringNew().call(() -> signatures(row, today));
        String replaces = null;
        if (row.status() == ReportStatus.AMENDED) {
            replaces = visibility.latestForAuditors(row.roundId()).map(ReportVisibility.PublishedEvaluation::reportId)
                    .orElseThrow(() -> new DomainException.Conflict("There is no final report to amend."));
        }
        ReportIdentity identity = assembler.withProviderOf(row.roundId(), new ReportIdentity(row.roundReportId(),
                row.status(), replaces, row.reason(), today, assembler.providerName()));
        ReportAssembler.Assembled assembled = assembler.assemble(row.roundId(), row.runVersion(), identity, signatures,
                row.comments());
        // the laboratory reports are rendered on the pool (each worker's renderers compute a measurand's chart data
        // once) and written here in order; the round report and the state change come last, in one transaction
        ReportRenderPool.Renderers own = ReportRenderPool.Renderers.fresh();
        List<String> codes = new ArrayList<>(assembled.laboratories().keySet());
        int total = codes.size() + 1;
        progress.report(0, total);
        Map<Long, IssuedDocument> previous = row.status() == ReportStatus.AMENDED ? latestLaboratoryDocuments(row.roundId())
                : Map.of();
        int[] issuedLabs = {0};
        int[] done = {0};
        Map<Long, String> laboratoryReports = new LinkedHashMap<>();
        List<LaboratoryReport> toRender = new ArrayList<>();
        for (String code : codes) {
            long laboratory = assembled.laboratories().get(code);
            String reportId = row.roundCode() + "-" + code + "-" + row.suffix();
            Optional<IssuedDocument> existing = documents.byReportId(reportId);
            if (existing.isPresent()) {
                if (!documents.evaluationRunOf(existing.get().id()).orElse(-1L).equals(assembled.evaluationRunId())) {
                    throw new IllegalStateException("report " + reportId + " was issued from another evaluation run");
                }
                issuedLabs[0]++;
                laboratoryReports.put(laboratory, reportId);
                progress.report(++done[0], total);
                continue;
            }
            String labReplaces = null;
            if (row.status() == ReportStatus.AMENDED) {
                IssuedDocument before = previous.get(laboratory);
                if (before == null) {
                    // a participant without an earlier report gets none in an amendment (nothing to replace)
                    progress.report(++done[0], total);
                    continue;
                }
                labReplaces = before.reportId();
            }
            ReportIdentity labIdentity = identity.withReport(reportId, labReplaces);
            toRender.add(new LaboratoryReport(withIdentity(assembled, labIdentity), code, row.roundReportId()));
        }
        record Rendered(LaboratoryReport lab, byte[] pdf, String html) {
        }
        renderPool.renderInOrder(toRender, own,
                (lab, renderers) -> new Rendered(lab, renderers.pdf().render(lab), renderers.html().render(lab)),
                rendered -> {
                    long laboratory = assembled.laboratories().get(rendered.lab().ownParticipantCode());
                    ReportIdentity labIdentity = rendered.lab().round().identity();
                    IssuedDocument issued = documents.issue(new IssuedDocuments.Issue(labIdentity,
                            DocumentKind.LABORATORY, row.roundId(), laboratory, PDF, rendered.pdf(),
                            assembled.evaluationRunId()), actor);
                    documents.attachHtml(issued.id(), rendered.html());
                    issuedLabs[0]++;
                    laboratoryReports.put(laboratory, labIdentity.reportId());
                    progress.report(++done[0], total);
                });
        PdfReportRenderer renderer = own.pdf();
        HtmlReportRenderer htmlRenderer = own.html();
        byte[] roundPdf = renderer.render(assembled.report());
        String roundHtml = htmlRenderer.render(assembled.report());
        int labs = issuedLabs[0];
        QuarkusTransaction.requiringNew().run(() -> {
            RoundState state = rounds.lockState(row.roundId());
            String detail = "report=" + row.roundReportId() + " run=" + row.runVersion() + " laboratoryReports=" + labs;
            switch (row.status()) {
                case PRELIMINARY -> {
                    if (state == RoundState.CLOSED) {
                        rounds.takeReportStep(row.roundId(), RoundAction.START_EVALUATION, actor, detail);
                    }
                    rounds.takeReportStep(row.roundId(), RoundAction.ISSUE_PRELIMINARY, actor, detail);
                }
                case FINAL -> rounds.takeReportStep(row.roundId(), RoundAction.ISSUE_FINAL, actor, detail);
                case AMENDED -> rounds.takeReportStep(row.roundId(), RoundAction.AMEND, actor, detail);
            }
            IssuedDocument issued = documents.issue(new IssuedDocuments.Issue(identity, DocumentKind.ROUND, row.roundId(),
                    null, PDF, roundPdf, assembled.evaluationRunId()), actor);
            documents.attachHtml(issued.id(), roundHtml);
            notifyIssued(row, laboratoryReports);
        });
        progress.report(total, total);
        return row.roundReportId() + " and " + labs + " laboratory report(s)";
    }

    /**
     * Notices of an issue, in the issuing transaction: each laboratory with a report of this issue is told its own
     * report's number and the round report's (nothing of other laboratories); for final and amended reports, the
     * auditors holding a grant from one of those laboratories are told the round report's number.
     */
    private void notifyIssued(IssueRow row, Map<Long, String> laboratoryReports) {
        String status = row.status().name().toLowerCase(java.util.Locale.ROOT);
        laboratoryReports.forEach((laboratory, reportId) -> notices.notifyLaboratory(NoticeKind.REPORT_ISSUED,
                "report:" + reportId, laboratory, Map.of("round", row.roundCode(), "roundId", row.roundId(),
                        "status", status, "roundReport", row.roundReportId(), "report", reportId)));
        if (FOR_AUDITORS.contains(row.status())) {
            notices.notifyAuditorsGrantedBy(NoticeKind.REPORT_ISSUED, "report:" + row.roundReportId(),
                    laboratoryReports.keySet(), Map.of("round", row.roundCode(), "status", status,
                            "roundReport", row.roundReportId(), "link", "/auditor/reports"));
        }
    }

    /** The issue request a job carries out. */
    public static long issueIdOf(Job job) {
        String digits = job.payload.replaceAll("[^0-9]", "");
        return Long.parseLong(digits);
    }

    private static org.roundtable.report.model.RoundReport withIdentity(ReportAssembler.Assembled assembled,
                                                                         ReportIdentity identity) {
        var r = assembled.report();
        return new org.roundtable.report.model.RoundReport(identity, r.scheme(), r.round(), r.item(), r.measurands(),
                r.pairs(), r.evaluation(), r.coordinatorComments(), r.signatures(), r.confidentialityStatement(),
                r.advice());
    }

    private Map<Long, IssuedDocument> latestLaboratoryDocuments(long roundId) {
        Map<Long, IssuedDocument> latest = new LinkedHashMap<>();
        for (IssuedDocument d : documents.ofRound(roundId)) {
            if (d.kind() == DocumentKind.LABORATORY && d.supersededBy() == null && FOR_AUDITORS.contains(d.status())) {
                latest.put(d.laboratoryId(), d);
            }
        }
        return latest;
    }

    private Signatures signatures(IssueRow row, LocalDate today) {
        if (row.status() == ReportStatus.PRELIMINARY) {
            return new Signatures(new Signatory(row.requestedByName(),
                    "Round coordinator (preliminary issue, before sign-off)", today), null);
        }
        List<SignOffView> signed = signOffs(row.roundId()).stream().filter(s -> s.sequence() == row.sequence()).toList();
        Signatory coordinator = null;
        Signatory second = null;
        for (SignOffView s : signed) {
            Signatory signatory = new Signatory(s.displayName(), s.role().equals("COORDINATOR") ? "Round coordinator"
                    : "Second reviewer", s.signedAt().toLocalDate());
            if (s.role().equals("COORDINATOR")) {
                coordinator = signatory;
            } else {
                second = signatory;
            }
        }
        if (coordinator == null) {
            throw new IllegalStateException("no sign-off for " + row.roundReportId());
        }
        return new Signatures(coordinator, second);
    }

    // ---- internals ---------------------------------------------------------------------------------------

    private IssueView record(long roundId, ReportStatus status, long runId, String suffix, Integer sequence,
                             String comments, String reason, Signer signer, boolean job) {
        refuseWhileIssuing(roundId);
        String code = rounds.get(roundId).code();
        String roundReportId = code + "-R-" + suffix;
        if (documents.byReportId(roundReportId).isPresent()) {
            throw new DomainException.Conflict("Report " + roundReportId + " has been issued already.");
        }
        String text = comments == null ? "" : comments.strip();
        if (text.length() > 20000) {
            throw new DomainException.BadRequest("The coordinator's comments have at most 20000 characters.");
        }
        Map<String, Object> params = new LinkedHashMap<>();
        params.put("r", roundId);
        params.put("status", status.name());
        params.put("run", runId);
        params.put("rid", roundReportId);
        params.put("suffix", suffix);
        params.put("seq", sequence);
        params.put("comments", text);
        params.put("reason", reason);
        params.put("by", signer.actor().name());
        params.put("name", signer.displayName());
        params.put("at", now());
        long id = insert("""
                INSERT INTO report_issue (round_id, status, evaluation_run_id, round_report_id, report_suffix,
                       sign_off_sequence, coordinator_comments, amendment_reason, requested_by, requested_by_name,
                       requested_at)
                VALUES (:r, :status, :run, :rid, :suffix, :seq, :comments, :reason, :by, :name, :at) RETURNING id
                """, params);
        String jobText = "";
        if (job) {
            jobText = " job=" + jobs.enqueue(JOB_KIND, payload(id), signer.actor().name()).id;
        }
        audit.record(new AuditTrail.Event(signer.actor(), "report.issue-requested", "report_issue",
                Long.toString(id), null, null, status + " " + roundReportId + jobText));
        return issue(roundId, id);
    }

    private Signer signer() {
        return new Signer(currentUser.actor(), currentUser.displayName());
    }

    /**
     * Takes a round from closed to a final report without background jobs: preliminary issue from run
     * {@code version}, comment period, sign-off and final issue, all by {@code signer}. Resumable: each step is
     * taken according to the round's state, and an issue request left unfinished is carried out rather than made
     * again. For the demo loader; the API and pages always issue through the report job.
     */
    public void publishWithoutJobs(long roundId, int version, String comments, Signer signer) {
        publishWithoutJobs(roundId, version, comments, signer, null);
    }

    /**
     * As {@link #publishWithoutJobs(long, int, String, Signer)}, the sign-off and the final issue taken at
     * {@code finalAt} on the loader's clock ({@link org.roundtable.platform.LoaderClock}) when given, so that the
     * demo's comment periods last as long as a real one.
     */
    public void publishWithoutJobs(long roundId, int version, String comments, Signer signer, java.time.Instant finalAt) {
        JobProgress none = (done, total) -> {
        };
        for (int step = 0; step < 6; step++) {
            RoundState state = RoundState.valueOf(QuarkusTransaction.requiringNew().call(() -> rounds.get(roundId).state()));
            switch (state) {
                case CLOSED, EVALUATING -> execute(pendingOrNew(roundId, ReportStatus.PRELIMINARY,
                        () -> requestPreliminary(roundId, new IssueRequest(version, comments, null), signer, false)), none);
                case PRELIMINARY_ISSUED -> QuarkusTransaction.requiringNew().run(() -> openCommentPeriod(roundId, signer));
                case COMMENT_PERIOD -> {
                    Runnable finalIssue = () -> {
                        QuarkusTransaction.requiringNew().run(() -> {
                            if (signOffs(roundId).stream().noneMatch(s -> s.sequence() == 0)) {
                                signOff(roundId, new SignOffRequest(version), signer);
                            }
                        });
                        execute(pendingOrNew(roundId, ReportStatus.FINAL,
                                () -> requestFinal(roundId, new IssueRequest(version, comments, null), signer, false)),
                                none);
                    };
                    if (finalAt == null) {
                        finalIssue.run();
                    } else {
                        org.roundtable.platform.LoaderClock.at(finalAt, finalIssue);
                    }
                }
                default -> {
                    return;
                }
            }
        }
    }

    private long pendingOrNew(long roundId, ReportStatus status, java.util.function.Supplier<IssueView> request) {
        return QuarkusTransaction.requiringNew().call(() -> issues(roundId).stream()
                .filter(i -> !i.done() && i.status().equals(status.name())).map(IssueView::id).findFirst()
                .orElseGet(() -> request.get().id()));
    }

    static String payload(long issueId) {
        return "{\"reportIssue\":" + issueId + "}";
    }

    private long signedRun(long roundId, int sequence, IssueRequest request) {
        List<SignOffView> signed = signOffs(roundId).stream().filter(s -> s.sequence() == sequence).toList();
        if (signed.isEmpty()) {
            throw new DomainException.Conflict("The report has not been signed off: a coordinator signs it off first.");
        }
        boolean second = schemes.secondReviewerRequired(rounds.get(roundId).schemeId());
        if (second && signed.size() < 2) {
            throw new DomainException.Conflict("The scheme requires a second reviewer: another coordinator must sign "
                    + "the report off before it is issued.");
        }
        int version = signed.get(0).evaluationVersion();
        if (request != null && request.version() != null && request.version() != version) {
            throw new DomainException.Conflict("The report was signed off for evaluation run " + version + ", not "
                    + request.version() + ".");
        }
        return assembler.runId(roundId, version);
    }

    private void refuseWhileIssuing(long roundId) {
        boolean busy = issues(roundId).stream().anyMatch(i -> !i.done()
                && ("QUEUED".equals(i.jobStatus()) || "RUNNING".equals(i.jobStatus())));
        if (busy) {
            throw new DomainException.Conflict("Reports of this round are being issued; wait for that job to finish.");
        }
    }

    private int nextSequence(long roundId) {
        Number n = (Number) entityManager.createNativeQuery("""
                SELECT count(*) FROM issued_document
                 WHERE round_id = :r AND kind = 'ROUND' AND status IN ('FINAL', 'AMENDED')
                """).setParameter("r", roundId).getSingleResult();
        return n.intValue();
    }

    private IssueRow issueRow(long issueId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT i.id, i.round_id, i.status, i.evaluation_run_id, e.version, i.round_report_id, i.report_suffix,
                       i.sign_off_sequence, i.coordinator_comments, i.amendment_reason, i.requested_by,
                       i.requested_by_name, r.code
                  FROM report_issue i JOIN evaluation_run e ON e.id = i.evaluation_run_id
                  JOIN round r ON r.id = i.round_id
                 WHERE i.id = :id
                """).setParameter("id", issueId).getResultList();
        if (rows.isEmpty()) {
            throw new DomainException.NotFound("The report issue");
        }
        Object[] r = rows.get(0);
        return new IssueRow(((Number) r[0]).longValue(), ((Number) r[1]).longValue(), ReportStatus.valueOf((String) r[2]),
                ((Number) r[3]).longValue(), ((Number) r[4]).intValue(), (String) r[5], (String) r[6],
                r[7] == null ? null : ((Number) r[7]).intValue(), (String) r[8], (String) r[9], (String) r[10],
                (String) r[11], (String) r[12]);
    }

    private List<IssueView> issues(long roundId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT i.id, i.status, e.version, i.round_report_id, i.requested_by, i.requested_at,
                       j.id, j.status, j.progress_done, j.progress_total, j.error,
                       EXISTS (SELECT 1 FROM issued_document d WHERE d.report_id = i.round_report_id)
                  FROM report_issue i JOIN evaluation_run e ON e.id = i.evaluation_run_id
                  LEFT JOIN job j ON j.kind = :kind AND j.payload = '{"reportIssue":' || i.id || '}'
                 WHERE i.round_id = :r ORDER BY i.id
                """).setParameter("r", roundId).setParameter("kind", JOB_KIND).getResultList();
        return rows.stream().map(r -> new IssueView(((Number) r[0]).longValue(), (String) r[1],
                ((Number) r[2]).intValue(), (String) r[3], (String) r[4], Timestamps.utc(r[5]),
                r[6] == null ? null : ((Number) r[6]).longValue(), (String) r[7],
                r[8] == null ? 0 : ((Number) r[8]).intValue(), r[9] == null ? 0 : ((Number) r[9]).intValue(),
                (String) r[10], Boolean.TRUE.equals(r[11]))).toList();
    }

    private List<SignOffView> signOffs(long roundId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT s.sequence, e.version, s.role, s.username, s.display_name, s.signed_at
                  FROM report_sign_off s JOIN evaluation_run e ON e.id = s.evaluation_run_id
                 WHERE s.round_id = :r ORDER BY s.sequence, s.id
                """).setParameter("r", roundId).getResultList();
        return rows.stream().map(r -> new SignOffView(((Number) r[0]).intValue(), ((Number) r[1]).intValue(),
                (String) r[2], (String) r[3], (String) r[4], Timestamps.utc(r[5]))).toList();
    }

    /** Comments of the round with their answers; only those of {@code laboratoryId} when it is given. */
    private List<CommentView> comments(long roundId, Long laboratoryId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT c.id, d.report_id, c.participant_code, c.body, c.written_at
                  FROM report_comment c JOIN issued_document d ON d.id = c.document_id
                 WHERE c.round_id = :r AND (:l < 0 OR c.laboratory_id = :l)
                 ORDER BY c.id
                """).setParameter("r", roundId).setParameter("l", laboratoryId == null ? -1L : laboratoryId)
                .getResultList();
        @SuppressWarnings("unchecked")
        List<Object[]> answerRows = entityManager.createNativeQuery("""
                SELECT a.comment_id, a.id, a.body, a.answered_by, a.answered_at
                  FROM report_comment_answer a JOIN report_comment c ON c.id = a.comment_id
                 WHERE c.round_id = :r ORDER BY a.id
                """).setParameter("r", roundId).getResultList();
        Map<Long, List<AnswerView>> answers = new LinkedHashMap<>();
        for (Object[] a : answerRows) {
            answers.computeIfAbsent(((Number) a[0]).longValue(), k -> new ArrayList<>()).add(new AnswerView(
                    ((Number) a[1]).longValue(), (String) a[2], (String) a[3], Timestamps.utc(a[4])));
        }
        return rows.stream().map(r -> new CommentView(((Number) r[0]).longValue(), (String) r[1], (String) r[2],
                (String) r[3], Timestamps.utc(r[4]), answers.getOrDefault(((Number) r[0]).longValue(), List.of())))
                .toList();
    }

    private static DocumentView view(IssuedDocument d, Map<Long, String> codes) {
        return new DocumentView(d.id(), d.reportId(), d.kind().name(), d.status().name(),
                d.kind() == DocumentKind.LABORATORY ? codes.get(d.laboratoryId()) : null, d.replacesReportId(),
                d.amendmentReason(), d.supersededBy(), d.sha256(), d.issuedAt().atOffset(ZoneOffset.UTC));
    }

    private static String text(TextRequest request, String what) {
        String body = request == null || request.body() == null ? "" : request.body().strip();
        if (body.isEmpty()) {
            throw new DomainException.BadRequest("The " + what + " is empty.");
        }
        if (body.length() > 4000) {
            throw new DomainException.BadRequest("The " + what + " has at most 4000 characters.");
        }
        return body;
    }

    private long insert(String sql, Map<String, Object> params) {
        var query = entityManager.createNativeQuery(sql);
        params.forEach(query::setParameter);
        return ((Number) query.getSingleResult()).longValue();
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC).truncatedTo(ChronoUnit.MICROS);
    }
}
