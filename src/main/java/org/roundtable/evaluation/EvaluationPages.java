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
import org.roundtable.platform.DisplaySettings;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.NumberFormats;
import org.roundtable.scheme.RoundAccess;
import org.roundtable.scheme.RoundState;

import java.net.URI;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Locale;

/**
 * Pages for coordinators: the evaluation runs of a round (start a preview or a run, list the versions), one run in
 * summary (a row per measurand), and one measurand of a run for review before the report — how x_pt and σpt were
 * set, the robust and method-group statistics, the warnings, the exclusions, the scores a page at a time and the
 * report's charts (drawn by {@code report.ReviewCharts}). Laboratories never reach these pages.
 */
@Path("/")
@Produces(MediaType.TEXT_HTML)
@RolesAllowed(Role.COORDINATOR_NAME)
public class EvaluationPages {

    @CheckedTemplate(basePath = "evaluation")
    static class Templates {
        static native TemplateInstance runs(RoundAccess.SubmissionWindow round, List<EvaluationViews.RunSummary> runs,
                                            boolean previewAllowed, boolean runAllowed, EvaluationJobs.JobView job,
                                            String error);

        static native TemplateInstance run(RoundAccess.SubmissionWindow round, EvaluationReview.Overview page);

        static native TemplateInstance measurand(RoundAccess.SubmissionWindow round, MeasurandPage page);

        static native TemplateInstance progress(EvaluationJobs.JobView job);
    }

    /**
     * One measurand of a run for review: its outcome (no scores), reporting and score digits, one page of its
     * scores with the search and verdict filter that chose them, the first results left out of the statistics, and
     * the addresses of the charts the report will carry.
     */
    public record MeasurandPage(EvaluationViews.RunSummary run, String key, EvaluationViews.MeasurandOutcome outcome,
                                int digits, int scoreDecimals, boolean informationOnly,
                                EvaluationReview.ScorePage scores, String query, String verdict,
                                EvaluationReview.ScorePage exclusions, List<Chart> charts, String previous,
                                String next) {

        /** The page's address, for the pager and the filter. */
        public String path() {
            return "/rounds/" + run.roundId() + "/evaluation/" + run.version() + "/measurands/" + key;
        }

        /** Why the score was chosen, with the symbols as people write them. */
        public String scoreUsedReason() {
            String reason = outcome.scoreUsedReason();
            return reason == null ? "" : WarningTexts.forPeople("", reason, digits);
        }

        /** The warnings' texts for people: the trade's symbols, numbers at the measurand's digits (WarningTexts). */
        public List<String> warnings() {
            return outcome.warnings().stream().map(w -> WarningTexts.forPeople(w, digits)).toList();
        }

        /** The verdict filter's choices. */
        public List<FilterChoice> choices() {
            return filterChoices();
        }

        /** The query string of the current search and filter, after {@code page=N} ({@code &q=..&verdict=..}). */
        public String filterQuery() {
            StringBuilder q = new StringBuilder();
            if (query != null && !query.isBlank()) {
                q.append("&q=").append(java.net.URLEncoder.encode(query, java.nio.charset.StandardCharsets.UTF_8));
            }
            if (verdict != null && !verdict.isBlank()) {
                q.append("&verdict=").append(verdict);
            }
            return q.toString();
        }
    }

    /** A chart of the report as an image resource: its address, its width and height, what it shows. */
    public record Chart(String kind, String src, int width, int height, String alt) {
    }

    /** The chart kinds a measurand's section of the report carries, in the report's order. */
    public static final List<String> CHART_KINDS = List.of("score-bars", "density", "uncertainty-bars");

    /** The verdict filters offered above the scores, by query value, with their labels. */
    public record FilterChoice(String value, String label) {
    }

    /** Rows of results left out of the statistics shown on the measurand page before the scores. */
    static final int EXCLUSIONS_SHOWN = 20;

    private final EvaluationService evaluations;
    private final EvaluationJobs jobs;
    private final RoundAccess rounds;
    private final CurrentUser currentUser;
    private final EvaluationReview review;
    private final DisplaySettings display;

