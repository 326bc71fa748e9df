package org.roundtable.report;

import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.QueryParam;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.roundtable.account.Role;

import java.util.List;

/**
 * JSON API of a round's reports for coordinators (issue, comment period, answers, sign-off, final, amendments,
 * the issue jobs' progress) and, for reading issued documents, auditors (final and amended reports, and laboratory
 * reports of laboratories that granted them). Issuing answers 202: a background job does the work; its progress is
 * in {@code GET .../reports} under {@code issues}; its {@code documents} are one page ({@code ?page=N},
 * {@code documentsPaging}); {@code GET .../documents} lists them all.
 */
@Path("/api/v1/rounds")
@Produces(MediaType.APPLICATION_JSON)
public class ReportResource {

    private final ReportLifecycle lifecycle;

    public ReportResource(ReportLifecycle lifecycle) {
        this.lifecycle = lifecycle;
    }

    @GET
    @Path("{roundId}/reports")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public ReportLifecycle.Overview overview(@PathParam("roundId") long roundId, @QueryParam("page") Integer page) {
        return lifecycle.overview(roundId, page);
    }

    @POST
    @Path("{roundId}/reports/preliminary")
    @Consumes(MediaType.APPLICATION_JSON)
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response preliminary(@PathParam("roundId") long roundId, ReportLifecycle.IssueRequest request) {
        return Response.accepted(lifecycle.requestPreliminary(roundId, request)).build();
    }

    @POST
    @Path("{roundId}/reports/comment-period")
    @Consumes(MediaType.APPLICATION_JSON)
    @RolesAllowed(Role.COORDINATOR_NAME)
    public ReportLifecycle.Overview openCommentPeriod(@PathParam("roundId") long roundId) {
        lifecycle.openCommentPeriod(roundId);
        return lifecycle.overview(roundId);
    }

    @POST
    @Path("{roundId}/reports/comments/{commentId}/answers")
    @Consumes(MediaType.APPLICATION_JSON)
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response answer(@PathParam("roundId") long roundId, @PathParam("commentId") long commentId,
                           ReportLifecycle.TextRequest request) {
        return Response.status(201).entity(lifecycle.answer(roundId, commentId, request)).build();
    }

    @POST
    @Path("{roundId}/reports/sign-offs")
    @Consumes(MediaType.APPLICATION_JSON)
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response signOff(@PathParam("roundId") long roundId, ReportLifecycle.SignOffRequest request) {
        return Response.status(201).entity(lifecycle.signOff(roundId, request)).build();
    }

    @POST
    @Path("{roundId}/reports/final")
    @Consumes(MediaType.APPLICATION_JSON)
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response issueFinal(@PathParam("roundId") long roundId, ReportLifecycle.IssueRequest request) {
        return Response.accepted(lifecycle.requestFinal(roundId, request)).build();
    }

    @POST
    @Path("{roundId}/reports/amendments")
    @Consumes(MediaType.APPLICATION_JSON)
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response amend(@PathParam("roundId") long roundId, ReportLifecycle.IssueRequest request) {
        return Response.accepted(lifecycle.requestAmendment(roundId, request)).build();
    }

    @GET
    @Path("{roundId}/documents")
    @RolesAllowed({Role.COORDINATOR_NAME, Role.AUDITOR_NAME})
    public List<ReportLifecycle.DocumentView> documents(@PathParam("roundId") long roundId) {
        return lifecycle.documentsOf(roundId);
    }

    /** The exact bytes issued (those whose SHA-256 the verification accepts), as a download. */
    @GET
    @Path("{roundId}/documents/{documentId}")
    @Produces({"application/pdf", MediaType.APPLICATION_JSON})
    @RolesAllowed({Role.COORDINATOR_NAME, Role.AUDITOR_NAME})
    public Response download(@PathParam("roundId") long roundId, @PathParam("documentId") long documentId) {
        return attachment(lifecycle.content(roundId, documentId));
    }

    /** The document's HTML view, to read in the browser (same access as the PDF). */
    @GET
    @Path("{roundId}/documents/{documentId}/html")
    @Produces(MediaType.TEXT_HTML)
    @RolesAllowed({Role.COORDINATOR_NAME, Role.AUDITOR_NAME})
    public Response html(@PathParam("roundId") long roundId, @PathParam("documentId") long documentId) {
        return page(lifecycle.html(roundId, documentId));
    }

    static Response page(String html) {
        return Response.ok(html, MediaType.TEXT_HTML_TYPE.withCharset("UTF-8")).header("Cache-Control", "no-store").build();
    }

    static Response attachment(ReportLifecycle.Content content) {
        return Response.ok(content.bytes(), content.contentType())
                .header("Content-Disposition", "attachment; filename=\"" + content.fileName().replaceAll("[^A-Za-z0-9._-]", "_") + "\"")
                .header("Cache-Control", "no-store")
                .build();
    }
}
