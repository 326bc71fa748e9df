package org.roundtable.evaluation;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.FormParam;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.QueryParam;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.roundtable.account.CurrentUser;
import org.roundtable.account.Role;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.NumberFormats;
import org.roundtable.scheme.RoundAccess;
import org.roundtable.scheme.RoundState;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.net.URI;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Locale;

/**
 * Pages for coordinators: the evaluation runs of a round (start a preview or a run, list the versions) and one run
 * in full — per measurand how x_pt and σpt were set, the robust and method-group statistics, the warnings, and every
 * participant's scores by participant code. Laboratories never reach these pages.
 */
@Path("/")
@Produces(MediaType.TEXT_HTML)
@RolesAllowed(Role.COORDINATOR_NAME)
public class EvaluationPages {

    /** A run view with numbers formatted for reading (the API keeps the exact values). */
    public record RunPage(EvaluationViews.RunSummary run, List<MeasurandRows> measurands) {
    }

    /** One measurand of a run, formatted. */
    public record MeasurandRows(EvaluationViews.MeasurandOutcome outcome, String assignedValue,
                                String assignedValueUncertainty, String sigmaPt, String median, String madE,
                                String nIqr, String robustMean, String robustSd, List<GroupRow> groups,
                                List<ScoreRow> scores) {
        public String anchor() {
            return outcome.element() + "-" + outcome.itemLabel();
        }
    }

    /** One method group, formatted. */
    public record GroupRow(String methodGroup, int n, String median, String robustMean, String robustSd) {
    }

    /** One participant's result and scores, formatted; {@code tone} is a CSS class for the classification. */
    public record ScoreRow(String participantCode, String reported, String methodGroup, String z, String zPrime,
                           String zeta, String en, String classification, String tone, String excludedReason) {
    }

    @CheckedTemplate(basePath = "evaluation")
    static class Templates {
        static native TemplateInstance runs(RoundAccess.SubmissionWindow round, List<EvaluationViews.RunSummary> runs,
                                            boolean previewAllowed, boolean runAllowed, EvaluationJobs.JobView job,
                                            String error);

        static native TemplateInstance run(RoundAccess.SubmissionWindow round, RunPage page);

        static native TemplateInstance progress(EvaluationJobs.JobView job);
    }

    private final EvaluationService evaluations;
    private final EvaluationJobs jobs;
    private final RoundAccess rounds;
    private final CurrentUser currentUser;

    public EvaluationPages(EvaluationService evaluations, EvaluationJobs jobs, RoundAccess rounds,
                           CurrentUser currentUser) {
        this.evaluations = evaluations;
        this.jobs = jobs;
        this.rounds = rounds;
        this.currentUser = currentUser;
    }

    /**
     * The versions of the round; with {@code job} the progress of that evaluation job (the page reloads itself
     * while the job waits or runs, and links the version it produced).
     */
    @GET
    @Path("rounds/{roundId}/evaluation")
    public TemplateInstance runs(@PathParam("roundId") long roundId, @QueryParam("job") Long jobId) {
        EvaluationJobs.JobView job = jobId == null ? jobs.unfinished(roundId).orElse(null) : jobs.status(roundId, jobId);
        return runsPage(roundId, job, null);
    }

    /** Queues a preview ({@code preview=true}) or a run as a background job and shows its progress. */
    @POST
    @Path("rounds/{roundId}/evaluation")
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response start(@PathParam("roundId") long roundId, @FormParam("preview") String preview) {
        try {
            EvaluationJobs.JobView job = jobs.start(roundId, "true".equals(preview), currentUser.actor());
            return Response.seeOther(URI.create("/rounds/" + roundId + "/evaluation?job=" + job.jobId())).build();
        } catch (DomainException.NotFound | DomainException.Forbidden e) {
            throw e;
        } catch (DomainException e) {
            return Response.status(e.status()).entity(runsPage(roundId, null, e.detail())).build();
        }
    }

