package org.roundtable.scheme;

import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;
import org.roundtable.account.Role;

import java.util.List;

/**
 * JSON API for laboratories (members, managers and their LIMS tokens): the rounds their laboratory is
 * enrolled in, its own participant code, instructions with the safety cautions, its items and notices, and
 * receipt acknowledgement. The laboratory is always the caller's own; other laboratories' rounds are "not found".
 */
@Path("/api/v1/my-rounds")
@Produces(MediaType.APPLICATION_JSON)
@Consumes(MediaType.APPLICATION_JSON)
@RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
public class MyRoundResource {

    private final EnrolmentService enrolments;

    public MyRoundResource(EnrolmentService enrolments) {
        this.enrolments = enrolments;
    }

    @GET
    public List<EnrolmentService.MyRoundSummary> list() {
        return enrolments.myRounds();
    }

    @GET
    @Path("/{roundId}")
    public EnrolmentService.MyRound get(@PathParam("roundId") long roundId) {
        return enrolments.myRound(roundId);
    }

    @POST
    @Path("/{roundId}/receipts")
    public EnrolmentService.MyRound acknowledge(@PathParam("roundId") long roundId, EnrolmentService.Receipt receipt) {
        return enrolments.acknowledgeReceipt(roundId, receipt);
    }
}
