package org.roundtable.coordinator;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.QueryParam;
import jakarta.ws.rs.core.MediaType;
import org.roundtable.account.Role;
import org.roundtable.platform.DisplaySettings;
import org.roundtable.platform.Paging;

import java.util.List;

/** The coordinator's home: the rounds that need a coordinator now, each with the link to its next step. */
@Path("/")
@Produces(MediaType.TEXT_HTML)
public class CoordinatorPages {

    @CheckedTemplate(basePath = "coordinator")
    static class Templates {
        static native TemplateInstance home(List<NextStep> steps, Paging paging);
    }

    private final NextSteps nextSteps;
    private final DisplaySettings display;

    public CoordinatorPages(NextSteps nextSteps, DisplaySettings display) {
        this.nextSteps = nextSteps;
        this.display = display;
    }

    @GET
    @Path("coordinator")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public TemplateInstance home(@QueryParam("page") Integer page) {
        List<NextStep> all = nextSteps.needingMe();
        Paging paging = Paging.of(page, display.pageSize(), all.size());
        List<NextStep> shown = all.subList(paging.offset(), (int) paging.last());
        return Templates.home(shown, paging);
    }
}
