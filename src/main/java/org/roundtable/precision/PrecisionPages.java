package org.roundtable.precision;

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
import jakarta.ws.rs.core.Context;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.MultivaluedMap;
import jakarta.ws.rs.core.Response;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import org.jboss.resteasy.reactive.RestForm;
import org.jboss.resteasy.reactive.multipart.FileUpload;
import org.roundtable.account.CurrentUser;
import org.roundtable.account.Role;
import org.roundtable.platform.Confirmation;
import org.roundtable.platform.Confirmations;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.FormActions;
import org.roundtable.platform.NumberFormats;
import org.roundtable.scheme.RoundAccess;
import org.roundtable.submission.SubmissionQueries;
import org.roundtable.submission.SubmissionService;
import org.roundtable.submission.intake.UploadFormat;

/**
 * Pages of precision experiments. Coordinators: the list, a study's overview with the latest evaluation (cells, h
 * and k, tests, flags), the exclusion decisions and the report steps, each irreversible step behind a confirmation.
 * Laboratories: their own replicates, upload or entry of results, and the report once issued. Numbers through
 * {@link NumberFormats}; labels in the trade's words.
 */
@Path("/")
@Produces(MediaType.TEXT_HTML)
public class PrecisionPages {

    @CheckedTemplate(basePath = "precision")
    static class Templates {
        static native TemplateInstance list(List<PrecisionExperimentService.StudyView> studies);

        static native TemplateInstance study(StudyPage page, String error, String message);

        static native TemplateInstance mine(MinePage page, String error, String message);

        static native TemplateInstance report(String reportHtmlBody, long roundId, String reportId, String status);
    }

    /** A level of the latest run, ready to print. */
    public record LevelRow(String measurand, String level, String material, int laboratories, int retained,
                           String mean, String sr, String sL, String sR, String r, String bigR, String hLines,
                           String kLines, List<CellRow> cells, List<TestRow> tests, List<String> warnings) {
    }

    /** A cell, ready to print. */
    public record CellRow(String code, String values, String mean, String sd, String h, String k, String indication,
                          boolean flagged, boolean excluded, String decision) {
    }

    /** A test, ready to print. */
    public record TestRow(String test, String laboratories, String statistic, String straggler, String outlier,
                          String outcome, boolean flagged) {
    }

    /** The coordinator's study page. */
    public record StudyPage(PrecisionExperimentService.StudyView study, String stateLabel, List<String> levelText,
                            Integer runNumber, boolean runCurrent, List<LevelRow> levels,
                            List<PrecisionExperimentService.Exclusion> exclusions, List<String> codes,
                            boolean decisionsOpen, boolean canEvaluate, boolean canIssueDraft, boolean canOpenComments,
                            boolean canIssueFinal, PrecisionReportService.Issued report) {
    }

    /** A laboratory's page. */
    public record MinePage(long roundId, String roundCode, String participantCode, String stateLabel, boolean open,
                           List<String> levels, List<String> measurands, int replicates,
                           List<SubmissionQueries.ReplicateRow> mine, boolean reportIssued, String receipt) {
    }

    private final PrecisionExperimentService studies;
    private final PrecisionReportService reports;
    private final RoundAccess rounds;
    private final SubmissionService submissions;
    private final SubmissionQueries queries;
    private final CurrentUser currentUser;
    private final Confirmations confirmations;

    @Context
    HttpServerRequest request;

    public PrecisionPages(PrecisionExperimentService studies, PrecisionReportService reports, RoundAccess rounds,
                          SubmissionService submissions, SubmissionQueries queries, CurrentUser currentUser,
                          Confirmations confirmations) {
        this.studies = studies;
        this.reports = reports;
        this.rounds = rounds;
        this.submissions = submissions;
        this.queries = queries;
        this.currentUser = currentUser;
        this.confirmations = confirmations;
    }

    // ---- coordinators -------------------------------------------------------------------------------------

    @GET
    @Path("precision-experiments")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public TemplateInstance list() {
        return Templates.list(studies.list());
    }

    @GET
    @Path("precision-experiments/{studyId}")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public TemplateInstance study(@PathParam("studyId") long studyId) {
        return Templates.study(page(studyId), null, null);
    }

    @POST
    @Path("precision-experiments/{studyId}/evaluations")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response evaluate(@PathParam("studyId") long studyId) {
        return act(studyId, () -> "Evaluation run " + studies.evaluate(studyId, currentUser.actor()).runNumber() + " is stored.");
    }

