package org.roundtable.history;

import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.QueryParam;
import jakarta.ws.rs.core.MediaType;
import org.roundtable.account.Role;

/**
 * A laboratory's history as JSON: its own (members, managers, API tokens) or, for coordinators and granted
 * auditors, any laboratory's (404 without a valid grant). Query parameters as on the page: {@code scheme},
 * {@code measurand}, {@code method}, {@code from}, {@code until} (dates), {@code rounds} or {@code years} (window of
 * the combined scores).
 */
@Path("/api/v1")
@Produces(MediaType.APPLICATION_JSON)
public class HistoryResource {

    private final HistoryService history;

    public HistoryResource(HistoryService history) {
        this.history = history;
    }

    @GET
    @Path("my-laboratory/history")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public HistoryService.History own(@QueryParam("scheme") String scheme, @QueryParam("measurand") String measurand,
                                      @QueryParam("method") String method, @QueryParam("from") String from,
                                      @QueryParam("until") String until, @QueryParam("rounds") String rounds,
                                      @QueryParam("years") String years) {
        return history.own(HistoryFilters.of(scheme, measurand, method, from, until, rounds, years));
    }

    @GET
    @Path("laboratories/{laboratoryId}/history")
    @RolesAllowed({Role.COORDINATOR_NAME, Role.AUDITOR_NAME})
    public HistoryService.History ofLaboratory(@PathParam("laboratoryId") long laboratoryId,
                                               @QueryParam("scheme") String scheme,
                                               @QueryParam("measurand") String measurand,
                                               @QueryParam("method") String method, @QueryParam("from") String from,
                                               @QueryParam("until") String until, @QueryParam("rounds") String rounds,
                                               @QueryParam("years") String years) {
        return history.history(laboratoryId, HistoryFilters.of(scheme, measurand, method, from, until, rounds, years));
    }
}
