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

/** JSON API for coordinators: results marked as blunders (left out of the statistics, still scored) and withdrawals. */
@Path("/api/v1/rounds")
@Produces(MediaType.APPLICATION_JSON)
@RolesAllowed(Role.COORDINATOR_NAME)
public class ExclusionResource {

    private final ExclusionService exclusions;
    private final CurrentUser currentUser;

    public ExclusionResource(ExclusionService exclusions, CurrentUser currentUser) {
        this.exclusions = exclusions;
        this.currentUser = currentUser;
    }

    @POST
    @Path("{roundId}/exclusions")
    @Consumes(MediaType.APPLICATION_JSON)
    public Response mark(@PathParam("roundId") long roundId, ExclusionService.MarkRequest request) {
        return Response.status(201).entity(exclusions.mark(roundId, request, currentUser.actor())).build();
    }

    @GET
    @Path("{roundId}/exclusions")
    public ExclusionService.RoundExclusions list(@PathParam("roundId") long roundId) {
        return exclusions.list(roundId);
    }

    @POST
    @Path("{roundId}/exclusions/{exclusionId}/withdrawal")
    @Consumes(MediaType.APPLICATION_JSON)
    public ExclusionService.Exclusion withdraw(@PathParam("roundId") long roundId,
                                               @PathParam("exclusionId") long exclusionId,
                                               ExclusionService.WithdrawalRequest request) {
        return exclusions.withdraw(roundId, exclusionId, request, currentUser.actor());
    }
}
