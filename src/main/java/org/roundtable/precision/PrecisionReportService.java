package org.roundtable.precision;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import java.time.Clock;
import java.time.LocalDate;
import java.time.ZoneOffset;
import java.util.List;
import java.util.Optional;
import org.eclipse.microprofile.config.inject.ConfigProperty;
import org.roundtable.account.CurrentUser;
import org.roundtable.audit.Actor;
import org.roundtable.platform.DomainException;
import org.roundtable.report.DocumentKind;
import org.roundtable.report.IssuedDocument;
import org.roundtable.report.IssuedDocuments;
import org.roundtable.report.model.ReportIdentity;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.report.render.PdfReportRenderer;
import org.roundtable.scheme.RoundAccess;
import org.roundtable.scheme.RoundAction;
import org.roundtable.scheme.RoundService;
import org.roundtable.scheme.RoundState;

/**
 * The report of a precision experiment: a draft for comment (issued as a preliminary report), the comment period,
 * then the final report; both PDF documents stored as issued documents (verifiable by their SHA-256 like every
 * report) and rendered from the latest evaluation run, which must be computed from the current inputs. The lifecycle
 * steps are the round's own (ISSUE_PRELIMINARY, OPEN_COMMENT_PERIOD, ISSUE_FINAL).
 */
@ApplicationScoped
public class PrecisionReportService {

    private static final PdfReportRenderer PDF = new PdfReportRenderer();

    private final PrecisionExperimentService studies;
    private final RoundService roundService;
    private final RoundAccess rounds;
    private final IssuedDocuments documents;
    private final CurrentUser currentUser;
    private final EntityManager entityManager;
    private final Clock clock;
    private final String providerName;
    private final PrecisionMaterials materials;

    public PrecisionReportService(PrecisionExperimentService studies, RoundService roundService, RoundAccess rounds,
                                  IssuedDocuments documents, CurrentUser currentUser, EntityManager entityManager,
                                  Clock clock, PrecisionMaterials materials,
                                  @ConfigProperty(name = "roundtable.reports.provider-name",
                                          defaultValue = "Roundtable proficiency testing") String providerName) {
        this.studies = studies;
        this.roundService = roundService;
        this.rounds = rounds;
        this.documents = documents;
        this.currentUser = currentUser;
        this.entityManager = entityManager;
        this.clock = clock;
        this.providerName = providerName;
        this.materials = materials;
    }

    /** An issued report of the study, for the API. */
    public record Issued(long documentId, String reportId, String status, String sha256, String issuedAt, int runNumber) {
    }

    /** Issues the draft report for comment from the latest run (the round moves to preliminary issued). */
    @Transactional
    public Issued issueDraft(long roundId, Actor actor) {
        return issue(roundId, actor, ReportStatus.PRELIMINARY, RoundState.EVALUATING, RoundAction.ISSUE_PRELIMINARY);
    }

    /** Opens the comment period on the draft report. */
    @Transactional
    public void openCommentPeriod(long roundId, Actor actor) {
        studies.study(roundId);
        roundService.takeReportStep(roundId, RoundAction.OPEN_COMMENT_PERIOD, actor, "precision experiment draft report");
    }

    /** Issues the final report after the comment period, from the latest run. */
    @Transactional
    public Issued issueFinal(long roundId, Actor actor) {
        return issue(roundId, actor, ReportStatus.FINAL, RoundState.COMMENT_PERIOD, RoundAction.ISSUE_FINAL);
    }

