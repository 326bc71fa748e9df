package org.roundtable.report;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import jakarta.annotation.security.PermitAll;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.jboss.resteasy.reactive.RestForm;
import org.jboss.resteasy.reactive.multipart.FileUpload;
import org.roundtable.platform.DomainException;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.util.Locale;

/**
 * The verification page for people: upload the document or paste its SHA-256, and see whether it was issued
 * here, with the same answer as {@link VerificationResource}. Open to everyone; the forms carry the CSRF
 * token like every other form.
 */
@Path("/verify")
@Produces(MediaType.TEXT_HTML)
@PermitAll
public class VerificationPage {

    @CheckedTemplate(basePath = "report")
    static class Templates {
        static native TemplateInstance verify(Verifier.Answer answer, String error, String sha256);
    }

    private final Verifier verifier;

    public VerificationPage(Verifier verifier) {
        this.verifier = verifier;
    }

    /** The form; {@code sha256} (for instance from the link to a newer version) is filled in, ready to verify. */
    @GET
    public TemplateInstance form(@jakarta.ws.rs.QueryParam("sha256") String sha256) {
        String given = sha256 == null ? null : sha256.strip().toLowerCase(Locale.ROOT);
        return Templates.verify(null, null, given != null && IssuedDocuments.SHA256.matcher(given).matches() ? given : null);
    }

    /** Verifies the uploaded file if there is one, else the pasted hash (upper case and spaces forgiven). */
    @POST
    @Consumes(MediaType.MULTIPART_FORM_DATA)
    public Response verify(@RestForm("file") FileUpload file, @RestForm("sha256") String sha256) {
        try {
            Verifier.Answer answer;
            if (file != null && file.uploadedFile() != null && file.size() > 0) {
                if (file.size() > Verifier.MAX_DOCUMENT_BYTES) {
                    throw new Verifier.TooLarge();
                }
                answer = verifier.document(read(file));
            } else if (sha256 != null && !sha256.isBlank()) {
                answer = verifier.hash(sha256.replaceAll("\\s+", "").toLowerCase(Locale.ROOT));
            } else {
                throw new DomainException.BadRequest("Choose the document or paste its SHA-256.");
            }
            return Response.ok(Templates.verify(answer, null, null)).build();
        } catch (DomainException e) {
            return Response.status(e.status()).entity(Templates.verify(null, e.detail(),
                    sha256 == null ? null : sha256.strip())).build();
        }
    }

    private static byte[] read(FileUpload file) {
        try {
            return Files.readAllBytes(file.uploadedFile());
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
