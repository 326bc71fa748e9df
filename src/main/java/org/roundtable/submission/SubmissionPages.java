package org.roundtable.submission;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
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
import jakarta.ws.rs.core.MultivaluedMap;
import jakarta.ws.rs.core.Response;
import org.jboss.resteasy.reactive.RestForm;
import org.jboss.resteasy.reactive.multipart.FileUpload;
import jakarta.ws.rs.QueryParam;
import org.roundtable.account.CurrentUser;
import org.roundtable.account.LaboratoryService;
import org.roundtable.account.Role;
import org.roundtable.notice.NoticeService;
import org.roundtable.platform.Confirmation;
import org.roundtable.platform.Confirmations;
import org.roundtable.platform.DisplaySettings;
import org.roundtable.platform.Paging;
import org.roundtable.scheme.RoundState;
import org.roundtable.platform.Admission;
import org.roundtable.platform.DomainException;
import org.roundtable.scheme.RoundAccess;
import org.roundtable.submission.intake.UploadFormat;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.time.Clock;
import java.util.List;

/** Pages: a laboratory enters or uploads its results and talks to the coordinator; the coordinator follows them. */
@Path("/")
@Produces(MediaType.TEXT_HTML)
public class SubmissionPages {

    /**
     * One input row of the results form: a measurand and item, with what the laboratory entered last (kept when a
     * submit is refused, so nothing has to be typed twice).
     */
    public record FormRow(String element, String item, String unit, String otherUnit, List<String> methods, int digits,
                          String fieldKey, Entered entered) {
    }

    /** The values of one form row as entered (empty strings when nothing was entered). */
    public record Entered(String value, String unit, String uncertainty, String coverageFactor, String method,
                          String replicates) {
        static final Entered NOTHING = new Entered("", null, "", "2", null, "1");
    }

    /** Outcome shown on the page after a submit. */
    public record Outcome(SubmissionViews.Receipt receipt, String error, List<DomainException.Detail> details,
                          boolean warningsToConfirm) {
    }

    @CheckedTemplate(basePath = "submission")
    static class Templates {
        static native TemplateInstance results(SubmissionViews.MySubmission submission, List<FormRow> rows,
                                               Outcome outcome, List<SubmissionViews.Message> messages);

        static native TemplateInstance roundSubmissions(RoundAccess.SubmissionWindow round,
                                                        SubmissionViews.StatusPage participations, Paging paging,
                                                        List<SubmissionStatus> statuses, String status,
                                                        String query, String pagerQuery,
                                                        boolean deadlinePassed, boolean remindable,
                                                        List<SubmissionViews.Flag> flags,
                                                        List<SubmissionViews.Message> messages, String message,
                                                        String error, String reminderText, String reminderProblem);

        static native TemplateInstance participant(RoundAccess.SubmissionWindow round,
                                                   LaboratoryService.LaboratoryView laboratory, String participantCode,
                                                   List<SubmissionViews.Revision> revisions);
    }

    private final SubmissionService submissions;
    private final SubmissionQueries queries;
    private final SubmissionMessages messages;
    private final RoundAccess rounds;
    private final ObjectMapper mapper;
    private final HttpServerRequest request;

    private final Admission admission;
    private final NoticeService notices;
    private final LaboratoryService laboratories;
    private final CurrentUser currentUser;
    private final Confirmations confirmations;
    private final DisplaySettings display;
    private final Clock clock;

    public SubmissionPages(SubmissionService submissions, SubmissionQueries queries, SubmissionMessages messages,
                           RoundAccess rounds, ObjectMapper mapper, HttpServerRequest request, Admission admission,
                           NoticeService notices, LaboratoryService laboratories, CurrentUser currentUser,
                           Confirmations confirmations, DisplaySettings display, Clock clock) {
        this.admission = admission;
        this.notices = notices;
        this.laboratories = laboratories;
        this.currentUser = currentUser;
        this.confirmations = confirmations;
        this.display = display;
        this.clock = clock;
        this.submissions = submissions;
        this.queries = queries;
        this.messages = messages;
        this.rounds = rounds;
        this.mapper = mapper;
        this.request = request;
    }

    // ---- laboratories -----------------------------------------------------------------------------------------