    private Issued issue(long roundId, Actor actor, ReportStatus status, RoundState required, RoundAction step) {
        RoundAccess.PrecisionStudy study = studies.study(roundId);
        RoundState state = roundService.lockState(roundId);
        if (state != required) {
            throw new DomainException.Conflict(status == ReportStatus.PRELIMINARY
                    ? "The draft report is issued while the study is being evaluated."
                    : "The final report is issued at the end of the comment period on the draft.");
        }
        PrecisionExperimentService.Run run = studies.latestRun(roundId)
                .orElseThrow(() -> new DomainException.Conflict("Evaluate the study before issuing its report."));
        if (!studies.latestRunIsCurrent(roundId)) {
            throw new DomainException.Conflict("Results or decisions changed since evaluation run " + run.runNumber()
                    + ": evaluate again before issuing the report.");
        }
        LocalDate today = LocalDate.now(clock.withZone(ZoneOffset.UTC));
        String reportId = study.roundCode() + (status == ReportStatus.FINAL ? "-PRECISION" : "-PRECISION-P");
        PrecisionReportDocument.Content content = content(study, run, reportId, status, today.toString());
        PrecisionReportDocument.Built built = PrecisionReportDocument.build(content, true);
        byte[] pdf = PDF.renderDocument(built.xhtml(), built.charts());
        IssuedDocument doc = documents.issue(new IssuedDocuments.Issue(new ReportIdentity(reportId, status, null, null,
                today, providerName), DocumentKind.ROUND, roundId, null, "application/pdf", pdf), actor);
        entityManager.createNativeQuery("INSERT INTO precision_report (document_id, run_id) VALUES (:d, :r)")
                .setParameter("d", doc.id()).setParameter("r", run.id()).executeUpdate();
        roundService.takeReportStep(roundId, step, actor, "report=" + reportId + " run=" + run.runNumber());
        return new Issued(doc.id(), doc.reportId(), status.word(), doc.sha256(), doc.issuedAt().toString(), run.runNumber());
    }

    /** The latest issued report of the study, if any. */
    @Transactional
    public Optional<Issued> latest(long roundId) {
        studies.study(roundId);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT p.document_id, r.run_number FROM precision_report p
                  JOIN precision_evaluation_run r ON r.id = p.run_id
                 WHERE r.round_id = :round ORDER BY p.document_id DESC LIMIT 1
                """).setParameter("round", roundId).getResultList();
        return rows.stream().findFirst().flatMap(r -> documents.byId(((Number) r[0]).longValue()).map(d ->
                new Issued(d.id(), d.reportId(), d.status().word(), d.sha256(), d.issuedAt().toString(),
                        ((Number) r[1]).intValue())));
    }

    /**
     * The PDF of the latest issued report: coordinators always; an enrolled laboratory once a report is issued
     * (participants read the draft during the comment period). Anyone else gets 404.
     */
    @Transactional
    public byte[] latestPdf(long roundId) {
        allowReader(roundId);
        Issued issued = latest(roundId).orElseThrow(() -> new DomainException.NotFound("The report"));
        return documents.content(issued.documentId()).orElseThrow(() -> new DomainException.NotFound("The report"));
    }

    /** The HTML view of the latest issued report, rendered from the same run (same numbers as the PDF). */
    @Transactional
    public String latestHtml(long roundId) {
        allowReader(roundId);
        Issued issued = latest(roundId).orElseThrow(() -> new DomainException.NotFound("The report"));
        RoundAccess.PrecisionStudy study = studies.study(roundId);
        Number runId = (Number) entityManager.createNativeQuery("SELECT run_id FROM precision_report WHERE document_id = :d")
                .setParameter("d", issued.documentId()).getSingleResult();
        PrecisionExperimentService.Run run = studies.run(roundId, runId.longValue()).orElseThrow();
        IssuedDocument doc = documents.byId(issued.documentId()).orElseThrow();
        return PrecisionReportDocument.build(content(study, run, doc.reportId(), doc.status(),
                doc.issuedAt().atZone(ZoneOffset.UTC).toLocalDate().toString()), false).xhtml();
    }

    private void allowReader(long roundId) {
        studies.study(roundId);
        if (currentUser.is(org.roundtable.account.Role.COORDINATOR)) {
            return;
        }
        studies.requireEnrolled(roundId);
    }

    private PrecisionReportDocument.Content content(RoundAccess.PrecisionStudy study, PrecisionExperimentService.Run run,
                                                    String reportId, ReportStatus status, String date) {
        List<PrecisionReportDocument.Level> levels = study.plan().levels().stream()
                .map(l -> new PrecisionReportDocument.Level(l.label(), l.material())).toList();
        String scheme = roundService.get(study.roundId()).schemeName();
        return new PrecisionReportDocument.Content(reportId, status == ReportStatus.PRELIMINARY ? "Draft for comment"
                : "Final", date, providerName, study.roundCode(), scheme, levels, run.planVersion(), study.planSha256(),
                run.runNumber(), studies.data(study.roundId()), studies.exclusions(study.roundId()),
                study.reportingDigits(), run.study(), materials.of(study.roundId(), run.study()));
    }
}
