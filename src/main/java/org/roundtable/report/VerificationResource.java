package org.roundtable.report;

import com.fasterxml.jackson.core.JacksonException;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import jakarta.annotation.security.PermitAll;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.HeaderParam;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.HttpHeaders;
import jakarta.ws.rs.core.MediaType;
import org.roundtable.platform.CsrfExempt;
import org.roundtable.platform.DomainException;

import java.util.Map;

/**
 * Public verification of an issued document, for anyone holding a copy: no sign-in and no CSRF token (it
 * reads only and acts on no one's behalf), limited to 20 MiB and to a number of requests per client and
 * minute. The body is the document itself ({@code application/pdf}) or {@code {"sha256": "<64 lower-case
 * hex>"}}. A well-formed request is always answered 200: {@code issued} true with the document's report
 * number, kind, status, date of issue and newer version, or {@code issued} false with only the hash.
 */
@Path("/api/v1/reports/verify")
@PermitAll
@CsrfExempt
public class VerificationResource {

    private final Verifier verifier;
    private final ObjectMapper json;

    public VerificationResource(Verifier verifier, ObjectMapper json) {
        this.verifier = verifier;
        this.json = json;
    }

    /** One method for both media types, so that the endpoint is one row of the authorization matrix. */
    @POST
    @Consumes({"application/pdf", MediaType.APPLICATION_JSON})
    @Produces(MediaType.APPLICATION_JSON)
    public Map<String, Object> verify(@HeaderParam(HttpHeaders.CONTENT_TYPE) String contentType, byte[] body) {
        byte[] content = body == null ? new byte[0] : body;
        if (contentType != null && contentType.toLowerCase(java.util.Locale.ROOT).startsWith("application/pdf")) {
            return verifier.document(content).json();
        }
        if (content.length > Verifier.MAX_DOCUMENT_BYTES) {
            throw new Verifier.TooLarge();
        }
        return verifier.hash(sha256Of(content)).json();
    }

    private String sha256Of(byte[] content) {
        try {
            JsonNode node = json.readTree(content);
            JsonNode hash = node == null ? null : node.get("sha256");
            return hash != null && hash.isTextual() ? hash.asText() : null;
        } catch (JacksonException e) {
            throw new DomainException.BadRequest("The body is not JSON of the form {\"sha256\": \"<64 lower-case hex>\"}.");
        } catch (java.io.IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
    }
}
