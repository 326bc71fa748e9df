package org.roundtable.scheme;

import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;
import org.roundtable.account.Role;

import java.util.List;

/** JSON API for schemes and their measurand catalogue (coordinators). */
@Path("/api/v1/schemes")
@Produces(MediaType.APPLICATION_JSON)
@Consumes(MediaType.APPLICATION_JSON)
@RolesAllowed(Role.COORDINATOR_NAME)
public class SchemeResource {

    private final SchemeService schemes;

    public SchemeResource(SchemeService schemes) {
        this.schemes = schemes;
    }

    @GET
    public List<SchemeService.SchemeView> list() {
        return schemes.list();
    }

    @POST
    public SchemeService.SchemeView create(SchemeService.NewScheme scheme) {
        return schemes.create(scheme);
    }

    @GET
    @Path("/{schemeId}")
    public SchemeService.SchemeView get(@PathParam("schemeId") long schemeId) {
        return schemes.get(schemeId);
    }

    /** Adds an element to the catalogue or replaces its entry. */
    @POST
    @Path("/{schemeId}/measurands")
    public SchemeService.MeasurandView putMeasurand(@PathParam("schemeId") long schemeId,
                                                    SchemeService.MeasurandEntry entry) {
        return schemes.putMeasurand(schemeId, entry);
    }
}
