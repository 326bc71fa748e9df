package org.roundtable.scheme;

import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.PUT;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;
import org.roundtable.account.LaboratoryService;
import org.roundtable.account.Role;
import org.roundtable.scheme.qualification.QualificationService;

import java.util.List;

/**
 * JSON API for preparing rounds (coordinators): details, evaluation plan and its versions, lifecycle steps,
 * enrolment (one or in bulk) and the code table, items, notices, and sample qualification.
 */
@Path("/api/v1/rounds")
@Produces(MediaType.APPLICATION_JSON)
@Consumes(MediaType.APPLICATION_JSON)
@RolesAllowed(Role.COORDINATOR_NAME)
public class RoundResource {

    private final RoundService rounds;
    private final EnrolmentService enrolments;
    private final QualificationService qualification;

    public RoundResource(RoundService rounds, EnrolmentService enrolments, QualificationService qualification) {
        this.rounds = rounds;
        this.enrolments = enrolments;
        this.qualification = qualification;
    }

    /** A lifecycle step; {@code reason} is needed to cancel a round that holds results, optional otherwise. */
    public record Transition(String action, String reason) {
    }

    @GET
    public List<RoundService.RoundView> list() {
        return rounds.list();
    }

    @POST
    public RoundService.RoundView create(RoundService.RoundDetails details) {
        return rounds.create(details);
    }

    @GET
    @Path("/{roundId}")
    public RoundService.RoundView get(@PathParam("roundId") long roundId) {
        return rounds.get(roundId);
    }

    @PUT
    @Path("/{roundId}")
    public RoundService.RoundView update(@PathParam("roundId") long roundId, RoundService.RoundDetails details) {
        return rounds.update(roundId, details);
    }

    /** Saves the draft plan (draft rounds only). */
    @PUT
    @Path("/{roundId}/plan")
    public RoundService.RoundView saveDraftPlan(@PathParam("roundId") long roundId, EvaluationPlan plan) {
        return rounds.saveDraftPlan(roundId, plan);
    }

    @GET
    @Path("/{roundId}/plan/versions")
    public List<PlanStore.PlanVersion> planVersions(@PathParam("roundId") long roundId) {
        return rounds.planVersions(roundId);
    }

    /** A new version of the frozen plan, with a reason. */
    @POST
    @Path("/{roundId}/plan/versions")
    public PlanStore.PlanVersion newPlanVersion(@PathParam("roundId") long roundId, RoundService.PlanChange change) {
        return rounds.newPlanVersion(roundId, change);
    }

    /** A lifecycle step: {@code {"action": "FREEZE_PLAN"}} etc. */
    @POST
    @Path("/{roundId}/transitions")
    public RoundService.RoundView transition(@PathParam("roundId") long roundId, Transition transition) {
        return rounds.transition(roundId, transition == null ? null : transition.action(),
                transition == null ? null : transition.reason());
    }

    /** The code table: laboratories and their participant codes. */
    @GET
    @Path("/{roundId}/participants")
    public List<EnrolmentService.Participant> participants(@PathParam("roundId") long roundId) {
        return enrolments.participants(roundId);
    }

    @POST
    @Path("/{roundId}/enrolments")
    public EnrolmentService.Enrolled enrol(@PathParam("roundId") long roundId, EnrolmentService.Enrolment enrolment) {
        return enrolments.enrol(roundId, enrolment);
    }

    /** Enrols many new laboratories with their first managers; answers their codes and one-time links. */
    @POST
    @Path("/{roundId}/enrolments/bulk")
    public EnrolmentService.BulkEnrolled enrolInBulk(@PathParam("roundId") long roundId,
                                                    List<LaboratoryService.NewLaboratory> laboratories) {
        return enrolments.enrolInBulk(roundId, laboratories);
    }

    @GET
    @Path("/{roundId}/items")
    public List<EnrolmentService.ItemView> items(@PathParam("roundId") long roundId) {
        return enrolments.items(roundId);
    }

    @POST
    @Path("/{roundId}/items/{itemId}/replacement")
    public EnrolmentService.ItemView replace(@PathParam("roundId") long roundId, @PathParam("itemId") long itemId,
                                             EnrolmentService.Replacement replacement) {
        return enrolments.replace(roundId, itemId, replacement);
    }

    @POST
    @Path("/{roundId}/items/withdrawal")
    public EnrolmentService.Notice withdraw(@PathParam("roundId") long roundId, EnrolmentService.Withdrawal withdrawal) {
        return enrolments.withdraw(roundId, withdrawal);
    }

    @GET
    @Path("/{roundId}/notices")
    public List<EnrolmentService.Notice> notices(@PathParam("roundId") long roundId) {
        return enrolments.notices(roundId);
    }

    @GET
    @Path("/{roundId}/qualification")
    public List<QualificationService.MeasurandQualification> qualification(@PathParam("roundId") long roundId) {
        return qualification.status(roundId);
    }

    /** Homogeneity data: {@code {"csv": "item,replicate,measurand,value\n..."}}. */
    @POST
    @Path("/{roundId}/qualification/homogeneity")
    public List<QualificationService.MeasurandQualification> homogeneity(@PathParam("roundId") long roundId,
                                                                         QualificationService.Upload upload) {
        return qualification.uploadHomogeneity(roundId, upload);
    }

    /** Stability data: {@code {"csv": "item,measurand,value\n..."}}. */
    @POST
    @Path("/{roundId}/qualification/stability")
    public List<QualificationService.MeasurandQualification> stability(@PathParam("roundId") long roundId,
                                                                       QualificationService.Upload upload) {
        return qualification.uploadStability(roundId, upload);
    }

    @POST
    @Path("/{roundId}/qualification/decisions")
    public List<QualificationService.MeasurandQualification> decide(@PathParam("roundId") long roundId,
                                                                    QualificationService.DecisionRequest decision) {
        return qualification.decide(roundId, decision);
    }
}
