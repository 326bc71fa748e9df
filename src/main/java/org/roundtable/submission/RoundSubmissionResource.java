package org.roundtable.submission;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.roundtable.account.Role;
import org.roundtable.platform.DomainException;

import java.util.List;

/**
 * JSON API for coordinators: every laboratory's submissions in a round, confirmed corrections after the close,
 * review flags and messages.
 */
@Path("/api/v1/rounds")
@Produces(MediaType.APPLICATION_JSON)
@RolesAllowed(Role.COORDINATOR_NAME)
public class RoundSubmissionResource {

    private final SubmissionService submissions;
    private final SubmissionQueries queries;
    private final SubmissionMessages messages;
    private final ObjectMapper mapper;

    public RoundSubmissionResource(SubmissionService submissions, SubmissionQueries queries, SubmissionMessages messages,
                                   ObjectMapper mapper) {
        this.submissions = submissions;
        this.queries = queries;
        this.messages = messages;
        this.mapper = mapper;
    }

    public record Correction(String reason, String evidence, JsonNode results) {
    }

    @GET
    @Path("{roundId}/submissions")
    public List<SubmissionViews.Participation> participations(@PathParam("roundId") long roundId) {
        return queries.participations(roundId);
    }

    @GET
    @Path("{roundId}/submissions/{laboratoryId}")
    public List<SubmissionViews.Revision> revisions(@PathParam("roundId") long roundId,
                                                    @PathParam("laboratoryId") long laboratoryId) {
        return queries.revisionsOf(roundId, laboratoryId);
    }

    /** A confirmed transcription correction after the close: {@code {"reason","evidence","results":[...]}}. */
    @POST
    @Path("{roundId}/submissions/{laboratoryId}/corrections")
    @Consumes(MediaType.APPLICATION_JSON)
    public Response correct(@PathParam("roundId") long roundId, @PathParam("laboratoryId") long laboratoryId,
                            Correction correction) {
        if (correction == null || correction.results() == null) {
            throw new DomainException.BadRequest("A correction needs reason, evidence and results.");
        }
        ObjectNode payload = mapper.createObjectNode();
        payload.set("results", correction.results());
        byte[] json;
        try {
            json = mapper.writeValueAsBytes(payload);
        } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
            throw new DomainException.BadRequest("The results are not valid JSON.");
        }
        return Response.status(201)
                .entity(submissions.correct(roundId, laboratoryId, json, correction.reason(), correction.evidence())).build();
    }

    @GET
    @Path("{roundId}/review-flags")
    public List<SubmissionViews.Flag> flags(@PathParam("roundId") long roundId) {
        return queries.flags(roundId);
    }

    @GET
    @Path("{roundId}/messages")
    public List<SubmissionViews.Message> roundMessages(@PathParam("roundId") long roundId) {
        return messages.allOfRound(roundId);
    }

    @POST
    @Path("{roundId}/submissions/{laboratoryId}/messages")
    @Consumes(MediaType.APPLICATION_JSON)
    public Response reply(@PathParam("roundId") long roundId, @PathParam("laboratoryId") long laboratoryId,
                          SubmissionResource.NewMessage message) {
        return Response.status(201).entity(messages.replyAsCoordinator(roundId, laboratoryId,
                message == null ? null : message.body())).build();
    }
}