    public EvaluationPages(EvaluationService evaluations, EvaluationJobs jobs, RoundAccess rounds,
                           CurrentUser currentUser, EvaluationReview review, DisplaySettings display) {
        this.evaluations = evaluations;
        this.jobs = jobs;
        this.rounds = rounds;
        this.currentUser = currentUser;
        this.review = review;
        this.display = display;
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

    /**
     * A run in summary: per measurand x_pt, σpt and how each was set, u(x_pt), the number of results and the
     * verdicts counted, the warnings, and a link to the measurand's own page. No per-laboratory rows: the page is
     * as small for 10,000 laboratories as for ten.
     */
    @GET
    @Path("rounds/{roundId}/evaluation/{version}")
    public TemplateInstance run(@PathParam("roundId") long roundId, @PathParam("version") int version) {
        RoundAccess.SubmissionWindow round = rounds.window(roundId);
        return Templates.run(round, review.overview(roundId, version));
    }

    /**
     * One measurand of a run: its robust statistics, warnings, method groups, the results left out with their
     * reasons, its scores a page at a time (by participant code; {@code q} searches the code, {@code verdict}
     * filters) and the charts its section of the report will carry.
     */
    @GET
    @Path("rounds/{roundId}/evaluation/{version}/measurands/{measurandId}")
    public TemplateInstance measurand(@PathParam("roundId") long roundId, @PathParam("version") int version,
                                      @PathParam("measurandId") String measurandId, @QueryParam("page") Integer page,
                                      @QueryParam("q") String query, @QueryParam("verdict") String verdict) {
        RoundAccess.SubmissionWindow round = rounds.window(roundId);
        EvaluationViews.RunSummary run = review.summaryOf(roundId, version);
        EvaluationViews.MeasurandOutcome outcome = review.measurand(roundId, version, measurandId);
        String key = EvaluationReview.key(outcome.element(), outcome.itemLabel());
        EvaluationReview.ScoreFilter filter = EvaluationReview.ScoreFilter.of(verdict);
        String search = query == null ? "" : query.strip();
        if (search.length() > 16) {
            search = search.substring(0, 16); // participant codes are at most 16 characters
        }
        EvaluationReview.ScorePage scores = review.scores(roundId, version, key, search, filter, page,
                display.pageSize());
        EvaluationReview.ScorePage exclusions = outcome.excluded() == 0 ? null : review.scores(roundId, version, key,
                null, EvaluationReview.ScoreFilter.EXCLUDED, 1, EXCLUSIONS_SHOWN);
        int decimals = outcome.rules() == null ? NumberFormats.DEFAULT_SCORE_DECIMALS : outcome.rules().decimalsOfScores();
        boolean informationOnly = outcome.rules() != null && outcome.rules().informationOnly();
        String base = "/rounds/" + roundId + "/evaluation/" + version + "/measurands/" + key + "/charts/";
        String title = outcome.element() + ", item " + outcome.itemLabel();
        List<Chart> charts = List.of(
                new Chart("score-bars", base + "score-bars.svg", 640, 220,
                        "Scores of " + title + " from lowest to highest, with the action and warning lines"),
                new Chart("density", base + "density.svg", 640, 220,
                        "Kernel density of the results of " + title + ", with the assigned value and ± 2σpt"),
                new Chart("uncertainty-bars", base + "uncertainty-bars.svg", 640, 220,
                        "Results of " + title + " in increasing order with their expanded uncertainties"));
        List<String> keys = review.keys(roundId, version);
        int at = keys.indexOf(key);
        return Templates.measurand(round, new MeasurandPage(run, key, outcome, review.digits(roundId,
                outcome.element()), decimals, informationOnly, scores, search, filter == null ? ""
                : filter.name().toLowerCase(Locale.ROOT).replace('_', '-'), exclusions, charts,
                at > 0 ? keys.get(at - 1) : null, at >= 0 && at < keys.size() - 1 ? keys.get(at + 1) : null));
    }

    /** The verdict filter's choices (query value and label). */
    public static List<FilterChoice> filterChoices() {
        return java.util.Arrays.stream(EvaluationReview.ScoreFilter.values()).map(f -> new FilterChoice(
                f.name().toLowerCase(Locale.ROOT).replace('_', '-'), org.roundtable.platform.Labels.of(f))).toList();
    }

    private TemplateInstance runsPage(long roundId, EvaluationJobs.JobView job, String error) {
        RoundAccess.SubmissionWindow round = rounds.window(roundId);
        RoundState state = RoundState.valueOf(round.state());
        boolean closed = state == RoundState.CLOSED || state == RoundState.EVALUATING;
        List<EvaluationViews.RunSummary> newestFirst = new ArrayList<>(evaluations.runs(roundId));
        Collections.reverse(newestFirst);
        return Templates.runs(round, newestFirst, closed || state == RoundState.OPEN_FOR_RESULTS, closed, job, error);
    }
}
