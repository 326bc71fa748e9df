package org.roundtable.report;

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

import java.util.List;

/**
 * JSON API of a round's reports for its laboratories (members, managers, LIMS tokens): the round reports and the
 * laboratory's own laboratory reports from the preliminary issue on, their exact bytes, and comments on the
 * preliminary report during the comment period with the coordinators' answers. Another laboratory's round or
 * report is "not found", exactly like a missing one.
 */
@Path("/api/v1/my-rounds")
@Produces(MediaType.APPLICATION_JSON)
@RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
public class MyReportResource {

    private final ReportLifecycle lifecycle;

    public MyReportResource(ReportLifecycle lifecycle) {
        this.lifecycle = lifecycle;
    }

    @GET
    @org.roundtable.account.ApiTokenScope.Required(org.roundtable.account.ApiTokenScope.READ_SCORES)
    @Path("{roundId}/documents")
    public List<ReportLifecycle.DocumentView> documents(@PathParam("roundId") long roundId) {
        return lifecycle.forLaboratory(roundId).documents();
    }

    @GET
    @org.roundtable.account.ApiTokenScope.Required(org.roundtable.account.ApiTokenScope.READ_SCORES)
    @Path("{roundId}/documents/{documentId}")
    @Produces({"application/pdf", MediaType.APPLICATION_JSON})
    public Response download(@PathParam("roundId") long roundId, @PathParam("documentId") long documentId) {
        return ReportResource.attachment(lifecycle.content(roundId, documentId));
    }

    /** The document's HTML view, to read in the browser (same access as the PDF). */
    @GET
    @org.roundtable.account.ApiTokenScope.Required(org.roundtable.account.ApiTokenScope.READ_SCORES)
    @Path("{roundId}/documents/{documentId}/html")
    @Produces(MediaType.TEXT_HTML)
    public Response html(@PathParam("roundId") long roundId, @PathParam("documentId") long documentId) {
        return ReportResource.page(lifecycle.html(roundId, documentId));
    }

    @GET
    @Path("{roundId}/comments")
    public List<ReportLifecycle.CommentView> comments(@PathParam("roundId") long roundId) {
        return lifecycle.forLaboratory(roundId).comments();
    }

    @POST
    @Path("{roundId}/comments")
    @Consumes(MediaType.APPLICATION_JSON)
    public Response comment(@PathParam("roundId") long roundId, ReportLifecycle.TextRequest request) {
        return Response.status(201).entity(lifecycle.comment(roundId, request)).build();
    }
}