    @POST
    @Path("precision-experiments/{studyId}/exclusions")
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response exclude(@PathParam("studyId") long studyId, @FormParam("participantCode") String code,
                            @FormParam("cell") String cell, @FormParam("reason") String reason) {
        return act(studyId, () -> {
            String[] mv = cell == null ? new String[0] : cell.split("\\|", 2);
            if (mv.length != 2) {
                throw new DomainException.BadRequest("Choose the measurand and level.");
            }
            PrecisionExperimentService.Exclusion e = studies.exclude(studyId,
                    new PrecisionExperimentService.ExclusionRequest(code, mv[0], mv[1], reason), currentUser.actor());
            return "The cell of " + e.participantCode() + " for " + e.measurand() + " at level " + e.level()
                    + " is excluded. Evaluate again to apply the decision.";
        });
    }

    @POST
    @Path("precision-experiments/{studyId}/exclusions/{exclusionId}/withdrawal")
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response withdraw(@PathParam("studyId") long studyId, @PathParam("exclusionId") long exclusionId,
                             @FormParam("reason") String reason) {
        return act(studyId, () -> {
            PrecisionExperimentService.Exclusion e = studies.withdraw(studyId, exclusionId,
                    new PrecisionExperimentService.WithdrawalRequest(reason), currentUser.actor());
            return "The exclusion of " + e.participantCode() + " for " + e.measurand() + " at level " + e.level()
                    + " is withdrawn. Evaluate again to apply it.";
        });
    }

    @POST
    @Path("precision-experiments/{studyId}/report/{step}")
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response reportStep(@PathParam("studyId") long studyId, @PathParam("step") String step,
                               @FormParam("confirmed") String confirmed) {
        if (!Confirmation.confirmed(confirmed)) {
            // the second step names the consequence; only its button (confirmed=yes) takes the step
            return FormActions.attempt(() -> confirmations.page(confirmationOf(studyId, step), null),
                    error -> Templates.study(page(studyId), error, null));
        }
        return act(studyId, () -> {
            return switch (step) {
                case "draft" -> "Draft report " + reports.issueDraft(studyId, currentUser.actor()).reportId() + " is issued.";
                case "comment-period" -> {
                    reports.openCommentPeriod(studyId, currentUser.actor());
                    yield "The comment period on the draft report is open.";
                }
                case "final" -> "Final report " + reports.issueFinal(studyId, currentUser.actor()).reportId() + " is issued.";
                default -> throw new DomainException.NotFound("The report step");
            };
        });
    }

    /** The second step of a report step of the study, naming what follows; an unknown step is "not found". */
    private Confirmation confirmationOf(long studyId, String step) {
        PrecisionExperimentService.StudyView study = studies.view(studyId);
        String name = study.roundCode();
        String action = "/precision-experiments/" + studyId + "/report/" + step;
        String back = "/precision-experiments/" + studyId;
        return switch (step == null ? "" : step) {
            case "draft" -> new Confirmation("Issue the draft report of " + name + " for comment?",
                    "The draft report is made from the latest evaluation run and every laboratory of the experiment "
                            + "can read it. Issued reports are never changed: a later evaluation needs a new report.",
                    action, List.of(), null, false, null, "Issue the draft report", back);
            case "comment-period" -> new Confirmation("Open the comment period of " + name + "?",
                    "Laboratories may comment on the draft report; after the comment period only the final report "
                            + "can follow. The experiment does not go back to the draft.",
                    action, List.of(), null, false, null, "Open the comment period", back);
            case "final" -> new Confirmation("Issue the final report of " + name + "?",
                    "The final report is made from the latest evaluation run and replaces the draft for every "
                            + "laboratory of the experiment. It is never changed afterwards.",
                    action, List.of(), null, false, null, "Issue the final report", back);
            default -> throw new DomainException.NotFound("The report step");
        };
    }

