package org.roundtable.precision;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.jboss.resteasy.reactive.server.multipart.FormValue;
import org.jboss.resteasy.reactive.server.multipart.MultipartFormDataInput;
import org.roundtable.account.Role;
import org.roundtable.platform.Admission;
import org.roundtable.platform.DomainException;
import org.roundtable.scheme.qualification.QualificationService;
import org.roundtable.submission.intake.UploadFormat;

/**
 * The homogeneity of a precision experiment's materials: per level, the coordinator uploads the homogeneity data
 * (CSV or XLSX file, or pasted lines: item, replicate, measurand, value) with the target SD of each measurand (the
 * expected s_R at that level); the checks are those of a proficiency round's sample ({@link QualificationService}),
 * with the target in place of σpt. A refusal shows the form again with the typed text and targets and the problem
 * beside its field.
 */
@Path("/")
@Produces(MediaType.TEXT_HTML)
public class PrecisionHomogeneityPages {

    @CheckedTemplate(basePath = "precision")
    static class Templates {
        static native TemplateInstance homogeneity(PrecisionExperimentService.StudyView study, List<PrecisionMaterials.Row> rows,
                                                   Form form, String message);
    }

    /** The form as typed, with the problem of each field. */
    public record Form(String level, Map<String, String> targets, String text, String levelProblem, String targetProblem,
                       String dataProblem) {
        static Form empty() {
            return new Form(null, Map.of(), "", null, null, null);
        }

        /** The target typed for {@code element}, or empty text. */
        public String target(String element) {
            return targets.getOrDefault(element, "");
        }
    }

    private final PrecisionExperimentService studies;
    private final PrecisionMaterials materials;
    private final QualificationService qualification;
    private final Admission admission;

    public PrecisionHomogeneityPages(PrecisionExperimentService studies, PrecisionMaterials materials,
                                     QualificationService qualification, Admission admission) {
        this.studies = studies;
        this.materials = materials;
        this.qualification = qualification;
        this.admission = admission;
    }

    @GET
    @Path("precision-experiments/{studyId}/homogeneity")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public TemplateInstance page(@PathParam("studyId") long studyId) {
        return page(studyId, Form.empty(), null);
    }

    @POST
    @Path("precision-experiments/{studyId}/homogeneity")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.MULTIPART_FORM_DATA)
    public Response upload(@PathParam("studyId") long studyId, MultipartFormDataInput input) {
        PrecisionExperimentService.StudyView study = studies.view(studyId);
        String level = text(input, "level");
        String text = text(input, "csv");
        Map<String, String> targets = new LinkedHashMap<>();
        if (study.plan() != null) {
            for (String m : study.plan().measurands()) {
                targets.put(m, text(input, "target-" + m).strip());
            }
        }
        FormValue file = first(input, "file");
        try {
            QualificationService.DataFile data = dataFile(file, text);
            if (data == null) {
                qualification.uploadLevelHomogeneity(studyId, level, targets, new QualificationService.Upload(text));
            } else {
                try (Admission.Slot ignored = admission.uploadSlot()) {
                    qualification.uploadLevelHomogeneityFile(studyId, level, targets, data);
                }
            }
            return Response.ok(page(studyId, Form.empty(), "Homogeneity data of level " + level.strip() + " checked.")).build();
        } catch (DomainException.NotFound | DomainException.Forbidden | Admission.Unavailable e) {
            throw e;
        } catch (DomainException e) {
            String detail = e.detail();
            if (!e.details().isEmpty()) {
                StringBuilder b = new StringBuilder(detail);
                e.details().forEach(d -> b.append(" ").append(d.row() == null ? "" : "Line " + d.row() + ": ").append(d.message()));
                detail = b.toString();
            }
            boolean levelProblem = detail.startsWith("Choose one of the study's levels");
            boolean targetProblem = detail.startsWith("Give the target SD");
            Form form = new Form(level, targets, text, levelProblem ? detail : null, targetProblem ? detail : null,
                    levelProblem || targetProblem ? null : detail);
            return Response.status(e.status()).entity(page(studyId, form, null)).build();
        }
    }

    private TemplateInstance page(long studyId, Form form, String message) {
        PrecisionExperimentService.StudyView study = studies.view(studyId);
        return Templates.homogeneity(study, materials.of(studyId), form, message);
    }

    private static FormValue first(MultipartFormDataInput input, String name) {
        var values = input.getValues().get(name);
        return values == null || values.isEmpty() ? null : values.iterator().next();
    }

    /** A text field of the form, empty text when absent. */
    private static String text(MultipartFormDataInput input, String name) {
        FormValue v = first(input, name);
        return v == null || v.isFileItem() || v.getValue() == null ? "" : v.getValue();
    }

    /** The chosen file, or null when none was chosen (then the pasted text is read). */
    private static QualificationService.DataFile dataFile(FormValue file, String text) {
        boolean chosen = file != null && file.isFileItem() && file.getFileName() != null && !file.getFileName().isBlank();
        if (!chosen) {
            return null;
        }
        if (!text.isBlank()) {
            throw new DomainException.BadRequest("Choose a file or paste the data, not both: clear the text or the file.");
        }
        UploadFormat format = UploadFormat.fromFileName(file.getFileName()).filter(f -> f != UploadFormat.JSON)
                .orElseThrow(() -> new DomainException.BadRequest("Upload a .csv or .xlsx file."));
        try (var in = file.getFileItem().getInputStream()) {
            return new QualificationService.DataFile(in.readAllBytes(), format);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
