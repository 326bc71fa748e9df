package org.roundtable.precision;

import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.PUT;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import java.util.List;
import org.roundtable.account.CurrentUser;
import org.roundtable.account.Role;
import org.roundtable.platform.DomainException;
import org.roundtable.scheme.PrecisionPlan;
import org.roundtable.scheme.RoundService;
import org.roundtable.submission.SubmissionQueries;

/**
 * JSON API of precision experiments. Coordinators: create one with its plan, change the draft plan, read the data by
 * participant code, record and withdraw exclusion decisions, evaluate, issue the draft report, open the comment
 * period, issue the final report. Laboratories: their own replicates and, once issued, the report. The round's
 * lifecycle, enrolment and submissions use the shared round and submission endpoints.
 */
@Path("/api/v1/precision-experiments")
@Produces(MediaType.APPLICATION_JSON)
public class PrecisionResource {

    private final PrecisionExperimentService studies;
    private final PrecisionReportService reports;
    private final SubmissionQueries submissions;
    private final CurrentUser currentUser;

    public PrecisionResource(PrecisionExperimentService studies, PrecisionReportService reports,
                             SubmissionQueries submissions, CurrentUser currentUser) {
        this.studies = studies;
        this.reports = reports;
        this.submissions = submissions;
        this.currentUser = currentUser;
    }

    @POST
        @Consumes(MediaType.APPLICATION_JSON)
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response create(PrecisionExperimentService.CreateRequest request) {
        return Response.status(201).entity(studies.create(request)).build();
    }

    @GET
        @RolesAllowed(Role.COORDINATOR_NAME)
    public List<PrecisionExperimentService.StudyView> list() {
        return studies.list();
    }

    @GET
    @Path("{studyId}")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public PrecisionExperimentService.StudyView get(@PathParam("studyId") long studyId) {
        return studies.view(studyId);
    }

    @PUT
    @Path("{studyId}/plan")
    @Consumes(MediaType.APPLICATION_JSON)
    @RolesAllowed(Role.COORDINATOR_NAME)
    public RoundService.RoundView savePlan(@PathParam("studyId") long studyId, PrecisionPlan plan) {
        return studies.savePlan(studyId, plan);
    }

    @GET
    @Path("{studyId}/data")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public List<PrecisionExperimentService.DataRow> data(@PathParam("studyId") long studyId) {
        return studies.data(studyId);
    }

    @GET
    @Path("{studyId}/exclusions")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public List<PrecisionExperimentService.Exclusion> exclusions(@PathParam("studyId") long studyId) {
        return studies.exclusions(studyId);
    }

    @POST
    @Path("{studyId}/exclusions")
    @Consumes(MediaType.APPLICATION_JSON)
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response exclude(@PathParam("studyId") long studyId, PrecisionExperimentService.ExclusionRequest request) {
        return Response.status(201).entity(studies.exclude(studyId, request, currentUser.actor())).build();
    }

    @POST
    @Path("{studyId}/exclusions/{exclusionId}/withdrawal")
    @Consumes(MediaType.APPLICATION_JSON)
    @RolesAllowed(Role.COORDINATOR_NAME)
    public PrecisionExperimentService.Exclusion withdraw(@PathParam("studyId") long studyId,
                                                         @PathParam("exclusionId") long exclusionId,
                                                         PrecisionExperimentService.WithdrawalRequest request) {
        return studies.withdraw(studyId, exclusionId, request, currentUser.actor());
    }

    @POST
    @Path("{studyId}/evaluations")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response evaluate(@PathParam("studyId") long studyId) {
        return Response.status(201).entity(studies.evaluate(studyId, currentUser.actor())).build();
    }

    @GET
    @Path("{studyId}/evaluations/latest")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public PrecisionExperimentService.Run latest(@PathParam("studyId") long studyId) {
        studies.study(studyId);
        return studies.latestRun(studyId).orElseThrow(() -> new DomainException.NotFound("An evaluation run"));
    }

    @POST
    @Path("{studyId}/report/draft")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response issueDraft(@PathParam("studyId") long studyId) {
        return Response.status(201).entity(reports.issueDraft(studyId, currentUser.actor())).build();
    }

    @POST
    @Path("{studyId}/report/comment-period")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response openCommentPeriod(@PathParam("studyId") long studyId) {
        reports.openCommentPeriod(studyId, currentUser.actor());
        return Response.noContent().build();
    }

    @POST
    @Path("{studyId}/report/final")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response issueFinal(@PathParam("studyId") long studyId) {
        return Response.status(201).entity(reports.issueFinal(studyId, currentUser.actor())).build();
    }

    /** The latest issued report as PDF: coordinators, and laboratories enrolled in the study. */
    @GET
    @Path("{studyId}/report.pdf")
    @Produces("application/pdf")
    @RolesAllowed({Role.COORDINATOR_NAME, Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public Response reportPdf(@PathParam("studyId") long studyId) {
        return Response.ok(reports.latestPdf(studyId)).header("Content-Disposition",
                "attachment; filename=\"precision-report.pdf\"").build();
    }

    /**
     * A published study's s_R and s_r for a proficiency round's σpt method "precision data": at a level
     * ({@code ?measurand=C&level=2}) or from the fitted relationships ({@code ?measurand=C&m=0.45}).
     */
    @GET
    @Path("{studyId}/precision-data")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public PrecisionExperimentService.PrecisionData precisionData(@PathParam("studyId") long studyId,
                                                                  @jakarta.ws.rs.QueryParam("measurand") String measurand,
                                                                  @jakarta.ws.rs.QueryParam("level") String level,
                                                                  @jakarta.ws.rs.QueryParam("m") String m) {
        return studies.precisionData(studyId, measurand, level, m);
    }

    /** A laboratory's own replicates in its current revision. */
    @GET
    @Path("{studyId}/my-results")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public List<SubmissionQueries.ReplicateRow> mine(@PathParam("studyId") long studyId) {
        studies.requireEnrolled(studyId);
        return submissions.myReplicates(studyId);
    }
}
