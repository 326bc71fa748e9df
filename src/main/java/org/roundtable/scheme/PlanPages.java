package org.roundtable.scheme;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
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
import jakarta.ws.rs.core.MultivaluedMap;
import jakarta.ws.rs.core.Response;
import org.roundtable.account.LaboratoryService;
import org.roundtable.account.Role;
import org.roundtable.platform.DomainException;

import java.util.List;
import java.util.Optional;

/**
 * The evaluation plan of a round as a form (one row per measurand, labelled choices with a line of help each), with
 * "copy the plan of an earlier round" and, for advanced users, the plan as JSON. Both ways of saving go through
 * {@link RoundService#saveDraftPlan} or {@link RoundService#newPlanVersion}, so the form can do exactly what the
 * JSON can. A refused save shows the page again with everything typed and the problem beside its field.
 */
@Path("/")
@Produces(MediaType.TEXT_HTML)
public class PlanPages {

    @CheckedTemplate(basePath = "scheme")
    static class Templates {
        static native TemplateInstance plan(RoundService.RoundView round, boolean editable, PlanForm form,
                                            List<RoundSummaries.PlanSource> sources, Long copiedFrom,
                                            List<LaboratoryService.LaboratoryView> laboratories,
                                            long laboratoriesFound, String expertFind, String reason,
                                            String planJson, String jsonError, String message);
    }

    /** Laboratories offered in each row's expert list besides the chosen ones, at most. */
    static final int EXPERT_CHOICES = 20;

    private final RoundService rounds;
    private final RoundSummaries summaries;
    private final SchemeService schemes;
    private final LaboratoryService laboratories;
    private final ObjectMapper mapper;

    public PlanPages(RoundService rounds, RoundSummaries summaries, SchemeService schemes,
                     LaboratoryService laboratories, ObjectMapper mapper) {
        this.rounds = rounds;
        this.summaries = summaries;
        this.schemes = schemes;
        this.laboratories = laboratories;
        this.mapper = mapper;
    }

    /** The plan form, filled from the round's plan, or from the plan of round {@code from} of the same scheme. */
    @GET
    @Path("rounds/{roundId}/plan")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public TemplateInstance planPage(@PathParam("roundId") long roundId, @QueryParam("from") Long from,
                                     @QueryParam("experts") String expertFind) {
        RoundService.RoundView round = proficiencyRound(roundId);
        String find = expertFind == null ? "" : expertFind.strip();
        List<Measurand> catalogue = schemes.catalogue(round.schemeId());
        if (from != null) {
            if (summaries.planSources(roundId).stream().noneMatch(s -> s.roundId() == from)) {
                throw new DomainException.NotFound("The round to copy from");
            }
            EvaluationPlan source = planOf(rounds.get(from)).orElseThrow(() -> new DomainException.NotFound("The plan"));
            List<String> dropped = PlanForm.dropped(catalogue, source);
            String message = "The plan of round " + rounds.get(from).code() + " is copied into the form below. "
                    + "Nothing is saved until you save the plan."
                    + (dropped.isEmpty() ? "" : " Left out (not in this scheme's catalogue): " + String.join(", ", dropped) + ".");
            return page(round, PlanForm.of(catalogue, source), from, null, null, null, message, find);
        }
        return page(round, PlanForm.of(catalogue, planOf(round).orElse(null)), null, null, null, null, null, find);
    }

    /** Saves the plan from the form: the draft, or — once frozen — a new version with the reason given. */
    @POST
    @Path("rounds/{roundId}/plan/form")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response saveForm(@PathParam("roundId") long roundId, MultivaluedMap<String, String> posted) {
        RoundService.RoundView round = proficiencyRound(roundId);
        List<Measurand> catalogue = schemes.catalogue(round.schemeId());
        PlanForm form = PlanForm.posted(catalogue, posted);
        String reason = posted.getFirst("reason");
        try {
            String message = save(roundId, form.plan(), reason);
            RoundService.RoundView after = rounds.get(roundId);
            return Response.ok(page(after, PlanForm.of(catalogue, planOf(after).orElse(null)), null, null, null, null,
                    message)).build();
        } catch (DomainException.NotFound | DomainException.Forbidden e) {
            throw e;
        } catch (DomainException e) {
            return Response.status(e.status()).entity(page(rounds.get(roundId), form.problems(e), null, reason, null,
                    null, null)).build();
        }
    }

