package org.roundtable.report;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.FormParam;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.QueryParam;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.roundtable.account.ApiTokenScope;
import org.roundtable.account.Role;
import org.roundtable.platform.Confirmation;
import org.roundtable.platform.Confirmations;
import org.roundtable.platform.DisplaySettings;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.FormActions;

import java.util.List;

/**
 * Pages of a round's reports: the coordinators' page (issue preliminary from a chosen run, comment period, answers,
 * sign-off, final, amendment, documents with SHA-256 and the issue jobs' progress), the laboratory's page (its
 * downloads, comments and answers) and the auditor's page (final and amended reports, granted laboratories'
 * reports). Every action is a POST form with the CSRF token handled by {@link ReportLifecycle}.
 */
@Path("/")
@Produces(MediaType.TEXT_HTML)
public class ReportPages {

    @CheckedTemplate(basePath = "report")
    static class Templates {
        static native TemplateInstance roundReports(ReportLifecycle.Overview overview, String error, String message);

        static native TemplateInstance myReports(ReportLifecycle.LaboratoryView view, String error, String message);

        static native TemplateInstance auditorReports(AuditorLibrary.Shelf shelf, AuditorLibrary.Typed typed,
                                                      String error);

        static native TemplateInstance myScores(LaboratoryScores.Page page);
    }

    private final ReportLifecycle lifecycle;
    private final Confirmations confirmations;
    private final LaboratoryScores scores;
    private final AuditorLibrary library;
    private final DisplaySettings display;

    public ReportPages(ReportLifecycle lifecycle, Confirmations confirmations, LaboratoryScores scores,
                       AuditorLibrary library, DisplaySettings display) {
        this.confirmations = confirmations;
        this.lifecycle = lifecycle;
        this.scores = scores;
        this.library = library;
        this.display = display;
    }

    // ---- coordinators ------------------------------------------------------------------------------------

    @GET
    @Path("rounds/{roundId}/reports")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public TemplateInstance roundReports(@PathParam("roundId") long roundId, @QueryParam("page") Integer page) {
        return Templates.roundReports(lifecycle.overview(roundId, page), null, null);
    }

    @POST
    @Path("rounds/{roundId}/reports/preliminary")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response preliminary(@PathParam("roundId") long roundId, @FormParam("version") String version,
                                @FormParam("comments") String comments, @FormParam("confirmed") String confirmed) {
        if (!Confirmation.confirmed(confirmed)) {
            return secondStep(roundId, "preliminary", "Issue the preliminary reports?",
                    "Every participant receives its laboratory report and the round report, signed and with their "
                            + "SHA-256 fingerprints. Issued documents are never changed; a correction is an amended "
                            + "report.", "Issue the preliminary reports",
                    List.of(new Confirmation.Field("version", version == null ? "" : version),
                            new Confirmation.Field("comments", comments == null ? "" : comments)));
        }
        return coordinator(roundId, () -> lifecycle.requestPreliminary(roundId,
                        new ReportLifecycle.IssueRequest(number(version), comments, null)),
                "The preliminary reports are being issued; this page shows the job's progress.");
    }

    @POST
    @Path("rounds/{roundId}/reports/comment-period")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response commentPeriod(@PathParam("roundId") long roundId) {
        return coordinator(roundId, () -> {
            lifecycle.openCommentPeriod(roundId);
            return null;
        }, "The comment period is open: laboratories may comment on the preliminary report.");
    }

    @POST
    @Path("rounds/{roundId}/reports/comments/{commentId}/answers")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response answer(@PathParam("roundId") long roundId, @PathParam("commentId") long commentId,
                           @FormParam("body") String body) {
        return coordinator(roundId, () -> lifecycle.answer(roundId, commentId, new ReportLifecycle.TextRequest(body)),
                "Answer kept.");
    }

    @POST
    @Path("rounds/{roundId}/reports/sign-offs")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response signOff(@PathParam("roundId") long roundId, @FormParam("version") String version) {
        return coordinator(roundId, () -> lifecycle.signOff(roundId, new ReportLifecycle.SignOffRequest(number(version))),
                "Signed off.");
    }

    @POST
    @Path("rounds/{roundId}/reports/final")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response issueFinal(@PathParam("roundId") long roundId, @FormParam("comments") String comments,
                               @FormParam("confirmed") String confirmed) {
        if (!Confirmation.confirmed(confirmed)) {
            return secondStep(roundId, "final", "Issue the final reports?",
                    "Every participant receives its final laboratory report and the final round report, which "
                            + "auditors with access can read too. Issued documents are never changed; a correction is an "
                            + "amended report.", "Issue the final reports",
                    List.of(new Confirmation.Field("comments", comments == null ? "" : comments)));
        }
        return coordinator(roundId, () -> lifecycle.requestFinal(roundId,
                new ReportLifecycle.IssueRequest(null, comments, null)), "The final reports are being issued.");
    }

