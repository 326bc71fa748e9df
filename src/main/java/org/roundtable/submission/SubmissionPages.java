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
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

/** Pages: a laboratory enters or uploads its results and talks to the coordinator; the coordinator follows them. */
@Path("/")
@Produces(MediaType.TEXT_HTML)
public class SubmissionPages {

    /**
     * One input row of the results form: a measurand and item, with what the laboratory entered last (kept when a
     * submit is refused, so nothing has to be typed twice) and the problems and warnings of its fields.
     */
    public record FormRow(String element, String item, String unit, String otherUnit, List<String> methods, int digits,
                          String fieldKey, Entered entered, Marks marks) {
    }

    /** The values of one form row as entered (empty strings when nothing was entered). */
    public record Entered(String value, String unit, String uncertainty, String coverageFactor, String method,
                          String replicates, String replicateValues) {
        static final Entered NOTHING = new Entered("", null, "", "2", null, "1", "");
    }

    /** Problems (and warnings) beside the fields of one form row, in plain words; null where there is none. */
    public record Marks(String value, String unit, String uncertainty, String coverageFactor, String method,
                        String replicates, String row, String warning) {
        static final Marks NONE = new Marks(null, null, null, null, null, null, null, null);

        boolean any() {
            return value != null || unit != null || uncertainty != null || coverageFactor != null || method != null
                    || replicates != null || row != null;
        }
    }

    /** A warning to confirm: its box's number and its words. */
    public record WarningToConfirm(int index, String message) {
    }

    /**
     * What the laboratory must agree to before anything is saved, shown before it can agree: the warnings, the
     * measurands that would no longer be reported, and the token bound to them ({@link ConfirmationTokens}).
     */
    public record ToConfirm(boolean forFile, String token, List<WarningToConfirm> warnings, List<String> dropped,
                            int replacedCount, String droppedText) {
    }

    /** Outcome shown on the page after a submit. */
    public record Outcome(SubmissionViews.Receipt receipt, String error, List<String> problems, ToConfirm confirm) {
    }

    @CheckedTemplate(basePath = "submission")
    static class Templates {
        static native TemplateInstance results(SubmissionViews.MySubmission submission, List<FormRow> rows,
                                               Outcome outcome, List<SubmissionViews.Message> messages,
                                               List<SubmissionViews.Result> shownResults);

