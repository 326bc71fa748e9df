package org.roundtable.audit;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.QueryParam;
import jakarta.ws.rs.core.MediaType;

import java.util.List;

/** The audit trail page for coordinators and admins, with the result of a fresh chain verification. */
@Path("/audit")
@Produces(MediaType.TEXT_HTML)
@RolesAllowed({"coordinator", "admin"})
public class AuditPage {

    static final int PAGE_SIZE = 100;

    @CheckedTemplate(basePath = "audit")
    static class Templates {
        static native TemplateInstance trail(List<AuditEntry> entries, AuditChain.Verification verification,
                                             Long nextBefore);
    }

    private final AuditTrail audit;

    public AuditPage(AuditTrail audit) {
        this.audit = audit;
    }

    @GET
    public TemplateInstance trail(@QueryParam("before") Long before) {
        List<AuditEntry> entries = audit.page(before, PAGE_SIZE);
        Long nextBefore = entries.size() == PAGE_SIZE ? entries.get(entries.size() - 1).sequenceNo() : null;
        return Templates.trail(entries, audit.verify(null), nextBefore);
    }
}