    /** The latest issued report in the browser (coordinators; enrolled laboratories). */
    @GET
    @Path("precision-experiments/{studyId}/report")
    @RolesAllowed({Role.COORDINATOR_NAME, Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public TemplateInstance report(@PathParam("studyId") long studyId) {
        String html = reports.latestHtml(studyId);
        PrecisionReportService.Issued issued = reports.latest(studyId).orElseThrow();
        int start = html.indexOf("<body>") + 6;
        int end = html.lastIndexOf("</body>");
        return Templates.report(html.substring(start, end), studyId, issued.reportId(),
                "preliminary".equals(issued.status()) ? "draft for comment" : issued.status());
    }

    private Response act(long studyId, java.util.function.Supplier<String> action) {
        return FormActions.attempt(() -> {
            String message = action.get();
            return Templates.study(page(studyId), null, message);
        }, error -> Templates.study(page(studyId), error, null));
    }

    private StudyPage page(long studyId) {
        PrecisionExperimentService.StudyView view = studies.view(studyId);
        List<String> levelText = new ArrayList<>();
        if (view.plan() != null) {
            view.plan().levels().forEach(l -> levelText.add("Level " + l.label() + ": " + l.material()));
        }
        Optional<PrecisionExperimentService.Run> run = view.planVersion() == null ? Optional.empty() : studies.latestRun(studyId);
        List<LevelRow> levels = new ArrayList<>();
        run.ifPresent(r -> r.study().measurands().forEach(m -> {
            int d = rounds.precisionStudy(studyId).map(s -> s.reportingDigits().getOrDefault(m.measurand(), 4)).orElse(4);
            for (PrecisionCalculation.LevelResult l : m.levels()) {
                List<CellRow> cells = new ArrayList<>();
                for (PrecisionCalculation.CellResult c : l.cells()) {
                    StringBuilder values = new StringBuilder();
                    c.values().forEach(v -> values.append(values.length() == 0 ? "" : "; ").append(NumberFormats.result(v, d)));
                    cells.add(new CellRow(c.laboratory(), values.toString(), NumberFormats.statistic(c.mean(), d),
                            NumberFormats.statistic(c.sd(), d), NumberFormats.decimal(c.h(), 2), NumberFormats.decimal(c.k(), 2),
                            c.flags().isEmpty() ? "none" : String.join("; ", c.flags()), !c.flags().isEmpty(), c.excluded(),
                            c.excluded() ? "excluded: " + c.exclusionReason() : "retained"));
                }
                List<TestRow> tests = new ArrayList<>();
                for (PrecisionCalculation.TestResult t : l.tests()) {
                    tests.add(new TestRow(t.test(), String.join(", ", t.laboratories()), NumberFormats.decimal(t.statistic(), 4),
                            NumberFormats.decimal(t.stragglerCritical(), 4), NumberFormats.decimal(t.outlierCritical(), 4),
                            t.verdict(), "straggler".equals(t.verdict()) || "outlier".equals(t.verdict())));
                }
                levels.add(new LevelRow(m.measurand(), l.level(), l.material(), l.laboratories(), l.retainedLaboratories(),
                        NumberFormats.statistic(l.generalMean(), d), NumberFormats.statistic(l.repeatabilitySd(), d),
                        NumberFormats.statistic(l.betweenLaboratorySd(), d), NumberFormats.statistic(l.reproducibilitySd(), d),
                        NumberFormats.statistic(l.repeatabilityLimit(), d), NumberFormats.statistic(l.reproducibilityLimit(), d),
                        "±" + NumberFormats.decimal(l.hStragglerLine(), 2) + " / ±" + NumberFormats.decimal(l.hOutlierLine(), 2),
                        NumberFormats.decimal(l.kStragglerLine(), 2) + " / " + NumberFormats.decimal(l.kOutlierLine(), 2),
                        cells, tests, l.warnings()));
            }
        }));
        String state = view.state();
        boolean frozen = view.planVersion() != null;
        return new StudyPage(view, stateLabel(state), levelText, run.map(PrecisionExperimentService.Run::runNumber).orElse(null),
                frozen && run.isPresent() && studies.latestRunIsCurrent(studyId), levels,
                frozen ? studies.exclusions(studyId) : List.of(),
                new ArrayList<>(rounds.participantCodes(studyId).values()),
                "CLOSED".equals(state) || "EVALUATING".equals(state),
                frozen && ("CLOSED".equals(state) || "EVALUATING".equals(state)),
                "EVALUATING".equals(state) && run.isPresent(), "PRELIMINARY_ISSUED".equals(state),
                "COMMENT_PERIOD".equals(state), frozen ? reports.latest(studyId).orElse(null) : null);
    }

    // ---- laboratories ---------------------------------------------------------------------------------------

    @GET
    @Path("my-precision-experiments/{studyId}")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public TemplateInstance mine(@PathParam("studyId") long studyId) {
        return Templates.mine(minePage(studyId, null), null, null);
    }

    @POST
    @Path("my-precision-experiments/{studyId}/upload")
    @Consumes(MediaType.MULTIPART_FORM_DATA)
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public Response upload(@PathParam("studyId") long studyId, @RestForm("file") FileUpload file,
                           @RestForm("confirmWarnings") String confirmWarnings) {
        minePage(studyId, null);
        UploadFormat format = file == null || file.fileName() == null ? null
                : UploadFormat.fromFileName(file.fileName()).filter(f -> f != UploadFormat.JSON).orElse(null);
        byte[] content = file == null || file.uploadedFile() == null ? new byte[0] : read(file);
        return submit(studyId, () -> {
            if (format == null) {
                throw new DomainException.BadRequest("Upload a .csv or .xlsx file with the columns level, measurand, replicate, value.");
            }
            return submissions.submit(studyId, new SubmissionService.Upload(format == UploadFormat.XLSX
                    ? SubmissionService.Channel.XLSX : SubmissionService.Channel.CSV, format, content, file.fileName(),
                    file.contentType()), "on".equals(confirmWarnings), null, clientAddress());
        });
    }

    @POST
    @Path("my-precision-experiments/{studyId}/form")
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public Response form(@PathParam("studyId") long studyId, MultivaluedMap<String, String> form) {
        MinePage page = minePage(studyId, null);
        StringBuilder json = new StringBuilder("{\"results\":[");
        boolean first = true;
        for (String level : page.levels()) {
            for (String m : page.measurands()) {
                for (int i = 1; i <= page.replicates(); i++) {
                    String v = form.getFirst("v-" + m + "-" + level + "-" + i);
                    if (v == null || v.isBlank()) {
                        continue;
                    }
                    json.append(first ? "" : ",").append("{\"level\":\"").append(level).append("\",\"measurand\":\"")
                            .append(m).append("\",\"replicate\":").append(i).append(",\"value\":\"")
                            .append(v.strip().replace("\\", "\\\\").replace("\"", "\\\"")).append("\"}");
                    first = false;
                }
            }
        }
        byte[] body = json.append("]}").toString().getBytes(StandardCharsets.UTF_8);
        return submit(studyId, () -> submissions.submit(studyId, new SubmissionService.Upload(SubmissionService.Channel.FORM,
                UploadFormat.JSON, body, null, null), "on".equals(form.getFirst("confirmWarnings")), null, clientAddress()));
    }

    private Response submit(long studyId, java.util.function.Supplier<org.roundtable.submission.SubmissionViews.Receipt> action) {
        try {
            org.roundtable.submission.SubmissionViews.Receipt receipt = action.get();
            return Response.ok(Templates.mine(minePage(studyId, receipt.receiptId()), null,
                    "Revision " + receipt.revision() + " is stored. Receipt " + receipt.receiptId() + ".")).build();
        } catch (DomainException.NotFound e) {
            throw e;
        } catch (DomainException e) {
            String detail = e.detail();
            if (!e.details().isEmpty()) {
                StringBuilder b = new StringBuilder(detail);
                e.details().forEach(d -> b.append(" ").append(d.row() == null ? "" : "Row " + d.row() + ": ").append(d.message()));
                detail = b.toString();
            }
            return Response.status(e.status()).entity(Templates.mine(minePage(studyId, null), detail, null)).build();
        }
    }

    private MinePage minePage(long studyId, String receipt) {
        long lab = currentUser.requireLaboratoryId();
        String code = rounds.participantCode(studyId, lab).orElseThrow(() -> new DomainException.NotFound("The study"));
        RoundAccess.PrecisionStudy study = rounds.precisionStudy(studyId)
                .orElseThrow(() -> new DomainException.NotFound("The study"));
        return new MinePage(studyId, study.roundCode(), code, stateLabel(study.state()), "OPEN_FOR_RESULTS".equals(study.state()),
                study.plan().levelLabels(), study.plan().measurands(), study.plan().replicates(), queries.myReplicates(studyId),
                java.util.Set.of("PRELIMINARY_ISSUED", "COMMENT_PERIOD", "FINAL_ISSUED", "AMENDED", "ARCHIVED").contains(study.state()),
                receipt);
    }

    /** The round state in plain words, with the precision experiment's meaning of the report states. */
    static String stateLabel(String state) {
        return switch (state) {
            case "DRAFT" -> "being planned";
            case "PLAN_FROZEN" -> "plan frozen";
            case "ENROLLING" -> "enrolling laboratories";
            case "ITEMS_QUALIFIED" -> "materials ready";
            case "DISPATCHED" -> "materials dispatched";
            case "OPEN_FOR_RESULTS" -> "open for results";
            case "CLOSED" -> "closed for results";
            case "EVALUATING" -> "being evaluated";
            case "PRELIMINARY_ISSUED" -> "draft report issued";
            case "COMMENT_PERIOD" -> "comment period on the draft report";
            case "FINAL_ISSUED" -> "final report issued";
            default -> state.toLowerCase(Locale.ROOT).replace('_', ' ');
        };
    }

    private static byte[] read(FileUpload file) {
        try {
            return Files.readAllBytes(file.uploadedFile());
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private String clientAddress() {
        return request == null || request.remoteAddress() == null ? null : request.remoteAddress().hostAddress();
    }
}
