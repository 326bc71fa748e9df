package org.roundtable.history;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;
import org.roundtable.account.Role;

/** The field view of a scheme for coordinators (the JSON is {@link HistoryResource#field}). */
@Path("/")
@RolesAllowed(Role.COORDINATOR_NAME)
public class FieldPages {

    @CheckedTemplate(basePath = "history")
    static class Templates {
        static native TemplateInstance field(FieldView.Field field);
    }

    private final FieldView fields;

    public FieldPages(FieldView fields) {
        this.fields = fields;
    }

    @GET
    @Path("schemes/{schemeId}/field")
    @Produces(MediaType.TEXT_HTML)
    public TemplateInstance page(@PathParam("schemeId") long schemeId) {
        return Templates.field(fields.of(schemeId));
    }
}
