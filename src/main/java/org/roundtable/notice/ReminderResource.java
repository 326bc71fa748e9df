package org.roundtable.notice;

import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.roundtable.account.CurrentUser;
import org.roundtable.account.Role;
import org.roundtable.platform.DomainException;

import java.util.Map;

/** JSON API: a coordinator's reminder to the laboratories of a round. */
@Path("/api/v1/rounds")
@Produces(MediaType.APPLICATION_JSON)
public class ReminderResource {

    /** A reminder: the coordinator's message; {@code everyone} true to reach laboratories that sent results too. */
    public record ReminderRequest(String message, Boolean everyone) {
    }

    private final NoticeService notices;
    private final CurrentUser currentUser;

    public ReminderResource(NoticeService notices, CurrentUser currentUser) {
        this.notices = notices;
        this.currentUser = currentUser;
    }

    /** Sends the reminder; answers 201 with the number of people it reached. */
    @POST
    @Path("{roundId}/reminders")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_JSON)
    public Response remind(@PathParam("roundId") long roundId, ReminderRequest request) {
        if (request == null) {
            throw new DomainException.BadRequest("Write the reminder's message.");
        }
        int reached = notices.remind(roundId, request.message(), !Boolean.TRUE.equals(request.everyone()),
                currentUser.actor());
        return Response.status(201).entity(Map.of("recipients", reached)).build();
    }
}
