package org.roundtable.evaluation;

import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.roundtable.account.CurrentUser;
import org.roundtable.account.Role;

import java.net.URI;
import java.util.List;

/**
 * JSON API for coordinators: evaluation runs of a round (and previews on the results so far). Laboratories never
 * see a run through this API.
 */
@Path("/api/v1/rounds")
@Produces(MediaType.APPLICATION_JSON)
@RolesAllowed(Role.COORDINATOR_NAME)
public class EvaluationResource {

    private final EvaluationService evaluations;
    private final EvaluationJobs evaluationJobs;
    private final CurrentUser currentUser;

    public EvaluationResource(EvaluationService evaluations, EvaluationJobs evaluationJobs, CurrentUser currentUser) {
        this.evaluations = evaluations;
        this.evaluationJobs = evaluationJobs;
        this.currentUser = currentUser;
    }

    /** {@code {"preview": true|false}}; absent means false. */
    public record RunRequest(Boolean preview) {
    }

    /**
     * Queues an evaluation run (a background job): 202 with the job and its address; 409 at once when the round's
     * state or plan does not allow the run.
     */
    @POST
    @Path("{roundId}/evaluations")
    @Consumes(MediaType.APPLICATION_JSON)
    public Response run(@PathParam("roundId") long roundId, RunRequest request) {
        boolean preview = request != null && Boolean.TRUE.equals(request.preview());
        EvaluationJobs.JobView job = evaluationJobs.start(roundId, preview, currentUser.actor());
        return Response.accepted(job)
                .location(URI.create("/api/v1/rounds/" + roundId + "/evaluation-jobs/" + job.jobId())).build();
    }

    /** An evaluation job of the round: status, progress in measurands, error, and the run's version once done. */
    @GET
    @Path("{roundId}/evaluation-jobs/{jobId}")
    public EvaluationJobs.JobView job(@PathParam("roundId") long roundId, @PathParam("jobId") long jobId) {
        return evaluationJobs.status(roundId, jobId);
    }

    @GET
    @Path("{roundId}/evaluations")
    public List<EvaluationViews.RunSummary> runs(@PathParam("roundId") long roundId) {
        return evaluations.runs(roundId);
    }

    @GET
    @Path("{roundId}/evaluations/{version}")
    public EvaluationViews.Run run(@PathParam("roundId") long roundId, @PathParam("version") int version) {
        return evaluations.run(roundId, version);
    }
}
