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
    private final CorrectiveActions actions;
    private final FieldView fields;

    public HistoryResource(HistoryService history, CorrectiveActions actions, FieldView fields) {
        this.history = history;
        this.actions = actions;
        this.fields = fields;
    }

    /** The field view of a scheme (coordinators). */
    @GET
    @Path("field-view/{schemeId}")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public FieldView.Field field(@PathParam("schemeId") long schemeId) {
        return fields.of(schemeId);
    }

    @GET
    @Path("my-laboratory/corrective-actions")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public java.util.List<CorrectiveActions.Entry> ownCorrectiveActions() {
        return actions.own();
    }

    /** A laboratory's corrective actions for coordinators and granted auditors (rounds inside the data window). */
    @GET
    @Path("laboratories/{laboratoryId}/corrective-actions")
    @RolesAllowed({Role.COORDINATOR_NAME, Role.AUDITOR_NAME})
    public java.util.List<CorrectiveActions.Entry> correctiveActions(@PathParam("laboratoryId") long laboratoryId) {
        return actions.forReader(laboratoryId);
    }

    @GET
    @org.roundtable.account.ApiTokenScope.Required(org.roundtable.account.ApiTokenScope.READ_SCORES)
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
