package org.roundtable.web;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import jakarta.annotation.security.PermitAll;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;

/** The public start page. */
@Path("/")
public class HomePage {

    @CheckedTemplate(basePath = "web")
    static class Templates {
        static native TemplateInstance home();
    }

    @GET
    @PermitAll
    @Produces(MediaType.TEXT_HTML)
    public TemplateInstance home() {
        return Templates.home();
    }
}