    @GET
    @Path("my-rounds/{roundId}/results")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public TemplateInstance results(@PathParam("roundId") long roundId) {
        return page(roundId, null, null);
    }

    @POST
    @Path("my-rounds/{roundId}/results/form")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response submitForm(@PathParam("roundId") long roundId, MultivaluedMap<String, String> form) {
        byte[] json = formAsJson(rows(roundId, null), form);
        boolean confirm = "on".equals(form.getFirst("confirmWarnings")) || "true".equals(form.getFirst("confirmWarnings"));
        return attempt(roundId, form, () -> submissions.submit(roundId, new SubmissionService.Upload(SubmissionService.Channel.FORM,
                UploadFormat.JSON, json, null, null), confirm, null, clientAddress()));
    }

    @POST
    @Path("my-rounds/{roundId}/results/upload")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    @Consumes(MediaType.MULTIPART_FORM_DATA)
    public Response upload(@PathParam("roundId") long roundId, @RestForm("file") FileUpload file,
                           @RestForm("confirmWarnings") String confirmWarnings) {
        if (file == null || file.uploadedFile() == null) {
            return attempt(roundId, () -> {
                throw new DomainException.BadRequest("Choose a CSV or XLSX file to upload.");
            });
        }
        UploadFormat format = UploadFormat.fromFileName(file.fileName()).filter(f -> f != UploadFormat.JSON).orElse(null);
        boolean confirm = "on".equals(confirmWarnings) || "true".equals(confirmWarnings);
        return attempt(roundId, () -> {
            if (format == null) {
                throw new DomainException.BadRequest("Upload a .csv or .xlsx file.");
            }
            // the file waits on disk (multipart parts are spooled) until an upload slot is free
            try (Admission.Slot ignored = admission.uploadSlot()) {
                return submissions.submit(roundId, new SubmissionService.Upload(
                        format == UploadFormat.XLSX ? SubmissionService.Channel.XLSX : SubmissionService.Channel.CSV, format,
                        read(file), file.fileName(), file.contentType()), confirm, null, clientAddress());
            }
        });
    }

    @POST
    @Path("my-rounds/{roundId}/messages")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response postMessage(@PathParam("roundId") long roundId, @FormParam("body") String body) {
        return attempt(roundId, () -> {
            messages.postAsLaboratory(roundId, body);
            return null;
        });
    }

    // ---- coordinators ----------------------------------------------------------------------------------------

    @GET
    @Path("rounds/{roundId}/submissions")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public TemplateInstance roundSubmissions(@PathParam("roundId") long roundId, @QueryParam("status") String status,
                                             @QueryParam("q") String query, @QueryParam("page") Integer page) {
        return submissionsPage(roundId, status, query, page, null, null);
    }

    /** The coordinator's view of one laboratory's submission in a round: every revision with its values. */
    @GET
    @Path("rounds/{roundId}/submissions/{laboratoryId}")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public TemplateInstance participant(@PathParam("roundId") long roundId, @PathParam("laboratoryId") long laboratoryId) {
        String code = rounds.participantCode(roundId, laboratoryId)
                .orElseThrow(() -> new DomainException.NotFound("The laboratory's submission"));
        List<SubmissionViews.Revision> revisions = new java.util.ArrayList<>(queries.revisionsOf(roundId, laboratoryId));
        java.util.Collections.reverse(revisions);
        return Templates.participant(rounds.window(roundId), laboratories.get(laboratoryId), code, revisions);
    }

