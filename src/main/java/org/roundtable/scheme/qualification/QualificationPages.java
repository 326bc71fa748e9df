package org.roundtable.scheme.qualification;

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
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.jboss.resteasy.reactive.RestForm;
import org.jboss.resteasy.reactive.multipart.FileUpload;
import org.roundtable.account.Role;
import org.roundtable.platform.Admission;
import org.roundtable.platform.DomainException;
import org.roundtable.scheme.RoundService;
import org.roundtable.submission.intake.UploadFormat;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.util.Arrays;
import java.util.List;

/**
 * The coordinator's sample qualification page of a round: homogeneity and stability data sent as a CSV or XLSX
 * file or pasted as text (both read by the intake's readers), one table per measurand with each check, its
 * criterion and verdict, and the decision with its reason. A refused upload shows its reason beside the field and
 * keeps the pasted text.
 */
@Path("/")
@Produces(MediaType.TEXT_HTML)
public class QualificationPages {

    /** What the forms show again after a refusal: the pasted text, the choice, and the reason beside its field. */
    public record Form(String homogeneityText, String homogeneityProblem, String stabilityText, String stabilityProblem,
                       String decisionElement, String decisionChoice, String decisionReason, String decisionProblem) {
        static final Form EMPTY = new Form("", null, "", null, null, null, "", null);
    }

    @CheckedTemplate(basePath = "scheme")
    static class Templates {
        static native TemplateInstance qualification(RoundService.RoundView round,
                                                     List<QualificationService.MeasurandQualification> qualification,
                                                     List<String> decisions, Form form, String message);
    }

    private final QualificationService qualification;
    private final RoundService rounds;
    private final Admission admission;

    public QualificationPages(QualificationService qualification, RoundService rounds, Admission admission) {
        this.qualification = qualification;
        this.rounds = rounds;
        this.admission = admission;
    }

    @GET
    @Path("rounds/{roundId}/qualification")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public TemplateInstance page(@PathParam("roundId") long roundId) {
        return page(roundId, Form.EMPTY, null);
    }

    @POST
    @Path("rounds/{roundId}/qualification/homogeneity")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.MULTIPART_FORM_DATA)
    public Response homogeneity(@PathParam("roundId") long roundId, @RestForm("file") FileUpload file,
                                @RestForm("csv") String csv) {
        String text = csv == null ? "" : csv;
        try {
            QualificationService.DataFile data = dataFile(file, text);
            if (data == null) {
                qualification.uploadHomogeneity(roundId, new QualificationService.Upload(text));
            } else {
                try (Admission.Slot ignored = admission.uploadSlot()) {
                    qualification.uploadHomogeneityFile(roundId, data);
                }
            }
            return Response.ok(page(roundId, Form.EMPTY, "Homogeneity data checked.")).build();
        } catch (DomainException.NotFound | DomainException.Forbidden | Admission.Unavailable e) {
            throw e;
        } catch (DomainException e) {
            return Response.status(e.status()).entity(page(roundId,
                    new Form(text, inFile(file, e.detail()), "", null, null, null, "", null), null)).build();
        }
    }

    @POST
    @Path("rounds/{roundId}/qualification/stability")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.MULTIPART_FORM_DATA)
    public Response stability(@PathParam("roundId") long roundId, @RestForm("file") FileUpload file,
                              @RestForm("csv") String csv) {
        String text = csv == null ? "" : csv;
        try {
            QualificationService.DataFile data = dataFile(file, text);
            if (data == null) {
                qualification.uploadStability(roundId, new QualificationService.Upload(text));
            } else {
                try (Admission.Slot ignored = admission.uploadSlot()) {
                    qualification.uploadStabilityFile(roundId, data);
                }
            }
            return Response.ok(page(roundId, Form.EMPTY, "Stability data checked.")).build();
        } catch (DomainException.NotFound | DomainException.Forbidden | Admission.Unavailable e) {
            throw e;
        } catch (DomainException e) {
            return Response.status(e.status()).entity(page(roundId,
                    new Form("", null, text, inFile(file, e.detail()), null, null, "", null), null)).build();
        }
    }

    @POST
    @Path("rounds/{roundId}/qualification/decisions")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response decide(@PathParam("roundId") long roundId, @FormParam("element") String element,
                           @FormParam("decision") String decision, @FormParam("reason") String reason) {
        try {
            qualification.decide(roundId, new QualificationService.DecisionRequest(element, decision, reason));
            return Response.ok(page(roundId, Form.EMPTY, "Decision recorded for " + element + ".")).build();
        } catch (DomainException.NotFound | DomainException.Forbidden e) {
            throw e;
        } catch (DomainException e) {
            return Response.status(e.status()).entity(page(roundId, new Form("", null, "", null,
                    element == null ? null : element.strip(), decision, reason == null ? "" : reason, e.detail()), null))
                    .build();
        }
    }

    private TemplateInstance page(long roundId, Form form, String message) {
        return Templates.qualification(rounds.get(roundId), qualification.status(roundId),
                Arrays.stream(QualificationService.Decision.values()).map(Enum::name).toList(), form, message);
    }

    /** A refusal of a chosen file names the file, which the browser does not show again. */
    private static String inFile(FileUpload file, String detail) {
        boolean chosen = file != null && file.fileName() != null && !file.fileName().isBlank();
        if (!chosen || detail.startsWith("Choose a file") || detail.startsWith("Upload a")) {
            return detail;
        }
        String name = file.fileName().length() > 80 ? file.fileName().substring(0, 80) + "…" : file.fileName();
        return name + ": " + detail + " Correct the file and choose it again.";
    }

    /** The chosen file, or null when none was chosen (then the pasted text is read). */
    private static QualificationService.DataFile dataFile(FileUpload file, String text) {
        boolean chosen = file != null && file.uploadedFile() != null && file.fileName() != null
                && !file.fileName().isBlank();
        if (!chosen) {
            return null;
        }
        if (!text.isBlank()) {
            throw new DomainException.BadRequest("Choose a file or paste the data, not both: clear the text or the file.");
        }
        UploadFormat format = UploadFormat.fromFileName(file.fileName()).filter(f -> f != UploadFormat.JSON)
                .orElseThrow(() -> new DomainException.BadRequest("Upload a .csv or .xlsx file."));
        try {
            return new QualificationService.DataFile(Files.readAllBytes(file.uploadedFile()), format);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
