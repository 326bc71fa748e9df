package org.roundtable.scheme;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import io.vertx.core.http.HttpServerRequest;
import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.FormParam;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.roundtable.account.LaboratoryService;
import org.roundtable.account.Role;
import org.roundtable.platform.Confirmation;
import org.roundtable.platform.Confirmations;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Labels;
import org.roundtable.platform.FormActions;
import org.roundtable.scheme.qualification.QualificationService;

import java.time.Clock;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Optional;

/**
 * Pages for preparing rounds (coordinators: schemes, catalogue, rounds, plan, enrolment, items,
 * qualification) and for laboratories (their rounds, instructions with cautions, receipt of items). Every
 * action is a POST form with the CSRF token; the services do the checking, so a page can never do more than
 * the API.
 */
@Path("/")
@Produces(MediaType.TEXT_HTML)
public class RoundPages {

    @CheckedTemplate(basePath = "scheme")
    static class Templates {
        static native TemplateInstance schemes(List<SchemeService.SchemeView> schemes, List<String> families, String error);

        static native TemplateInstance scheme(SchemeService.SchemeView scheme, List<String> methodGroups,
                                              SchemeService.Provider provider, String error, String message);

        static native TemplateInstance rounds(List<RoundService.RoundView> rounds, List<SchemeService.SchemeView> schemes,
                                              String error, NewRound form, java.util.Map<String, String> problems);

        static native TemplateInstance round(RoundService.RoundView round,
                                             List<PlanStore.PlanVersion> versions,
                                             List<EnrolmentService.Participant> participants,
                                             org.roundtable.platform.Paging participantsPaging,
                                             List<EnrolmentService.ItemView> items,
                                             org.roundtable.platform.Paging itemsPaging,
                                             List<EnrolmentService.Notice> notices,
                                             List<QualificationService.MeasurandQualification> qualification,
                                             List<LaboratoryService.LaboratoryView> laboratories, long laboratoriesFound,
                                             String find, String findQuery, String error, String message,
                                             String link);

        static native TemplateInstance myRounds(List<EnrolmentService.MyRoundSummary> rounds);

        static native TemplateInstance myRound(EnrolmentService.MyRound round, String error, String message);
    }

    /** The scheme page's provider form when the scheme names none of its own (empty fields). */
    private static final SchemeService.Provider NO_PROVIDER = new SchemeService.Provider(null, null, null);

    private final SchemeService schemes;
    private final RoundService rounds;
    private final EnrolmentService enrolments;
    private final QualificationService qualification;
    private final LaboratoryService laboratories;
    private final HttpServerRequest request;
    private final Confirmations confirmations;
    private final RoundResults results;
    private final Clock clock;
    private final org.roundtable.platform.DisplaySettings display;
    /** Laboratories offered in the enrolment form's list at most. */
    static final int ENROL_CHOICES = 100;

    public RoundPages(SchemeService schemes, RoundService rounds, EnrolmentService enrolments,
                      QualificationService qualification, LaboratoryService laboratories,
                      HttpServerRequest request, Confirmations confirmations, RoundResults results, Clock clock,
                      org.roundtable.platform.DisplaySettings display) {
        this.display = display;
        this.confirmations = confirmations;
        this.results = results;
        this.clock = clock;
        this.schemes = schemes;
        this.rounds = rounds;
        this.enrolments = enrolments;
        this.qualification = qualification;
        this.laboratories = laboratories;
        this.request = request;
    }

    // ---- schemes ------------------------------------------------------------------------------------

    @GET
    @Path("schemes")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public TemplateInstance schemesPage() {
        return schemesPage(null);
    }

    @POST
    @Path("schemes")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response createScheme(@FormParam("name") String name, @FormParam("materialFamily") String family) {
        return FormActions.attempt(() -> {
            SchemeService.SchemeView created = schemes.create(new SchemeService.NewScheme(name, family));
            return Templates.scheme(created, names(MethodGroup.values()), NO_PROVIDER, null, "Scheme created. Add its measurands.");
        }, this::schemesPage);
    }

    @GET
    @Path("schemes/{schemeId}")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public TemplateInstance schemePage(@PathParam("schemeId") long schemeId) {
        return schemePage(schemeId, null, null);
    }

    @POST
    @Path("schemes/{schemeId}/measurands")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response putMeasurand(@PathParam("schemeId") long schemeId, @FormParam("element") String element,
                                 @FormParam("unit") String unit, @FormParam("reportingDigits") String digits,
                                 @FormParam("expectedMin") String min, @FormParam("expectedMax") String max,
                                 @FormParam("methodGroups") List<String> groups) {
        return FormActions.attempt(() -> {
            SchemeService.MeasurandView m = schemes.putMeasurand(schemeId, new SchemeService.MeasurandEntry(element, unit,
                    integer(digits, "reporting digits"), min, max, groups));
            return schemePage(schemeId, null, m.element() + " saved.");
        }, e -> schemePage(schemeId, e, null));
    }

