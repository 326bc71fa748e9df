package org.roundtable.evaluation;

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
import org.roundtable.account.CurrentUser;
import org.roundtable.account.Role;
import org.roundtable.platform.FormActions;

/**
 * Page for coordinators: the round's results marked as blunders (current and withdrawn), a form to mark one and a
 * withdraw button with its reason. The forms go through {@link ExclusionService}, as the API does.
 */
@Path("/")
@Produces(MediaType.TEXT_HTML)
@RolesAllowed(Role.COORDINATOR_NAME)
public class ExclusionPages {

    @CheckedTemplate(basePath = "evaluation")
    static class Templates {
        static native TemplateInstance exclusions(ExclusionService.RoundExclusions round, String error, String message);
    }

    private final ExclusionService exclusions;
    private final CurrentUser currentUser;

    public ExclusionPages(ExclusionService exclusions, CurrentUser currentUser) {
        this.exclusions = exclusions;
        this.currentUser = currentUser;
    }

    @GET
    @Path("rounds/{roundId}/exclusions")
    public TemplateInstance exclusions(@PathParam("roundId") long roundId) {
        return Templates.exclusions(exclusions.list(roundId), null, null);
    }

    @POST
    @Path("rounds/{roundId}/exclusions")
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response mark(@PathParam("roundId") long roundId, @FormParam("participantCode") String participantCode,
                         @FormParam("element") String element, @FormParam("itemLabel") String itemLabel,
                         @FormParam("reason") String reason) {
        return FormActions.attempt(() -> {
            ExclusionService.Exclusion e = exclusions.mark(roundId,
                    new ExclusionService.MarkRequest(participantCode, element, itemLabel, reason), currentUser.actor());
            return Templates.exclusions(exclusions.list(roundId), null, "The result of " + e.participantCode() + " for "
                    + e.element() + " on item " + e.itemLabel() + " is marked as a blunder.");
        }, error -> Templates.exclusions(exclusions.list(roundId), error, null));
    }

    @POST
    @Path("rounds/{roundId}/exclusions/{exclusionId}/withdrawal")
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response withdraw(@PathParam("roundId") long roundId, @PathParam("exclusionId") long exclusionId,
                             @FormParam("reason") String reason) {
        return FormActions.attempt(() -> {
            ExclusionService.Exclusion e = exclusions.withdraw(roundId, exclusionId,
                    new ExclusionService.WithdrawalRequest(reason), currentUser.actor());
            return Templates.exclusions(exclusions.list(roundId), null, "The mark on the result of "
                    + e.participantCode() + " for " + e.element() + " on item " + e.itemLabel() + " is withdrawn.");
        }, error -> Templates.exclusions(exclusions.list(roundId), error, null));
    }
}
