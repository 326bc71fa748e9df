package org.roundtable.history;

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
import org.roundtable.account.Role;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.FormActions;
import org.roundtable.report.IssuedDocument;

import java.util.List;

/**
 * The laboratory's exports for its assessor: choose a period, confirm, and the PDF and CSV are issued (and listed
 * with their SHA-256 for the public verification).
 */
@org.roundtable.account.ApiTokenScope.Required(org.roundtable.account.ApiTokenScope.READ_SCORES)
@Path("/my-laboratory/history/exports")
@Produces(MediaType.TEXT_HTML)
@RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
public class HistoryExportPages {

    @CheckedTemplate(basePath = "history")
    static class Templates {
        static native TemplateInstance exports(List<IssuedDocument> exports, HistoryExports.Issued issued, String from,
                                               String until, String error);
    }

    private final HistoryExports exports;

    public HistoryExportPages(HistoryExports exports) {
        this.exports = exports;
    }

    @GET
    public TemplateInstance list() {
        return Templates.exports(exports.own(), null, "", "", null);
    }

    @POST
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response issue(@FormParam("from") String from, @FormParam("until") String until,
                          @FormParam("confirm") String confirm) {
        return FormActions.attempt(() -> {
            HistoryService.Filter period = HistoryFilters.of(null, null, null, from, until, null, null);
            if (!"yes".equals(confirm)) {
                throw new DomainException.BadRequest("Confirm the export: once issued, it is kept as issued.");
            }
            HistoryExports.Issued issued = exports.issueOwn(period.from(), period.until());
            return Templates.exports(exports.own(), issued, "", "", null);
        }, error -> Templates.exports(exports.own(), null, from == null ? "" : from, until == null ? "" : until, error));
    }

    @GET
    @Path("{exportId}")
    @Produces({"application/pdf", "text/csv", MediaType.TEXT_HTML, MediaType.APPLICATION_JSON})
    public Response download(@PathParam("exportId") long exportId) {
        Object[] found = exports.ownContent(exportId).orElseThrow(() -> new DomainException.NotFound("The export"));
        String type = (String) found[0];
        String name = found[1] + (type.contains("pdf") ? ".pdf" : ".csv");
        return Response.ok(found[2], type).header("Content-Disposition", "attachment; filename=\"" + name + "\"").build();
    }
}
