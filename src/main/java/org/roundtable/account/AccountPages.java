package org.roundtable.account;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import io.vertx.core.http.HttpServerRequest;
import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.FormParam;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.QueryParam;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.roundtable.platform.Confirmation;
import org.roundtable.platform.Confirmations;
import org.roundtable.platform.DisplaySettings;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Paging;
import org.roundtable.platform.FormActions;

import java.time.LocalDate;
import java.time.LocalTime;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.time.format.DateTimeParseException;
import java.util.List;

/** Pages for administering users (admin), laboratories (coordinator, admin), one's own laboratory (lab manager) and an auditor's grants. */
@Path("/")
@Produces(MediaType.TEXT_HTML)
public class AccountPages {

    /** Rows of the first page where a page is re-shown after an action (the page-size budget applies). */
    private int pageSize() {
        return display.pageSize();
    }

    @CheckedTemplate(basePath = "account")
    static class Templates {
        static native TemplateInstance users(LaboratoryService.Page<AccountService.UserView> users, Paging paging,
                                             String query, AccountService.UserWithLink link, String error, String baseUrl);

        static native TemplateInstance laboratories(LaboratoryService.Page<LaboratoryService.LaboratoryView> laboratories,
                                                    Paging paging, String query,
                                                    LaboratoryService.CreatedLaboratory created,
                                                    String error, String baseUrl);

        static native TemplateInstance myLaboratory(LaboratoryService.LaboratoryView laboratory,
                                                    List<AccountService.UserView> members,
                                                    List<ApiTokenService.TokenView> tokens,
                                                    List<AuditorGrantService.GrantView> grants,
                                                    AccountService.UserWithLink link,
                                                    ApiTokenService.CreatedToken newToken, String error, String baseUrl,
                                                    Long extendGrant, String message, List<ApiTokenScope> scopes);

        static native TemplateInstance auditor(List<AuditorGrantService.GrantedLaboratory> laboratories);
    }

    private final AccountService accounts;
    private final LaboratoryService laboratories;
    private final ApiTokenService tokens;
    private final AuditorGrantService grants;
    private final CurrentUser currentUser;
    private final TwoStepService twoStep;
    private final HttpServerRequest request;
    private final Confirmations confirmations;
    private final DisplaySettings display;

    public AccountPages(AccountService accounts, LaboratoryService laboratories, ApiTokenService tokens,
                        AuditorGrantService grants, CurrentUser currentUser, TwoStepService twoStep,
                        HttpServerRequest request, Confirmations confirmations, DisplaySettings display) {
        this.confirmations = confirmations;
        this.display = display;
        this.accounts = accounts;
        this.laboratories = laboratories;
        this.tokens = tokens;
        this.grants = grants;
        this.currentUser = currentUser;
        this.twoStep = twoStep;
        this.request = request;
    }

    // ---- admin: users ------------------------------------------------------------------------------------

    @GET
    @Path("admin/users")
    @RolesAllowed(Role.ADMIN_NAME)
    public TemplateInstance users(@QueryParam("q") String query, @QueryParam("page") Integer page) {
        return usersPage(query, page, null, null);
    }