    /** Saves the plan sent as JSON (advanced users): the draft, or a new version with the reason given. */
    @POST
    @Path("rounds/{roundId}/plan")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response savePlan(@PathParam("roundId") long roundId, @FormParam("plan") String planText,
                             @FormParam("reason") String reason) {
        RoundService.RoundView round = proficiencyRound(roundId);
        List<Measurand> catalogue = schemes.catalogue(round.schemeId());
        try {
            String message = save(roundId, parsePlan(planText), reason);
            RoundService.RoundView after = rounds.get(roundId);
            return Response.ok(page(after, PlanForm.of(catalogue, planOf(after).orElse(null)), null, null, null, null,
                    message)).build();
        } catch (DomainException.NotFound | DomainException.Forbidden e) {
            throw e;
        } catch (DomainException e) {
            RoundService.RoundView now = rounds.get(roundId);
            return Response.status(e.status()).entity(page(now, PlanForm.of(catalogue, planOf(now).orElse(null)), null,
                    reason, planText == null ? "" : planText, e.detail(), null)).build();
        }
    }

    private String save(long roundId, EvaluationPlan plan, String reason) {
        if (RoundState.valueOf(rounds.get(roundId).state()) == RoundState.DRAFT) {
            rounds.saveDraftPlan(roundId, plan);
            return "Draft plan saved.";
        }
        PlanStore.PlanVersion v = rounds.newPlanVersion(roundId, new RoundService.PlanChange(plan, reason));
        return "Plan version " + v.version() + " stored.";
    }

    private TemplateInstance page(RoundService.RoundView round, PlanForm form, Long copiedFrom, String reason,
                                  String planJson, String jsonError, String message) {
        return page(round, form, copiedFrom, reason, planJson, jsonError, message, "");
    }

    /**
     * The plan page. Each row's expert list offers the laboratories chosen in any row, then those the expert search
     * {@code find} finds, or without one the ones created last — at most {@link #EXPERT_CHOICES} besides the chosen
     * ones, so the page does not grow with the laboratories known.
     */
    private TemplateInstance page(RoundService.RoundView round, PlanForm form, Long copiedFrom, String reason,
                                  String planJson, String jsonError, String message, String find) {
        RoundState state = RoundState.valueOf(round.state());
        boolean editable = RoundStateMachine.allows(state, RoundAction.EDIT_DRAFT_PLAN)
                || RoundStateMachine.allows(state, RoundAction.NEW_PLAN_VERSION);
        String json = planJson != null ? planJson : exportJson(round);
        LaboratoryService.Page<LaboratoryService.LaboratoryView> found = find.isEmpty()
                ? laboratories.recent(EXPERT_CHOICES) : laboratories.search(find, EXPERT_CHOICES);
        java.util.Map<Long, LaboratoryService.LaboratoryView> chosen = laboratories.byIds(form.chosenExperts());
        List<LaboratoryService.LaboratoryView> choices = new java.util.ArrayList<>(chosen.values());
        java.util.Comparator<String> words = java.util.Comparator.nullsFirst(String.CASE_INSENSITIVE_ORDER);
        choices.sort(java.util.Comparator.comparing(LaboratoryService.LaboratoryView::organisation, words)
                .thenComparing(LaboratoryService.LaboratoryView::name, words));
        found.items().stream().filter(l -> !chosen.containsKey(l.id())).forEach(choices::add);
        return Templates.plan(round, editable, form, editable ? summaries.planSources(round.id()) : List.of(), copiedFrom,
                choices, found.total(), find, reason, json, jsonError, message);
    }

    private RoundService.RoundView proficiencyRound(long roundId) {
        if (summaries.of(List.of(roundId)).stream().noneMatch(s -> s.kind() == RoundKind.PROFICIENCY_TEST)) {
            throw new DomainException.NotFound("The round");
        }
        return rounds.get(roundId);
    }

    /** The round's draft plan, else its latest frozen version. */
    private Optional<EvaluationPlan> planOf(RoundService.RoundView round) {
        if (round.draftPlan() != null) {
            return Optional.of(PlanDocument.read(round.draftPlan(), mapper));
        }
        List<PlanStore.PlanVersion> versions = rounds.planVersions(round.id());
        return versions.isEmpty() ? Optional.empty()
                : Optional.of(PlanDocument.read(versions.get(versions.size() - 1).canonicalJson(), mapper));
    }

    private String exportJson(RoundService.RoundView round) {
        String json = round.draftPlan();
        if (json == null) {
            List<PlanStore.PlanVersion> versions = rounds.planVersions(round.id());
            json = versions.isEmpty() ? null : versions.get(versions.size() - 1).canonicalJson();
        }
        if (json == null) {
            return "";
        }
        try {
            return mapper.writerWithDefaultPrettyPrinter().writeValueAsString(mapper.readTree(json));
        } catch (JsonProcessingException e) {
            return json;
        }
    }

    private EvaluationPlan parsePlan(String text) {
        if (text == null || text.isBlank()) {
            throw new DomainException.BadRequest("The plan is empty.");
        }
        try {
            return mapper.readValue(text, EvaluationPlan.class);
        } catch (JsonProcessingException e) {
            throw new DomainException.BadRequest("The plan is not valid JSON (line " + e.getLocation().getLineNr()
                    + ", column " + e.getLocation().getColumnNr() + ").");
        }
    }
}