    @POST
    @Path("rounds/{roundId}/reports/amendments")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response amend(@PathParam("roundId") long roundId, @FormParam("version") String version,
                          @FormParam("reason") String reason, @FormParam("comments") String comments,
                          @FormParam("confirmed") String confirmed) {
        if (!Confirmation.confirmed(confirmed)) {
            return secondStep(roundId, "amendments", "Issue amended reports?",
                    "Amended reports replace the final ones for every participant; the replaced reports are marked as "
                            + "withdrawn and the reason is printed in the new ones.", "Issue the amended reports",
                    List.of(new Confirmation.Field("version", version == null ? "" : version),
                            new Confirmation.Field("reason", reason == null ? "" : reason),
                            new Confirmation.Field("comments", comments == null ? "" : comments)));
        }
        return coordinator(roundId, () -> lifecycle.requestAmendment(roundId,
                new ReportLifecycle.IssueRequest(number(version), comments, reason)), "The amended reports are being issued.");
    }

    // ---- laboratories ------------------------------------------------------------------------------------

    @GET
    @Path("my-rounds/{roundId}/reports")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public TemplateInstance myReports(@PathParam("roundId") long roundId) {
        return Templates.myReports(lifecycle.forLaboratory(roundId), null, null);
    }

    @POST
    @Path("my-rounds/{roundId}/reports/comments")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response comment(@PathParam("roundId") long roundId, @FormParam("body") String body) {
        return FormActions.attempt(() -> {
            lifecycle.comment(roundId, new ReportLifecycle.TextRequest(body));
            return Templates.myReports(lifecycle.forLaboratory(roundId), null, "Comment sent to the coordinators.");
        }, e -> Templates.myReports(lifecycle.forLaboratory(roundId), e, null));
    }

    /** The laboratory's own scores once a report is issued to laboratories (404 before, as for a missing round). */
    @GET
    @Path("my-rounds/{roundId}/scores")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    @ApiTokenScope.Required(ApiTokenScope.READ_SCORES)
    public TemplateInstance myScores(@PathParam("roundId") long roundId) {
        return Templates.myScores(scores.page(roundId));
    }

    /** One chart of the scores page (scores, density or uncertainty) with the laboratory's own mark, as SVG. */
    @GET
    @Path("my-rounds/{roundId}/scores/{measurandId}/{chart}.svg")
    @Produces({"image/svg+xml", MediaType.TEXT_HTML}) // an HTML error page when the chart may not be shown
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    @ApiTokenScope.Required(ApiTokenScope.READ_SCORES)
    public Response myScoreChart(@PathParam("roundId") long roundId, @PathParam("measurandId") String measurandId,
                                 @PathParam("chart") String chart) {
        return Response.ok(scores.chartSvg(roundId, measurandId, chart), "image/svg+xml; charset=UTF-8")
                .header("Cache-Control", "private, max-age=300").build();
    }

    // ---- auditors ----------------------------------------------------------------------------------------

    @GET
    @Path("auditor/reports")
    @RolesAllowed(Role.AUDITOR_NAME)
    public Response auditorReports(@QueryParam("laboratory") String laboratory, @QueryParam("scheme") String scheme,
                                   @QueryParam("q") String query, @QueryParam("from") String from,
                                   @QueryParam("until") String until, @QueryParam("page") Integer page) {
        AuditorLibrary.Typed typed = new AuditorLibrary.Typed(laboratory, scheme, query, from, until);
        AuditorLibrary.Filter filter;
        try {
            filter = AuditorLibrary.Filter.of(laboratory, scheme, query, from, until);
        } catch (DomainException e) {
            // typed filters are kept; the library is shown unfiltered below the message
            AuditorLibrary.Filter empty = new AuditorLibrary.Filter(null, null, query, null, null);
            return Response.status(e.status()).entity(Templates.auditorReports(
                    library.shelf(empty, 1, display.pageSize()), typed, e.detail())).build();
        }
        return Response.ok(Templates.auditorReports(library.shelf(filter, page, display.pageSize()), typed, null)).build();
    }

    // ---- internals ---------------------------------------------------------------------------------------

    private Response secondStep(long roundId, String what, String title, String consequence, String button,
                                List<Confirmation.Field> fields) {
        return FormActions.attempt(() -> {
            lifecycle.overview(roundId);
            return confirmations.page(new Confirmation(title, consequence, "/rounds/" + roundId + "/reports/" + what,
                    fields, null, false, null, button, "/rounds/" + roundId + "/reports"), null);
        }, e -> Templates.roundReports(lifecycle.overview(roundId), e, null));
    }

    private Response coordinator(long roundId, java.util.function.Supplier<Object> action, String message) {
        return FormActions.attempt(() -> {
            action.get();
            return Templates.roundReports(lifecycle.overview(roundId), null, message);
        }, e -> Templates.roundReports(lifecycle.overview(roundId), e, null));
    }

    private static Integer number(String text) {
        if (text == null || text.isBlank()) {
            return null;
        }
        try {
            return Integer.valueOf(text.strip());
        } catch (NumberFormatException e) {
            throw new DomainException.BadRequest("The evaluation run is given by its version number.");
        }
    }
}