    /**
     * The progress bar of an evaluation job alone, for htmx's polling; once the job has finished, asks the
     * browser to load the page again ({@code HX-Refresh}) so that it shows the outcome.
     */
    @GET
    @Path("rounds/{roundId}/evaluation/jobs/{jobId}/progress")
    public Response progress(@PathParam("roundId") long roundId, @PathParam("jobId") long jobId) {
        EvaluationJobs.JobView job = jobs.status(roundId, jobId);
        boolean finished = !"QUEUED".equals(job.status()) && !"RUNNING".equals(job.status());
        Response.ResponseBuilder answer = Response.ok(Templates.progress(job));
        return finished ? answer.header("HX-Refresh", "true").build() : answer.build();
    }

    @GET
    @Path("rounds/{roundId}/evaluation/{version}")
    public TemplateInstance run(@PathParam("roundId") long roundId, @PathParam("version") int version) {
        RoundAccess.SubmissionWindow round = rounds.window(roundId);
        EvaluationViews.Run run = evaluations.run(roundId, version);
        return Templates.run(round, new RunPage(run.run(), run.measurands().stream().map(EvaluationPages::rows).toList()));
    }

    private TemplateInstance runsPage(long roundId, EvaluationJobs.JobView job, String error) {
        RoundAccess.SubmissionWindow round = rounds.window(roundId);
        RoundState state = RoundState.valueOf(round.state());
        boolean closed = state == RoundState.CLOSED || state == RoundState.EVALUATING;
        List<EvaluationViews.RunSummary> newestFirst = new ArrayList<>(evaluations.runs(roundId));
        Collections.reverse(newestFirst);
        return Templates.runs(round, newestFirst, closed || state == RoundState.OPEN_FOR_RESULTS, closed, job, error);
    }

    static MeasurandRows rows(EvaluationViews.MeasurandOutcome o) {
        List<GroupRow> groups = o.methodGroups().stream().map(g -> new GroupRow(g.methodGroup(), g.n(),
                figure(g.median()), figure(g.robustMean()), figure(g.robustSd()))).toList();
        int decimals = o.rules() == null ? NumberFormats.DEFAULT_SCORE_DECIMALS : o.rules().decimalsOfScores();
        boolean informationOnly = o.rules() != null && o.rules().informationOnly();
        List<ScoreRow> scores = o.scores().stream().map(s -> new ScoreRow(s.participantCode(), s.reported(),
                s.methodGroup(), score(s.z(), decimals), score(s.zPrime(), decimals), score(s.zeta(), decimals),
                score(s.en(), decimals), s.classification() != null
                        ? s.classification().toLowerCase(Locale.ROOT).replace('_', ' ')
                        : informationOnly && (s.z() != null || s.zeta() != null || s.en() != null)
                        ? "for information only" : "",
                tone(s.classification()), s.excludedReason())).toList();
        return new MeasurandRows(o, figure(o.assignedValue()), figure(o.assignedValueUncertainty()),
                figure(o.sigmaPt()), figure(o.median()), figure(o.madE()), figure(o.nIqr()), figure(o.robustMean()),
                figure(o.robustSd()), groups, scores);
    }

    /** Six significant digits for reading; the API and the exports carry the exact values. */
    static String figure(Double value) {
        if (value == null) {
            return "—";
        }
        if (value.isNaN() || value.isInfinite()) {
            return value.toString();
        }
        return new BigDecimal(value).round(new MathContext(6, RoundingMode.HALF_UP)).stripTrailingZeros()
                .toPlainString().replace('-', '−');
    }

    /**
     * Scores at the plan's score decimals by the product's number rules (half away from zero from the shortest
     * decimal form, the figure the classification was made on), with the minus sign.
     */
    static String score(Double value, int decimals) {
        if (value == null) {
            return "";
        }
        return NumberFormats.score(value, decimals);
    }

    private static String tone(String classification) {
        if (classification == null) {
            return "";
        }
        String c = classification.toUpperCase(Locale.ROOT);
        if (c.startsWith("UNSATISFACTORY") || c.startsWith("INCONSISTENT")) {
            return "status-bad";
        }
        if (c.startsWith("QUESTIONABLE")) {
            return "status-warn";
        }
        return c.startsWith("SATISFACTORY") || c.startsWith("CONSISTENT") ? "status-ok" : "";
    }
}
