package org.roundtable.history;

import io.quarkus.narayana.jta.QuarkusTransaction;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.enterprise.event.Event;
import org.roundtable.audit.Actor;
import org.roundtable.evaluation.EvaluationService;
import org.roundtable.report.RoundReportIssued;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.Round;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.Publications;
import org.roundtable.testing.World;

import java.time.Instant;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.List;

/**
 * Builds published rounds for history tests: Cr against a certified value x_pt = 18.00 % with σpt = 0.10 %
 * (U(x_pt) = 0.02 %, k = 2, so u(x_pt) = 0.01 % ≤ 0.3·σpt and z is the score used), so that a reported value
 * gives a z-score by hand: z = (x − 18.00)/0.10.
 */
@ApplicationScoped
public class HistoryRounds {

    private static final Actor COORDINATOR = new Actor("history-test", "coordinator", null);

    private final World world;
    private final Publications publications;
    private final EvaluationService evaluations;
    private final Event<RoundReportIssued> issued;

    public HistoryRounds(World world, Publications publications, EvaluationService evaluations,
                         Event<RoundReportIssued> issued) {
        this.world = world;
        this.publications = publications;
        this.evaluations = evaluations;
        this.issued = issued;
    }

    static EvaluationPlan certifiedCr() {
        return certifiedCr(null);
    }

    /** As {@link #certifiedCr()} with the plan's early warnings (null: the usual ones). */
    static EvaluationPlan certifiedCr(EvaluationPlan.EarlyWarningPlan warnings) {
        return new EvaluationPlan(List.of(new EvaluationPlan.MeasurandPlan("Cr", "CERTIFIED_REFERENCE", null, "18.00",
                "0.02", "2", null, "FIXED", "0.10", null, null, null, null, null, null, null, null, null, null, null,
                null)), warnings);
    }

    /** A fresh scheme for a series of rounds. */
    public long scheme() {
        return world.scheme();
    }

    /** A closed round of {@code scheme} with the laboratories' Cr results ({@code values[i]} for {@code labs[i]}), evaluated. */
    public long evaluatedRound(long scheme, long[] labs, String[] values) {
        return evaluatedRound(scheme, labs, values, null);
    }

    /** As {@link #evaluatedRound(long, long[], String[])} with the plan's early warnings (null: the usual ones). */
    public long evaluatedRound(long scheme, long[] labs, String[] values, EvaluationPlan.EarlyWarningPlan warnings) {
        long round = world.round(RoundState.CLOSED, certifiedCr(warnings), Round.LatePolicy.REFUSE, labs);
        world.sql("UPDATE round SET scheme_id = ? WHERE id = ?", scheme, round);
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Cr", values[i], null, "spark-oes", false);
        }
        evaluations.run(round, false, COORDINATOR);
        return round;
    }

    /** A round of one laboratory's result, evaluated and issued with a round report of {@code status} now. */
    public long published(long scheme, long lab, String value, ReportStatus status) {
        return published(scheme, lab, value, status, null);
    }

    /** As {@link #published(long, long, String, ReportStatus)} with the round plan's early warnings. */
    public long published(long scheme, long lab, String value, ReportStatus status,
                          EvaluationPlan.EarlyWarningPlan warnings) {
        long round = evaluatedRound(scheme, new long[]{lab}, new String[]{value}, warnings);
        publications.issueRoundReport(round, 1, status);
        return round;
    }

    /**
     * As {@link #published} but the report counts as issued at {@code issuedAt} (a stored document row with that
     * time, and the issue event the report feature fires), for periods and data windows.
     */
    public long publishedAt(long scheme, long lab, String value, ReportStatus status, Instant issuedAt) {
        long round = evaluatedRound(scheme, new long[]{lab}, new String[]{value});
        long runId = publications.runId(round, 1);
        String reportId = World.unique("RT-HIST");
        String sha = org.roundtable.platform.Secrets.sha256Hex(reportId);
        long document = world.insert("INSERT INTO issued_document (report_id, kind, status, round_id, content_type, bytes, "
                        + "sha256, issued_at, issued_by, evaluation_run_id) VALUES (?, 'ROUND', ?, ?, 'application/pdf', ?, ?, ?, "
                        + "'history-test', ?) RETURNING id", reportId, status.name(), round,
                ("%PDF-1.7 " + reportId).getBytes(), sha, OffsetDateTime.ofInstant(issuedAt, ZoneOffset.UTC), runId);
        QuarkusTransaction.requiringNew().run(() -> issued.fire(new RoundReportIssued(document, reportId, status.name(),
                round, runId, 1, sha, issuedAt, null)));
        return round;
    }
}