    /** Names the provider on the scheme's reports issued from now on; a blank name returns to the installation's. */
    @POST
    @Path("schemes/{schemeId}/provider")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response setProvider(@PathParam("schemeId") long schemeId, @FormParam("providerName") String name,
                                @FormParam("providerAddress") String address,
                                @FormParam("providerAccreditation") String accreditation) {
        return FormActions.attempt(() -> {
            schemes.setProvider(schemeId, new SchemeService.Provider(name, address, accreditation));
            return schemePage(schemeId, null, "Provider saved: reports issued from now on name it.");
        }, e -> schemePage(schemeId, e, null));
    }

    private TemplateInstance schemePage(long schemeId, String error, String message) {
        return Templates.scheme(schemes.get(schemeId), names(MethodGroup.values()), schemes.providerOf(schemeId).orElse(NO_PROVIDER),
                error, message);
    }

    // ---- rounds -------------------------------------------------------------------------------------

    @GET
    @Path("rounds")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public TemplateInstance roundsPage() {
        return Templates.rounds(rounds.list(), schemes.list(), null, NewRound.EMPTY, java.util.Map.of());
    }

    /** The new-round form as typed, shown again when it is refused. */
    public record NewRound(String schemeId, String code, String itemDescription, String itemsPerLaboratory,
                           String itemLabels, String dispatchDate, String resultDeadline, String timeZone,
                           String instructions, String latePolicy, String codeScope) {
        static final NewRound EMPTY = new NewRound(null, null, null, null, null, null, null, null, null, null, null);

        /** Whether the scheme {@code id} was chosen. */
        public boolean scheme(long id) {
            return Long.toString(id).equals(schemeId == null ? null : schemeId.strip());
        }

        /** The zone chosen, or {@code fallback} before anything was posted. */
        public String zoneOr(String fallback) {
            return timeZone == null || timeZone.isBlank() ? fallback : timeZone;
        }
    }

    private static java.util.Map<String, String> problemOf(String message) {
        String field = fieldOf(message);
        return field == null ? java.util.Map.of() : java.util.Map.of(field, message);
    }

    /** The field of the new-round form a refusal concerns (by the service's words), or null for none. */
    static String fieldOf(String message) {
        if (message == null) {
            return null;
        }
        String m = message.toLowerCase(Locale.ROOT);
        if (m.contains("round code") || m.contains("with the code")) {
            return "code";
        } else if (m.contains("item description")) {
            return "itemDescription";
        } else if (m.contains("label")) {
            return "itemLabels";
        } else if (m.contains("items per laboratory") || m.contains("split-level")) {
            return "itemsPerLaboratory";
        } else if (m.contains("time zone")) {
            return "timeZone";
        } else if (m.contains("dispatch date")) {
            return "dispatchDate";
        } else if (m.contains("deadline")) {
            return "resultDeadline";
        } else if (m.contains("instructions")) {
            return "instructions";
        } else if (m.contains("scheme")) {
            return "schemeId";
        }
        return null;
    }

    @POST
    @Path("rounds")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response createRound(@FormParam("schemeId") String schemeId, @FormParam("code") String code,
                                @FormParam("itemDescription") String itemDescription,
                                @FormParam("itemsPerLaboratory") String itemsPerLaboratory,
                                @FormParam("itemLabels") String itemLabels, @FormParam("dispatchDate") String dispatchDate,
                                @FormParam("resultDeadline") String resultDeadline, @FormParam("timeZone") String timeZone,
                                @FormParam("instructions") String instructions, @FormParam("latePolicy") String latePolicy,
                                @FormParam("codeScope") String codeScope) {
        return FormActions.attempt(() -> {
            Integer items = integer(itemsPerLaboratory, "items per laboratory");
            List<String> labels = itemLabels == null || itemLabels.isBlank() ? null
                    : Arrays.stream(itemLabels.split(",")).map(String::strip).toList();
            RoundService.RoundView created = rounds.create(new RoundService.RoundDetails(
                    schemeId == null || schemeId.isBlank() ? null : (long) integer(schemeId, "scheme"), code,
                    itemDescription, items, labels, dispatchDate, resultDeadline, timeZone, instructions, latePolicy,
                    codeScope));
            return roundPage(created.id(), null, "Round created as a draft. Write its evaluation plan next.", null);
        }, e -> Templates.rounds(rounds.list(), schemes.list(), e, new NewRound(schemeId, code, itemDescription,
                itemsPerLaboratory, itemLabels, dispatchDate, resultDeadline, timeZone, instructions, latePolicy,
                codeScope), problemOf(e)));
    }

