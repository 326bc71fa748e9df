package org.roundtable.audit;

import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.QueryParam;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import jakarta.ws.rs.core.StreamingOutput;

import java.io.BufferedWriter;
import java.io.OutputStreamWriter;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.List;

/** The audit trail for coordinators and admins: a page of events, chain verification, and a CSV export. */
@Path("/api/v1/audit")
@RolesAllowed({"coordinator", "admin"})
public class AuditResource {

    private final AuditTrail audit;

    public AuditResource(AuditTrail audit) {
        this.audit = audit;
    }

    @GET
    @Path("/events")
    @Produces(MediaType.APPLICATION_JSON)
    public List<AuditEntry> events(@QueryParam("before") Long beforeSequence, @QueryParam("limit") Integer limit) {
        return audit.page(beforeSequence, limit == null ? 100 : limit);
    }

    @GET
    @Path("/verification")
    @Produces(MediaType.APPLICATION_JSON)
    public AuditChain.Verification verify(@QueryParam("expectedHead") String expectedHead) {
        return audit.verify(expectedHead);
    }

    @GET
    @Path("/export")
    @Produces("text/csv")
    public Response export() {
        StreamingOutput body = out -> {
            BufferedWriter writer = new BufferedWriter(new OutputStreamWriter(out, StandardCharsets.UTF_8));
            writer.write(AuditCsv.HEADER);
            writer.write("\r\n");
            try {
                audit.forEach(entry -> {
                    try {
                        writer.write(AuditCsv.row(entry));
                        writer.write("\r\n");
                    } catch (java.io.IOException e) {
                        throw new UncheckedIOException(e);
                    }
                });
            } finally {
                writer.flush();
            }
        };
        return Response.ok(body, "text/csv; charset=UTF-8")
                .header("Content-Disposition", "attachment; filename=\"roundtable-audit-trail.csv\"")
                .build();
    }
}