        static native TemplateInstance roundSubmissions(RoundAccess.SubmissionWindow round,
                                                        SubmissionViews.StatusPage participations, Paging paging,
                                                        List<SubmissionStatus> statuses, String status,
                                                        String query, String pagerQuery,
                                                        boolean deadlinePassed, boolean remindable,
                                                        SubmissionViews.Latest<SubmissionViews.Flag> flags,
                                                        SubmissionViews.Latest<SubmissionViews.Message> messages,
                                                        String message,
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
    private final ConfirmationTokens tokens;
    private final NoticeService notices;
    private final LaboratoryService laboratories;
    private final CurrentUser currentUser;
    private final Confirmations confirmations;
    private final DisplaySettings display;
    private final Clock clock;

    public SubmissionPages(SubmissionService submissions, SubmissionQueries queries, SubmissionMessages messages,
                           RoundAccess rounds, ObjectMapper mapper, HttpServerRequest request, Admission admission,
                           ConfirmationTokens tokens, NoticeService notices, LaboratoryService laboratories,
                           CurrentUser currentUser, Confirmations confirmations, DisplaySettings display, Clock clock) {
        this.admission = admission;
        this.tokens = tokens;
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
        return page(roundId, null, null, Map.of());
    }

    /**
     * The form: one row per measurand and item. Warnings and measurands left out that the current revision reports
     * are shown first; they are agreed to only by ticking the boxes shown with them, which carry a token bound to
     * them and to the values ({@code confirmationToken}); a {@code confirmWarnings} box sent in advance counts for
     * nothing here.
     */
    @POST
    @Path("my-rounds/{roundId}/results/form")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response submitForm(@PathParam("roundId") long roundId, MultivaluedMap<String, String> form) {
        FormJson json = formAsJson(rows(roundId, null, Map.of()), form);
        SubmissionService.Consent consent = tokens.consent(roundId, form.getFirst("confirmationToken"),
                ticked(form.get("confirm")), "yes".equals(form.getFirst("replaceAll")));
        return attempt(roundId, form, json.keys(), false, () -> {
            try (Admission.Slot place = admission.submissionPlace()) {
                return submissions.submit(roundId,
                        new SubmissionService.Upload(SubmissionService.Channel.FORM, UploadFormat.JSON, json.json(), null, null),
                        consent, null, clientAddress());
            }
        });
    }

    /** A CSV or XLSX file; its warnings and left-out measurands are agreed to as on the form, by sending it again. */
    @POST
    @Path("my-rounds/{roundId}/results/upload")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    @Consumes(MediaType.MULTIPART_FORM_DATA)
    public Response upload(@PathParam("roundId") long roundId, @RestForm("file") FileUpload file,
                           @RestForm("confirmationToken") String token, @RestForm("confirm") List<String> confirm,
                           @RestForm("replaceAll") String replaceAll) {
        if (file == null || file.uploadedFile() == null || file.size() == 0 && (file.fileName() == null || file.fileName().isBlank())) {
            return attempt(roundId, null, null, true, () -> {
                throw new DomainException.BadRequest("Choose a CSV or XLSX file to upload.");
            });
        }
        UploadFormat format = UploadFormat.fromFileName(file.fileName()).filter(f -> f != UploadFormat.JSON).orElse(null);
        SubmissionService.Consent consent = tokens.consent(roundId, token, ticked(confirm), "yes".equals(replaceAll));
        return attempt(roundId, null, null, true, () -> {
            if (format == null) {
                throw new DomainException.BadRequest("Upload a .csv or .xlsx file.");
            }
            // a place in the submission queue; the file waits on disk (multipart parts are spooled) until an upload
            // slot is free, and is read and parsed inside it; the database work is done outside the slot
            try (Admission.Slot place = admission.submissionPlace()) {
                SubmissionService.Prepared prepared;
                try (Admission.Slot ignored = admission.uploadSlot()) {
                    prepared = submissions.prepare(roundId, new SubmissionService.Upload(
                            format == UploadFormat.XLSX ? SubmissionService.Channel.XLSX : SubmissionService.Channel.CSV,
                            format, read(file), file.fileName(), file.contentType()));
                }
                return submissions.submit(prepared, consent, null, clientAddress());
            }
        });
    }

    private static Set<String> ticked(List<String> values) {
        return values == null ? Set.of() : new HashSet<>(values);
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
        // one read of the requested page with its counts; a second only when the page asked for lies past the end
        int size = display.pageSize();
        int requested = page == null || page < 1 ? 0 : (int) Math.min(Integer.MAX_VALUE / 2, (long) (page - 1) * size);
        SubmissionViews.StatusPage rows = queries.statusPage(roundId, status, q, requested, size);
        Paging paging = Paging.of(page, size, rows.total());
        if (paging.offset() != requested) {
            rows = queries.statusPage(roundId, status, q, paging.offset(), size);
        }
        boolean deadlinePassed = round.resultDeadline() != null && !round.resultDeadline().toInstant().isAfter(clock.instant());
        boolean remindable = rows.missing() > 0
                && (round.openForResults() || RoundState.DISPATCHED.name().equals(round.state()));
        String pagerQuery = (status == null ? "" : "&status=" + status.name())
                + (q.isEmpty() ? "" : "&q=" + java.net.URLEncoder.encode(q, java.nio.charset.StandardCharsets.UTF_8));
        return Templates.roundSubmissions(round, rows, paging, List.of(SubmissionStatus.values()), status == null ? "" : status.name(), q, pagerQuery,
                deadlinePassed, remindable, queries.latestFlags(roundId, size),
                messages.latestOfRound(roundId, size), message, error,
                reminderText, reminderProblem);
    }

    // ---- helpers ------------------------------------------------------------------------------------------------

    private Response attempt(long roundId, java.util.function.Supplier<SubmissionViews.Receipt> action) {
        return attempt(roundId, null, null, false, action);
    }

    /**
     * Runs a submit; on a refusal the page shows every problem in plain words — beside its field on the form — and
     * keeps what was entered. Warnings and left-out measurands come back with the boxes and token to agree to them.
     *
     * @param formKeys the form row (field key) of each result sent, in order; null for a file
     */
    private Response attempt(long roundId, MultivaluedMap<String, String> form, List<String> formKeys, boolean file,
                             java.util.function.Supplier<SubmissionViews.Receipt> action) {
        try {
            SubmissionViews.Receipt receipt = action.get();
            return Response.ok(page(roundId, receipt == null ? null : new Outcome(receipt, null, List.of(), null), null,
                    Map.of())).build();
        } catch (DomainException.NotFound | DomainException.Forbidden | Admission.Unavailable e) {
            throw e; // answered by the error mapper (503 with Retry-After for Unavailable)
        } catch (SubmissionService.NeedsConfirmation e) {
            SubmissionService.Shown shown = e.shown();
            List<WarningToConfirm> warnings = new ArrayList<>();
            for (int i = 0; i < shown.warnings().size(); i++) {
                warnings.add(new WarningToConfirm(i, shown.warnings().get(i).message()));
            }
            String droppedText = shown.dropped().isEmpty() ? null : "This replaces your " + shown.replacedCount()
                    + (shown.replacedCount() == 1 ? " result" : " results") + "; " + String.join(", ", shown.dropped())
                    + " would no longer be reported.";
            ToConfirm confirm = new ToConfirm(file, tokens.issue(roundId, shown), warnings, shown.dropped(),
                    shown.replacedCount(), droppedText);
            Map<String, Marks> marks = new HashMap<>();
            if (formKeys != null) {
                for (SubmissionViews.Warning w : shown.warnings()) {
                    if (w.row() > 0 && w.row() <= formKeys.size()) {
                        String key = formKeys.get(w.row() - 1);
                        Marks m = marks.getOrDefault(key, Marks.NONE);
                        marks.put(key, new Marks(m.value(), m.unit(), m.uncertainty(), m.coverageFactor(), m.method(),
                                m.replicates(), m.row(), m.warning() == null ? w.message() : m.warning() + " " + w.message()));
                    }
                }
            }
            String summary = !shown.dropped().isEmpty() ? "Please check and confirm. Nothing was saved yet."
                    : "Please check " + (shown.warnings().size() == 1 ? "this value" : "these values")
                    + " and confirm. Nothing was saved yet.";
            return Response.status(e.status()).entity(page(roundId, new Outcome(null, summary, List.of(), confirm), form,
                    marks)).build();
        } catch (DomainException e) {
            Map<String, Marks> marks = new HashMap<>();
            List<String> problems = new ArrayList<>();
            for (DomainException.Detail d : e.details()) {
                if (formKeys != null && d.row() != null && d.row() > 0 && d.row() <= formKeys.size()) {
                    String key = formKeys.get(d.row() - 1);
                    marks.put(key, mark(marks.getOrDefault(key, Marks.NONE), d.column(), d.message()));
                } else if (file && d.row() != null && d.row() > 0) {
                    problems.add("Line " + d.row() + " of the file" + (d.column() == null ? "" : ", " + d.column())
                            + ": " + d.message());
                } else {
                    problems.add(d.message());
                }
            }
            String summary;
            if (e.details().isEmpty()) {
                summary = e.detail();
            } else if (formKeys != null) {
                int count = e.details().size();
                List<String> where = marks.keySet().stream().sorted(Comparator.comparingInt(formKeys::indexOf))
                        .map(k -> k.endsWith(".A") && formKeys.stream().noneMatch(o -> !o.endsWith(".A"))
                                ? k.substring(0, k.length() - 2) : k.replace(".", ", item "))
                        .toList();
                summary = (count == 1 ? "One value needs" : count + " values need") + " correcting"
                        + (where.isEmpty() ? "" : " (" + String.join("; ", where) + ")") + ". Nothing was saved.";
            } else {
                int count = e.details().size();
                summary = "The file was not accepted: " + (count == 1 ? "one problem" : count + " problems")
                        + ". Nothing was saved.";
            }
            return Response.status(e.status()).entity(page(roundId, new Outcome(null, summary, problems, null), form,
                    marks)).build();
        }
    }

    /** Adds a problem to the field of a form row that {@code column} (the JSON field of the result) names. */
    private static Marks mark(Marks m, String column, String message) {
        String field = column == null ? "" : column;
        return switch (field) {
            case "value" -> new Marks(join(m.value(), message), m.unit(), m.uncertainty(), m.coverageFactor(), m.method(), m.replicates(), m.row(), m.warning());
            case "unit" -> new Marks(m.value(), join(m.unit(), message), m.uncertainty(), m.coverageFactor(), m.method(), m.replicates(), m.row(), m.warning());
            case "expandedUncertainty" -> new Marks(m.value(), m.unit(), join(m.uncertainty(), message), m.coverageFactor(), m.method(), m.replicates(), m.row(), m.warning());
            case "coverageFactor" -> new Marks(m.value(), m.unit(), m.uncertainty(), join(m.coverageFactor(), message), m.method(), m.replicates(), m.row(), m.warning());
            case "method" -> new Marks(m.value(), m.unit(), m.uncertainty(), m.coverageFactor(), join(m.method(), message), m.replicates(), m.row(), m.warning());
            case "replicates", "replicateValues" -> new Marks(m.value(), m.unit(), m.uncertainty(), m.coverageFactor(), m.method(), join(m.replicates(), message), m.row(), m.warning());
            default -> new Marks(m.value(), m.unit(), m.uncertainty(), m.coverageFactor(), m.method(), m.replicates(), join(m.row(), message), m.warning());
        };
    }

    private static String join(String earlier, String message) {
        return earlier == null ? message : earlier + " " + message;
    }

    private TemplateInstance page(long roundId, Outcome outcome, MultivaluedMap<String, String> form,
                                  Map<String, Marks> marks) {
        SubmissionViews.MySubmission mine = queries.mine(roundId);
        List<FormRow> rows = mine.roundState().equals("OPEN_FOR_RESULTS") ? rows(roundId, form, marks, mine.current()) : List.of();
        List<SubmissionViews.Result> shown = mine.current() == null ? List.of() : inSchemeOrder(roundId, mine.current().results());
        return Templates.results(mine, rows, outcome, messages.ownThread(roundId), shown);
    }

    /** Results in the order the scheme lists its measurands, then by item. */
    private List<SubmissionViews.Result> inSchemeOrder(long roundId, List<SubmissionViews.Result> results) {
        List<String> order = rounds.measurandOrder(roundId);
        return results.stream().sorted(Comparator.<SubmissionViews.Result>comparingInt(r -> order.contains(r.measurand())
                        ? order.indexOf(r.measurand()) : order.size())
                .thenComparing(SubmissionViews.Result::measurand).thenComparing(r -> r.item() == null ? "" : r.item()))
                .toList();
    }

    private List<FormRow> rows(long roundId, MultivaluedMap<String, String> form, Map<String, Marks> marks) {
        return rows(roundId, form, marks, null);
    }

    /**
     * The form's rows: what was just typed when a submit was refused, else the current revision's values (so that
     * correcting one value sends the others again instead of leaving them out), else nothing.
     */
    private List<FormRow> rows(long roundId, MultivaluedMap<String, String> form, Map<String, Marks> marks,
                               SubmissionViews.Revision current) {
        Map<String, Entered> reported = new HashMap<>();
        if (form == null && current != null) {
            for (SubmissionViews.Result r : current.results()) {
                reported.put(r.measurand() + "." + r.item(), new Entered(r.valueAsReported(), r.unitAsReported(),
                        r.expandedUncertaintyAsReported() == null ? "" : r.expandedUncertaintyAsReported(),
                        r.coverageFactor() == null ? "2" : r.coverageFactor().stripTrailingZeros().toPlainString(),
                        r.method(), r.replicates() == null ? "1" : String.valueOf(r.replicates()),
                        r.replicateValues() == null ? "" : r.replicateValues()));
            }
        }
        RoundAccess.SubmissionWindow window = rounds.window(roundId);
        return rounds.openMeasurands(roundId).stream()
                .flatMap(m -> window.itemLabels().stream().map(item -> {
                    String key = m.element() + "." + item;
                    return new FormRow(m.element(), item, m.unit(), "%".equals(m.unit()) ? "mg/kg" : "%",
                            m.methodGroups().stream().map(g -> g.toLowerCase().replace('_', '-')).toList(),
                            m.reportingDigits(), key, reported.getOrDefault(key, entered(form, key)),
                            marks.getOrDefault(key, Marks.NONE));
                }))
                .toList();
    }

    private static Entered entered(MultivaluedMap<String, String> form, String key) {
        if (form == null) {
            return Entered.NOTHING;
        }
        return new Entered(text(form.getFirst("value." + key)), form.getFirst("unit." + key),
                text(form.getFirst("u." + key)), text(form.getFirst("k." + key)), form.getFirst("method." + key),
                text(form.getFirst("replicates." + key)), text(form.getFirst("replicateValues." + key)));
    }

    private static String text(String value) {
        return value == null ? "" : value.strip();
    }

    /** The form as the JSON upload format, and the form row (field key) of each result in it, in order. */
    record FormJson(byte[] json, List<String> keys) {
    }

    /** The form's fields as the JSON upload format, so that the form goes through the same validation as files. */
    FormJson formAsJson(List<FormRow> rows, MultivaluedMap<String, String> form) {
        ObjectNode root = mapper.createObjectNode();
        List<String> keys = new ArrayList<>();
        ArrayNode results = root.putArray("results");
        for (FormRow row : rows) {
            String value = trimmed(form.getFirst("value." + row.fieldKey()));
            if (value == null) {
                continue; // a measurand left empty is not reported
            }
            keys.add(row.fieldKey());
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
            // replicate values come from a file revision shown in the form; they are sent again unchanged
            String replicateValues = trimmed(form.getFirst("replicateValues." + row.fieldKey()));
            if (replicateValues != null) {
                ArrayNode values = result.putArray("replicateValues");
                for (String v : replicateValues.split("\\|", -1)) {
                    values.add(v.strip());
                }
            }
        }
        try {
            return new FormJson(mapper.writeValueAsBytes(root), keys);
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