    @GET
    @Path("rounds/{roundId}")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public TemplateInstance roundDetail(@PathParam("roundId") long roundId,
                                        @jakarta.ws.rs.QueryParam("participants") Integer participantsPage,
                                        @jakarta.ws.rs.QueryParam("items") Integer itemsPage,
                                        @jakarta.ws.rs.QueryParam("find") String find) {
        return roundPage(roundId, null, null, null, participantsPage, itemsPage, find);
    }

    @POST
    @Path("rounds/{roundId}/transitions")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response transition(@PathParam("roundId") long roundId, @FormParam("action") String action,
                               @FormParam("confirmed") String confirmed, @FormParam("reason") String reason) {
        Optional<Confirmation> step = confirmationOf(roundId, action, reason);
        boolean secondStep = step.isPresent() && Confirmation.confirmed(confirmed);
        return FormActions.attempt(() -> {
            if (step.isPresent() && !secondStep) {
                return confirmations.page(step.get(), null);
            }
            RoundService.RoundView after = rounds.transition(roundId, action, reason);
            return roundPage(roundId, null, "Done: the round is now "
                    + Labels.of("RoundState", after.state()).toLowerCase(Locale.ROOT) + ".", null);
        }, e -> secondStep ? confirmations.page(step.get(), e) : roundPage(roundId, e, null, null));
    }

    /**
     * The second step of a lifecycle step that cannot be undone (freeze the plan, close before the deadline,
     * cancel), naming its consequence; empty for the others.
     */
    private Optional<Confirmation> confirmationOf(long roundId, String actionName, String reason) {
        RoundAction action;
        try {
            action = RoundAction.valueOf(actionName == null ? "" : actionName);
        } catch (IllegalArgumentException e) {
            return Optional.empty();
        }
        RoundService.RoundView round = rounds.get(roundId);
        String address = "/rounds/" + roundId + "/transitions";
        List<Confirmation.Field> fields = List.of(new Confirmation.Field("action", action.name()));
        String back = "/rounds/" + roundId;
        return switch (action) {
            case FREEZE_PLAN -> Optional.of(new Confirmation("Freeze the evaluation plan of round " + round.code() + "?",
                    "The plan becomes version 1, fixed with its SHA-256 fingerprint. It decides how the assigned values, "
                            + "σpt and the scores are found. A later change is a new version with a reason, and the "
                            + "reports name every version.", address, fields, null, false, null, "Freeze the plan", back));
            case CLOSE -> round.resultDeadline() != null && round.resultDeadline().toInstant().isAfter(clock.instant())
                    ? Optional.of(new Confirmation("Close round " + round.code() + " before its deadline?",
                    "The deadline has not passed. Once closed, laboratories that have not reported can no longer "
                            + "submit or revise results; the round moves on to evaluation.", address, fields,
                    "Reason for closing early", false, reason, "Close for results now", back))
                    : Optional.empty();
            case CANCEL -> {
                long holding = results.laboratoriesWithResults(roundId);
                String held = holding == 0 ? "No laboratory has reported results yet."
                        : holding + (holding == 1 ? " laboratory has" : " laboratories have")
                        + " reported results: they stay stored but are never evaluated or scored.";
                yield Optional.of(new Confirmation("Cancel round " + round.code() + "?",
                        "The round ends for good: no more results are taken, nothing is evaluated and no report is "
                                + "issued. " + held, address, fields, "Reason for cancelling", holding > 0,
                        reason, "Cancel the round", back));
            }
            default -> Optional.empty();
        };
    }

    @POST
    @Path("rounds/{roundId}/enrolments")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response enrol(@PathParam("roundId") long roundId, @FormParam("laboratoryId") String laboratoryId,
                          @FormParam("organisation") String organisation, @FormParam("name") String name,
                          @FormParam("country") String country, @FormParam("contactName") String contactName,
                          @FormParam("contactEmail") String contactEmail,
                          @FormParam("managerUsername") String managerUsername) {
        return FormActions.attempt(() -> {
            Long existing = laboratoryId == null || laboratoryId.isBlank() ? null : (long) integer(laboratoryId, "laboratory");
            EnrolmentService.Enrolled enrolled = enrolments.enrol(roundId, new EnrolmentService.Enrolment(existing,
                    organisation, name, country, contactName, contactEmail, managerUsername));
            String link = enrolled.passwordLinkPath() == null ? null : FormActions.baseUrl(request) + enrolled.passwordLinkPath();
            return roundPage(roundId, null, enrolled.participant().laboratoryName() + " enrolled as "
                    + enrolled.participant().participantCode() + ".", link);
        }, e -> roundPage(roundId, e, null, null));
    }