    @POST
    @Path("admin/users")
    @RolesAllowed(Role.ADMIN_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response createUser(@FormParam("username") String username, @FormParam("displayName") String displayName,
                               @FormParam("email") String email, @FormParam("role") String role,
                               @FormParam("laboratoryId") String laboratoryId) {
        return FormActions.attempt(() -> usersPage(accounts.create(new AccountService.NewUser(username, displayName, email, role,
                Role.fromName(role).map(Role::belongsToLaboratory).orElse(false) ? parseId(laboratoryId) : null)), null),
                e -> usersPage(null, e));
    }

    @POST
    @Path("admin/users/{userId}/enabled")
    @RolesAllowed(Role.ADMIN_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response setEnabled(@PathParam("userId") long userId, @FormParam("enabled") boolean enabled,
                               @FormParam("confirmed") String confirmed) {
        return FormActions.attempt(() -> {
            if (!enabled && !Confirmation.confirmed(confirmed)) {
                return confirmations.page(disabling(accounts.get(userId).username(), "/admin/users/" + userId + "/enabled",
                        "/admin/users"), null);
            }
            accounts.setEnabled(userId, enabled);
            return usersPage(null, null);
        }, e -> usersPage(null, e));
    }

    @POST
    @Path("admin/users/{userId}/password-link")
    @RolesAllowed(Role.ADMIN_NAME)
    public Response passwordLink(@PathParam("userId") long userId) {
        return FormActions.attempt(() -> usersPage(accounts.startPasswordReset(userId), null), e -> usersPage(null, e));
    }

    @POST
    @Path("admin/users/{userId}/two-step-reset")
    @RolesAllowed(Role.ADMIN_NAME)
    public Response resetTwoStep(@PathParam("userId") long userId) {
        return FormActions.attempt(() -> {
            accounts.get(userId);
            twoStep.reset(userId);
            return usersPage(null, null);
        }, e -> usersPage(null, e));
    }

    // ---- coordinator/admin: laboratories -----------------------------------------------------------------

    @GET
    @Path("laboratories")
    @RolesAllowed({Role.COORDINATOR_NAME, Role.ADMIN_NAME})
    public TemplateInstance laboratoriesPage(@QueryParam("q") String query, @QueryParam("page") Integer page) {
        return laboratoriesPage(query, page, null, null);
    }

    @POST
    @Path("laboratories")
    @RolesAllowed({Role.COORDINATOR_NAME, Role.ADMIN_NAME})
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response enrol(@FormParam("organisation") String organisation, @FormParam("name") String name,
                          @FormParam("country") String country, @FormParam("contactName") String contactName,
                          @FormParam("contactEmail") String contactEmail,
                          @FormParam("managerUsername") String managerUsername) {
        return FormActions.attempt(() -> {
            LaboratoryService.CreatedLaboratory created = laboratories.create(new LaboratoryService.NewLaboratory(
                    name, organisation, country, contactName, contactEmail, managerUsername, null));
            return laboratoriesPage(null, null, created, null);
        }, e -> laboratoriesPage(null, null, null, e));
    }

    // ---- lab manager: my laboratory ---------------------------------------------------------------------

    @GET
    @Path("my-laboratory")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public TemplateInstance myLaboratory() {
        return myLaboratoryPage(null, null, null);
    }

    @POST
    @Path("my-laboratory/members")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response addMember(@FormParam("username") String username, @FormParam("displayName") String displayName,
                              @FormParam("email") String email, @FormParam("role") String role) {
        return FormActions.attempt(() -> myLaboratoryPage(accounts.createOwnLaboratoryMember(username, displayName, email, role),
                null, null), e -> myLaboratoryPage(null, null, e));
    }

    @POST
    @Path("my-laboratory/members/{userId}/enabled")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response setMemberEnabled(@PathParam("userId") long userId, @FormParam("enabled") boolean enabled,
                                     @FormParam("confirmed") String confirmed) {
        return FormActions.attempt(() -> {
            if (!enabled && !Confirmation.confirmed(confirmed)) {
                String name = accounts.listOwnLaboratoryMembers().stream().filter(m -> m.id() == userId)
                        .map(AccountService.UserView::username).findFirst()
                        .orElseThrow(() -> new DomainException.NotFound("The user"));
                return confirmations.page(disabling(name, "/my-laboratory/members/" + userId + "/enabled", "/my-laboratory"),
                        null);
            }
            accounts.setOwnLaboratoryMemberEnabled(userId, enabled);
            return myLaboratoryPage(null, null, null);
        }, e -> myLaboratoryPage(null, null, e));
    }

    @POST
    @Path("my-laboratory/members/{userId}/password-link")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public Response memberPasswordLink(@PathParam("userId") long userId) {
        return FormActions.attempt(() -> myLaboratoryPage(accounts.startOwnLaboratoryMemberReset(userId), null, null),
                e -> myLaboratoryPage(null, null, e));
    }

    @POST
    @Path("my-laboratory/tokens")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response createToken(@FormParam("name") String name, @FormParam("scope") String scope,
                                @FormParam("expiresOn") String expiresOn) {
        return FormActions.attempt(() -> myLaboratoryPage(null, tokens.create(name, ApiTokenScope.parse(scope),
                        expiresOn == null || expiresOn.isBlank() ? null : endOfDay(expiresOn)), null),
                e -> myLaboratoryPage(null, null, e));
    }

    @POST
    @Path("my-laboratory/tokens/{tokenId}/revoke")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public Response revokeToken(@PathParam("tokenId") long tokenId, @FormParam("confirmed") String confirmed) {
        return FormActions.attempt(() -> {
            if (!Confirmation.confirmed(confirmed)) {
                // another laboratory's token answers exactly like a missing one, before any second step
                ApiTokenService.TokenView token = tokens.listOwn().stream().filter(t -> t.id() == tokenId).findFirst()
                        .orElseThrow(() -> new DomainException.NotFound("The token"));
                String stops = token.scope() == ApiTokenScope.READ_SCORES
                        ? "can no longer read your laboratory's scores"
                        : "can no longer submit your laboratory's results";
                return confirmations.page(new Confirmation("Revoke the API token " + token.name() + "?",
                        "Your laboratory's systems that use it " + stops + " through Roundtable's API; they need a new "
                                + "token. A revoked token cannot be turned on again.",
                        "/my-laboratory/tokens/" + tokenId + "/revoke", List.of(), null, false, null, "Revoke the token",
                        "/my-laboratory"), null);
            }
            tokens.revoke(tokenId);
            return myLaboratoryPage(null, null, null);
        }, e -> myLaboratoryPage(null, null, e));
    }

    @POST
    @Path("my-laboratory/auditor-grants")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response grant(@FormParam("auditorUsername") String auditorUsername, @FormParam("validUntil") String validUntil) {
        try {
            grants.grant(auditorUsername, endOfDay(validUntil));
            return Response.ok(myLaboratoryPage(null, null, null)).build();
        } catch (AuditorGrantService.GrantExists e) {
            // the error names the existing access; the page offers to extend it in place
            String auditor = auditorUsername == null ? "" : auditorUsername.strip();
            return Response.status(409).entity(myLaboratoryPage(null, null, "The auditor " + auditor
                    + " already has access. Extend the existing access instead of granting it twice.",
                    e.existingGrantId(), null)).build();
        } catch (DomainException.NotFound | DomainException.Forbidden e) {
            throw e;
        } catch (DomainException e) {
            return Response.status(e.status()).entity(myLaboratoryPage(null, null, e.detail())).build();
        }
    }

    @POST
    @Path("my-laboratory/auditor-grants/{grantId}/extend")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response extendGrant(@PathParam("grantId") long grantId, @FormParam("validUntil") String validUntil) {
        return FormActions.attempt(() -> {
            // another laboratory's grant answers exactly like a missing one, before the date is read
            if (grants.listOwnLaboratory().stream().noneMatch(g -> g.id() == grantId)) {
                throw new DomainException.NotFound("The grant");
            }
            AuditorGrantService.GrantView extended = grants.extend(grantId, endOfDay(validUntil));
            return myLaboratoryPage(null, null, null, null,
                    "The access of " + extended.auditorName() + " now runs until " + validUntil.strip() + ".");
        }, e -> myLaboratoryPage(null, null, e, grantId, null));
    }

    @POST
    @Path("my-laboratory/auditor-grants/{grantId}/revoke")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public Response revokeGrant(@PathParam("grantId") long grantId, @FormParam("confirmed") String confirmed) {
        return FormActions.attempt(() -> {
            if (!Confirmation.confirmed(confirmed)) {
                AuditorGrantService.GrantView grant = grants.listOwnLaboratory().stream()
                        .filter(g -> g.id() == grantId).findFirst()
                        .orElseThrow(() -> new DomainException.NotFound("The auditor's access"));
                return confirmations.page(new Confirmation("End the access of " + grant.auditorName() + "?",
                        grant.auditorName() + " no longer sees your laboratory's history, its laboratory reports or its "
                                + "name in the library from now on. To give access again, grant it anew.",
                        "/my-laboratory/auditor-grants/" + grantId + "/revoke", List.of(), null, false, null,
                        "End the access", "/my-laboratory"), null);
            }
            grants.revoke(grantId);
            return myLaboratoryPage(null, null, null);
        }, e -> myLaboratoryPage(null, null, e));
    }

    private static Confirmation disabling(String username, String action, String back) {
        return new Confirmation("Disable the account " + username + "?",
                "The user is signed out everywhere and can no longer sign in or use the API until an account "
                        + "administrator enables the account again. What the user did stays recorded.",
                action, List.of(new Confirmation.Field("enabled", "false")), null, false, null, "Disable the account", back);
    }

    // ---- auditor ---------------------------------------------------------------------------------------------

    @GET
    @Path("auditor")
    @RolesAllowed(Role.AUDITOR_NAME)
    public TemplateInstance auditor() {
        return Templates.auditor(grants.listGrantedToMe());
    }

    // ---- helpers --------------------------------------------------------------------------------------------

    private TemplateInstance usersPage(AccountService.UserWithLink link, String error) {
        return usersPage(null, null, link, error);
    }

    private TemplateInstance usersPage(String query, Integer page, AccountService.UserWithLink link, String error) {
        long total = accounts.search(query, 0, 1).total();
        Paging paging = Paging.of(page, pageSize(), total);
        return Templates.users(accounts.search(query, paging.offset(), paging.size()), paging, query, link, error,
                FormActions.baseUrl(request));
    }

    private TemplateInstance laboratoriesPage(String query, Integer page, LaboratoryService.CreatedLaboratory created,
                                              String error) {
        long total = laboratories.search(query, 0, 1).total();
        Paging paging = Paging.of(page, pageSize(), total);
        return Templates.laboratories(laboratories.search(query, paging.offset(), paging.size()), paging, query, created,
                error, FormActions.baseUrl(request));
    }

    private TemplateInstance myLaboratoryPage(AccountService.UserWithLink link, ApiTokenService.CreatedToken newToken,
                                              String error) {
        return myLaboratoryPage(link, newToken, error, null, null);
    }

    private TemplateInstance myLaboratoryPage(AccountService.UserWithLink link, ApiTokenService.CreatedToken newToken,
                                              String error, Long extendGrant, String message) {
        return Templates.myLaboratory(laboratories.get(currentUser.requireLaboratoryId()),
                accounts.listOwnLaboratoryMembers(), tokens.listOwn(), grants.listOwnLaboratory(), link, newToken,
                error, FormActions.baseUrl(request), extendGrant, message, List.of(ApiTokenScope.values()));
    }



    private static Long parseId(String value) {
        if (value == null || value.isBlank()) {
            return null;
        }
        try {
            return Long.parseLong(value.strip());
        } catch (NumberFormatException e) {
            throw new DomainException.BadRequest("The laboratory is not valid.");
        }
    }

    private static OffsetDateTime endOfDay(String date) {
        try {
            return LocalDate.parse(date == null ? "" : date.strip()).atTime(LocalTime.of(23, 59, 59)).atOffset(ZoneOffset.UTC);
        } catch (DateTimeParseException e) {
            throw new DomainException.BadRequest("The date is not valid (yyyy-mm-dd).");
        }
    }
}