    /**
     * A reminder to the laboratories that have sent no results, through the notices (and the e-mail of those
     * members who chose it): first the confirmation naming how many it reaches, then the reminder itself.
     */
    @POST
    @Path("rounds/{roundId}/submissions/reminders")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response remindMissing(@PathParam("roundId") long roundId, @FormParam("reason") String message,
                                  @FormParam("confirmed") String confirmed) {
        boolean secondStep = Confirmation.confirmed(confirmed);
        RoundAccess.SubmissionWindow round = rounds.window(roundId);
        long missing = queries.statusPage(roundId, SubmissionStatus.MISSING, null, 0, 1).missing();
        Confirmation step = new Confirmation("Remind the " + missing + (missing == 1 ? " laboratory" : " laboratories")
                + " without results in round " + round.roundCode() + "?",
                "Every active member of " + (missing == 1 ? "the laboratory" : "these laboratories") + " gets your "
                        + "message as a notice in Roundtable, and by e-mail where they chose e-mail for reminders. "
                        + "Laboratories that have sent results get nothing.",
                "/rounds/" + roundId + "/submissions/reminders", List.of(), "Message to the laboratories", true,
                message, "Send the reminder", "/rounds/" + roundId + "/submissions");
        try {
            if (!round.openForResults() && !RoundState.DISPATCHED.name().equals(round.state())) {
                throw new DomainException.Conflict("The round does not take results now: there is nothing to remind of.");
            }
            if (missing == 0) {
                throw new DomainException.Conflict("Every laboratory has sent results: nobody to remind.");
            }
            if (message == null || message.isBlank()) {
                throw new DomainException.BadRequest("Write the reminder's message.");
            }
            if (!secondStep) {
                return Response.ok(confirmations.page(step, null)).build();
            }
            int reached = notices.remind(roundId, message, true, currentUser.actor());
            return Response.ok(submissionsPage(roundId, null, null, null, "Reminder sent to " + missing
                    + (missing == 1 ? " laboratory" : " laboratories") + " without results (" + reached
                    + (reached == 1 ? " person" : " people") + ").", null)).build();
        } catch (DomainException.NotFound | DomainException.Forbidden e) {
            throw e;
        } catch (DomainException e) {
            return Response.status(e.status()).entity(secondStep ? confirmations.page(step, e.detail())
                    : e instanceof DomainException.BadRequest
                    ? submissionsPage(roundId, null, null, null, null, null, message, e.detail())
                    : submissionsPage(roundId, null, null, null, null, e.detail())).build();
        }
    }

    @POST
    @Path("rounds/{roundId}/submissions/{laboratoryId}/messages")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public TemplateInstance reply(@PathParam("roundId") long roundId, @PathParam("laboratoryId") long laboratoryId,
                                  @FormParam("body") String body) {
        messages.replyAsCoordinator(roundId, laboratoryId, body);
        return submissionsPage(roundId, null, null, null, "Answer sent.", null);
    }

    private TemplateInstance submissionsPage(long roundId, String statusName, String query, Integer page, String message,
                                             String error) {
        return submissionsPage(roundId, statusName, query, page, message, error, null, null);
    }

    private TemplateInstance submissionsPage(long roundId, String statusName, String query, Integer page, String message,
                                             String error, String reminderText, String reminderProblem) {
        RoundAccess.SubmissionWindow round = rounds.window(roundId);
        SubmissionStatus status = null;
        if (statusName != null && !statusName.isBlank()) {
            try {
                status = SubmissionStatus.valueOf(statusName.strip().toUpperCase(java.util.Locale.ROOT));
            } catch (IllegalArgumentException e) {
                throw new DomainException.BadRequest("The status is submitted, late or missing.");
            }
        }
        String q = query == null ? "" : query.strip();
        long total = queries.statusPage(roundId, status, q, 0, 1).total();
        Paging paging = Paging.of(page, display.pageSize(), total);
        SubmissionViews.StatusPage rows = queries.statusPage(roundId, status, q, paging.offset(), paging.size());
        boolean deadlinePassed = round.resultDeadline() != null && !round.resultDeadline().toInstant().isAfter(clock.instant());
        boolean remindable = rows.missing() > 0
                && (round.openForResults() || RoundState.DISPATCHED.name().equals(round.state()));
        String pagerQuery = (status == null ? "" : "&status=" + status.name())
                + (q.isEmpty() ? "" : "&q=" + java.net.URLEncoder.encode(q, java.nio.charset.StandardCharsets.UTF_8));
        return Templates.roundSubmissions(round, rows, paging, List.of(SubmissionStatus.values()), status == null ? "" : status.name(), q, pagerQuery,
                deadlinePassed, remindable, queries.flags(roundId), messages.allOfRound(roundId), message, error,
                reminderText, reminderProblem);
    }

    // ---- helpers ------------------------------------------------------------------------------------------------

    private Response attempt(long roundId, java.util.function.Supplier<SubmissionViews.Receipt> action) {
        return attempt(roundId, null, action);
    }