    @POST
    @Path("rounds/{roundId}/items/{itemId}/replacement")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response replace(@PathParam("roundId") long roundId, @PathParam("itemId") long itemId,
                            @FormParam("reason") String reason) {
        return FormActions.attempt(() -> {
            EnrolmentService.ItemView item = enrolments.replace(roundId, itemId, new EnrolmentService.Replacement(reason));
            return roundPage(roundId, null, "Replacement of item " + item.itemLabel() + " for " + item.participantCode()
                    + " recorded as dispatched.", null);
        }, e -> roundPage(roundId, e, null, null));
    }

    @POST
    @Path("rounds/{roundId}/items/withdrawal")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response withdraw(@PathParam("roundId") long roundId, @FormParam("itemLabel") String label,
                             @FormParam("reason") String reason, @FormParam("confirmed") String confirmed) {
        boolean secondStep = Confirmation.confirmed(confirmed);
        Confirmation step = new Confirmation("Withdraw item " + (label == null ? "" : label.strip()) + " from round "
                + rounds.get(roundId).code() + "?",
                "The item is withdrawn for every laboratory: results on it are no longer evaluated, and each "
                        + "participant gets a notice with your reason.", "/rounds/" + roundId + "/items/withdrawal",
                List.of(new Confirmation.Field("itemLabel", label == null ? "" : label)), "Reason (shown to the laboratories)",
                true, reason, "Withdraw the item", "/rounds/" + roundId);
        return FormActions.attempt(() -> {
            if (!secondStep) {
                return confirmations.page(step, null);
            }
            enrolments.withdraw(roundId, new EnrolmentService.Withdrawal(label, reason));
            return roundPage(roundId, null, "Item withdrawn; the participants have a notice.", null);
        }, e -> secondStep ? confirmations.page(step, e) : roundPage(roundId, e, null, null));
    }

    // ---- laboratories -------------------------------------------------------------------------------

    @GET
    @Path("my-rounds")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public TemplateInstance myRounds() {
        return Templates.myRounds(enrolments.myRounds());
    }

    @GET
    @Path("my-rounds/{roundId}")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public TemplateInstance myRound(@PathParam("roundId") long roundId) {
        return Templates.myRound(enrolments.myRound(roundId), null, null);
    }

    @POST
    @Path("my-rounds/{roundId}/receipts")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response acknowledge(@PathParam("roundId") long roundId, @FormParam("itemLabel") String label,
                                @FormParam("condition") String condition, @FormParam("note") String note) {
        return FormActions.attempt(() -> Templates.myRound(enrolments.acknowledgeReceipt(roundId,
                        new EnrolmentService.Receipt(label, condition, note)), null, "Receipt of item " + label + " recorded."),
                e -> Templates.myRound(enrolments.myRound(roundId), e, null));
    }

    // ---- helpers ------------------------------------------------------------------------------------

    private TemplateInstance schemesPage(String error) {
        return Templates.schemes(schemes.list(), names(MaterialFamily.values()), error);
    }

    private TemplateInstance roundPage(long roundId, String error, String message, String link) {
        return roundPage(roundId, error, message, link, null, null, null);
    }

    /**
     * The round page: participants and items a page at a time (at most the page-size budget of rows, so a round of
     * 1,000 laboratories has no 1,000-row table or 1,000 forms), the laboratories to enrol found by a search.
     */
    private TemplateInstance roundPage(long roundId, String error, String message, String link,
                                       Integer participantsPage, Integer itemsPage, String find) {
        RoundService.RoundView round = rounds.get(roundId);
        int size = display.pageSize();
        EnrolmentService.ParticipantPage participants = enrolments.participants(roundId, participantsPage, size);
        EnrolmentService.ItemPage items = enrolments.items(roundId, itemsPage, size);
        String query = find == null ? "" : find.strip();
        // the laboratories to choose from: those the search finds, or the ones created last (a new laboratory is
        // usually enrolled soon after it was made); never a select of every laboratory
        LaboratoryService.Page<LaboratoryService.LaboratoryView> found = query.isEmpty()
                ? laboratories.recent(ENROL_CHOICES) : laboratories.search(query, ENROL_CHOICES);
        List<PlanStore.PlanVersion> versions = rounds.planVersions(roundId);
        return Templates.round(round, versions, participants.participants(), participants.paging(), items.items(),
                items.paging(), enrolments.notices(roundId), qualification.status(roundId), found.items(), found.total(),
                query, query.isEmpty() ? "" : "&find=" + java.net.URLEncoder.encode(query,
                        java.nio.charset.StandardCharsets.UTF_8), error, message, link);
    }

    private static List<String> names(Enum<?>[] values) {
        return Arrays.stream(values).map(Enum::name).toList();
    }

    private static Integer integer(String value, String what) {
        if (value == null || value.isBlank()) {
            return null;
        }
        try {
            return Integer.parseInt(value.strip());
        } catch (NumberFormatException e) {
            throw new DomainException.BadRequest("The " + what + " is a whole number.");
        }
    }


}
