package org.roundtable.testing;

import io.quarkus.narayana.jta.QuarkusTransaction;
import jakarta.enterprise.context.ApplicationScoped;
import org.roundtable.audit.Actor;
import org.roundtable.evaluation.EvaluationService;
import org.roundtable.report.DocumentKind;
import org.roundtable.report.IssuedDocuments;
import org.roundtable.report.model.ReportIdentity;
import org.roundtable.report.model.ReportStatus;

import java.nio.charset.StandardCharsets;
import java.time.LocalDate;

/**
 * Makes an evaluation run visible the way issuing a round report does: an issued round document naming the run.
 * The bytes are a stand-in (a unique PDF-like string); what matters here is the issued row and its run.
 */
@ApplicationScoped
public class Publications {

    private static final Actor COORDINATOR = new Actor("publications-test", "coordinator", null);

    private final World world;
    private final IssuedDocuments documents;
    private final EvaluationService evaluations;

    public Publications(World world, IssuedDocuments documents, EvaluationService evaluations) {
        this.world = world;
        this.documents = documents;
        this.evaluations = evaluations;
    }

    /** The row id of the round's evaluation run {@code version}. */
    public long runId(long roundId, int version) {
        return world.insert("SELECT id FROM evaluation_run WHERE round_id = ? AND version = ?", roundId, version);
    }

    /** Issues a round report of {@code status} reporting run {@code version}; returns its report number. */
    public String issueRoundReport(long roundId, int version, ReportStatus status) {
        return issueRoundReport(roundId, version, status, null);
    }

    /** As {@link #issueRoundReport(long, int, ReportStatus)}; an amendment names the report it replaces. */
    public String issueRoundReport(long roundId, int version, ReportStatus status, String replaces) {
        String reportId = World.unique("RT-TEST");
        ReportIdentity identity = new ReportIdentity(reportId, status, replaces,
                replaces == null ? null : "Corrected in a test", LocalDate.of(2026, 1, 15), "Roundtable test provider");
        byte[] bytes = ("%PDF-1.7\n% stand-in report " + reportId + "\n%%EOF\n").getBytes(StandardCharsets.US_ASCII);
        long runId = runId(roundId, version);
        QuarkusTransaction.requiringNew().run(() -> documents.issue(new IssuedDocuments.Issue(identity,
                DocumentKind.ROUND, roundId, null, "application/pdf", bytes, runId), COORDINATOR));
        return reportId;
    }

    /**
     * A closed round with laboratory {@code laboratoryId} enrolled and one Cr result of it, evaluated (version 1)
     * and published with a round report of {@code status}; returns the round id.
     */
    public long publishedRound(long laboratoryId, ReportStatus status) {
        long round = world.round(org.roundtable.scheme.RoundState.CLOSED, World.simplePlan("0.10"),
                org.roundtable.scheme.Round.LatePolicy.REFUSE, laboratoryId);
        world.reportResult(round, laboratoryId, "Cr", "18.12", null, "spark-oes", false);
        int version = evaluations.run(round, false, COORDINATOR).run().version();
        issueRoundReport(round, version, status);
        return round;
    }
}
