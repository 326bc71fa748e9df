package org.roundtable.evaluation;

import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.roundtable.account.ApiTokenScope;
import org.roundtable.account.Role;

/**
 * A laboratory's own scores in the round's published evaluation, for its LIMS (members, managers and API tokens
 * that read scores):
 * from the preliminary report on; before that, or for a round the laboratory is not in, 404 as for a missing round.
 */
@Path("/api/v1/my-rounds")
@ApiTokenScope.Required(ApiTokenScope.READ_SCORES)
public class MyScoresResource {

    private final EvaluationExports exports;

    public MyScoresResource(EvaluationExports exports) {
        this.exports = exports;
    }

    @GET
    @Path("{roundId}/scores")
    @Produces(MediaType.APPLICATION_JSON)
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public EvaluationExports.OwnScores scores(@PathParam("roundId") long roundId) {
        return exports.ownScores(roundId);
    }

    @GET
    @Path("{roundId}/scores.csv")
    @Produces("text/csv")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public Response scoresCsv(@PathParam("roundId") long roundId) {
        EvaluationExports.OwnScores own = exports.ownScores(roundId);
        return EvaluationExportResource.csv(EvaluationExports.ownScoresCsv(own),
                EvaluationExportResource.fileName(own.roundCode(), own.evaluationVersion(),
                        "scores-" + own.participantCode()));
    }
}