    /** Runs a submit; on a refusal the page shows every problem and keeps what was entered in the form. */
    private Response attempt(long roundId, MultivaluedMap<String, String> form,
                             java.util.function.Supplier<SubmissionViews.Receipt> action) {
        try {
            SubmissionViews.Receipt receipt = action.get();
            return Response.ok(page(roundId, receipt == null ? null : new Outcome(receipt, null, List.of(), false), null)).build();
        } catch (DomainException.NotFound | DomainException.Forbidden | Admission.Unavailable e) {
            throw e; // answered by the error mapper (503 with Retry-After for Unavailable)
        } catch (DomainException e) {
            boolean warnings = !e.details().isEmpty() && e.details().stream().allMatch(d -> d.key().startsWith("warning."));
            return Response.status(e.status())
                    .entity(page(roundId, new Outcome(null, e.detail(), e.details(), warnings), form)).build();
        }
    }

    private TemplateInstance page(long roundId, Outcome outcome, MultivaluedMap<String, String> form) {
        SubmissionViews.MySubmission mine = queries.mine(roundId);
        List<FormRow> rows = mine.roundState().equals("OPEN_FOR_RESULTS") ? rows(roundId, form) : List.of();
        return Templates.results(mine, rows, outcome, messages.ownThread(roundId));
    }

    private List<FormRow> rows(long roundId, MultivaluedMap<String, String> form) {
        RoundAccess.SubmissionWindow window = rounds.window(roundId);
        return rounds.openMeasurands(roundId).stream()
                .flatMap(m -> window.itemLabels().stream().map(item -> {
                    String key = m.element() + "." + item;
                    return new FormRow(m.element(), item, m.unit(), "%".equals(m.unit()) ? "mg/kg" : "%",
                            m.methodGroups().stream().map(g -> g.toLowerCase().replace('_', '-')).toList(),
                            m.reportingDigits(), key, entered(form, key));
                }))
                .toList();
    }

    private static Entered entered(MultivaluedMap<String, String> form, String key) {
        if (form == null) {
            return Entered.NOTHING;
        }
        return new Entered(text(form.getFirst("value." + key)), form.getFirst("unit." + key),
                text(form.getFirst("u." + key)), text(form.getFirst("k." + key)), form.getFirst("method." + key),
                text(form.getFirst("replicates." + key)));
    }

    private static String text(String value) {
        return value == null ? "" : value.strip();
    }

    /** The form's fields as the JSON upload format, so that the form goes through the same validation as files. */
    byte[] formAsJson(List<FormRow> rows, MultivaluedMap<String, String> form) {
        ObjectNode root = mapper.createObjectNode();
        ArrayNode results = root.putArray("results");
        for (FormRow row : rows) {
            String value = trimmed(form.getFirst("value." + row.fieldKey()));
            if (value == null) {
                continue; // a measurand left empty is not reported
            }
            ObjectNode result = results.addObject();
            result.put("measurand", row.element());
            result.put("item", row.item());
            result.put("value", value);
            result.put("unit", orDefault(form.getFirst("unit." + row.fieldKey()), row.unit()));
            putIfPresent(result, "expandedUncertainty", form.getFirst("u." + row.fieldKey()));
            putIfPresent(result, "coverageFactor", form.getFirst("k." + row.fieldKey()));
            result.put("method", orDefault(form.getFirst("method." + row.fieldKey()), row.methods().get(0)));
            String replicates = trimmed(form.getFirst("replicates." + row.fieldKey()));
            result.put("replicates", replicates == null ? 1 : parseReplicates(replicates));
        }
        try {
            return mapper.writeValueAsBytes(root);
        } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    private static int parseReplicates(String text) {
        try {
            return Integer.parseInt(text);
        } catch (NumberFormatException e) {
            return -1; // refused by the intake with its own message
        }
    }

    private static void putIfPresent(ObjectNode node, String field, String value) {
        String clean = trimmed(value);
        if (clean != null) {
            node.put(field, clean);
        }
    }

    private static String orDefault(String value, String fallback) {
        String clean = trimmed(value);
        return clean == null ? fallback : clean;
    }

    private static String trimmed(String value) {
        return value == null || value.isBlank() ? null : value.strip();
    }

    private static byte[] read(FileUpload file) {
        try {
            return Files.readAllBytes(file.uploadedFile());
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private String clientAddress() {
        return request.remoteAddress() == null ? null : request.remoteAddress().hostAddress();
    }
}
