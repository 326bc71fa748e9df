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
import org.roundtable.platform.Labels;

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
        static native TemplateInstance users(List<UserRow> users, Paging paging, String query,
                                             AccountService.UserWithLink link, String error, String message,
                                             NewUserForm form, List<RoleChoice> roles, String baseUrl);

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

    /** A user on the users page: the account, its laboratory (or null) and whether it is the viewer's own. */
    public record UserRow(AccountService.UserView user, LaboratoryService.LaboratoryView laboratory, boolean self) {
    }

    /** A role as offered in the forms. */
    public record RoleChoice(String name, String label, boolean laboratoryRole) {
    }

    /**
     * The new-user form as typed, with the laboratories found by its search and the problem beside each field.
     *
     * @param matches the laboratories found for {@code laboratoryQuery} (a few; the search narrows them), or empty
     * @param chosen  the laboratory chosen so far, or null
     */
    public record NewUserForm(String username, String displayName, String email, String role, String laboratoryQuery,
                              List<LaboratoryService.LaboratoryView> matches, long matchesTotal,
                              LaboratoryService.LaboratoryView chosen, String usernameProblem, String nameProblem,
                              String emailProblem, String roleProblem, String laboratoryProblem, String problem) {
        static final NewUserForm EMPTY = new NewUserForm("", "", "", "lab-member", "", List.of(), 0, null, null, null,
                null, null, null, null);
    }

    /** Laboratories offered at once by the new-user form's search; more narrow the search. */
    static final int LABORATORY_MATCHES = 8;

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
        return usersPage(query, page, null, null, null, NewUserForm.EMPTY);
    }

    /**
     * Creates a user; with {@code find} set, only looks up laboratories for the form's laboratory search and shows
     * the form again with what was typed, so that the laboratory is chosen from the search, not typed as an id.
     */
    @POST
    @Path("admin/users")
    @RolesAllowed(Role.ADMIN_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response createUser(@FormParam("username") String username, @FormParam("displayName") String displayName,
                               @FormParam("email") String email, @FormParam("role") String role,
                               @FormParam("laboratoryId") String laboratoryId,
                               @FormParam("laboratoryQuery") String laboratoryQuery, @FormParam("find") String find) {
        Long chosenId = null;
        LaboratoryService.LaboratoryView chosen = null;
        String idProblem = null;
        try {
            chosenId = parseId(laboratoryId);
            chosen = chosenId == null ? null : laboratories.get(chosenId);
        } catch (DomainException e) {
            idProblem = "Choose the laboratory again from the search.";
            chosenId = null;
        }
        String query = laboratoryQuery == null ? "" : laboratoryQuery.strip();
        boolean labRole = Role.fromName(role).map(Role::belongsToLaboratory).orElse(false);
        List<LaboratoryService.LaboratoryView> matches = List.of();
        long matchesTotal = 0;
        if (find != null || (!query.isEmpty() && chosen == null)) {
            LaboratoryService.Page<LaboratoryService.LaboratoryView> found = laboratories.search(query, LABORATORY_MATCHES);
            matches = found.items();
            matchesTotal = found.total();
        }
        NewUserForm typed = new NewUserForm(text(username), text(displayName), text(email), role == null ? "" : role,
                query, matches, matchesTotal, chosen, null, null, null, null, idProblem, null);
        if (find != null) {
            String problem = matchesTotal == 0 ? "No laboratory's name or organisation contains '" + query + "'." : null;
            return Response.ok(usersPage(null, null, null, null, null, withLaboratoryProblem(typed, problem))).build();
        }
        if (labRole && chosen == null) {
            return Response.status(400).entity(usersPage(null, null, null, null, null, withLaboratoryProblem(typed,
                    idProblem != null ? idProblem : "A laboratory role needs its laboratory: find it by name and choose it."))).build();
        }
        Long labId = labRole ? chosenId : null;
        try {
            AccountService.UserWithLink created = accounts.create(new AccountService.NewUser(username, displayName, email,
                    role, labId));
            return Response.ok(usersPage(null, null, created, null, "User " + created.user().username() + " created.",
                    NewUserForm.EMPTY)).build();
        } catch (DomainException.NotFound | DomainException.Forbidden e) {
            throw e;
        } catch (DomainException e) {
            return Response.status(e.status()).entity(usersPage(null, null, null, null, null, beside(typed, e.detail())))
                    .build();
        }
    }

    /**
     * Changes a user's role: first the confirmation naming what the user loses and gains (the user is signed out
     * everywhere), then the change (audited by the service). One's own role cannot be changed.
     */
    @POST
    @Path("admin/users/{userId}/role")
    @RolesAllowed(Role.ADMIN_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response changeRole(@PathParam("userId") long userId, @FormParam("role") String roleName,
                               @FormParam("confirmed") String confirmed) {
        return FormActions.attempt(() -> {
            AccountService.UserView user = accounts.get(userId);
            if (currentUser.userId().map(id -> id == userId).orElse(false)) {
                throw new DomainException.Conflict("You cannot change your own role: ask another administrator.");
            }
            Role to = Role.fromName(roleName).orElseThrow(() -> new DomainException.BadRequest("Choose a role from the list."));
            Role from = Role.fromName(user.role()).orElseThrow();
            if (to == from) {
                throw new DomainException.BadRequest(user.username() + " already has the role " + Labels.of("RoleName", from.roleName()) + ".");
            }
            if (to.belongsToLaboratory() && user.laboratoryId() == null) {
                throw new DomainException.BadRequest(user.username() + " belongs to no laboratory, so a laboratory role"
                        + " cannot be given here: create a user for the laboratory instead.");
            }
            if (!Confirmation.confirmed(confirmed)) {
                return confirmations.page(new Confirmation("Make " + user.username() + " " + article(to) + " "
                        + Labels.of("RoleName", to.roleName()).toLowerCase(java.util.Locale.ROOT) + "?",
                        user.displayName() + " loses what " + article(from) + " "
                                + Labels.of("RoleName", from.roleName()).toLowerCase(java.util.Locale.ROOT) + " may do: "
                                + access(from) + " From now on: " + access(to) + " The user is signed out everywhere"
                                + " and signs in again with the new role.",
                        "/admin/users/" + userId + "/role", List.of(new Confirmation.Field("role", to.roleName())), null,
                        false, null, "Change the role", "/admin/users"), null);
            }
            accounts.changeRole(userId, to.roleName(), to.belongsToLaboratory() ? user.laboratoryId() : null);
            return usersPage(null, null, null, null, user.username() + " is now " + article(to) + " "
                    + Labels.of("RoleName", to.roleName()).toLowerCase(java.util.Locale.ROOT) + ".", NewUserForm.EMPTY);
        }, e -> usersPage(null, null, null, e, null, NewUserForm.EMPTY));
    }

    /** What a role may do, in a sentence for the confirmation. */
    static String access(Role role) {
        return switch (role) {
            case ADMIN -> "administers users and their roles.";
            case COORDINATOR -> "runs schemes and rounds and sees the laboratories behind the participant codes.";
            case LAB_MANAGER -> "administers its laboratory's members, API tokens and auditors' access, and enters its results.";
            case LAB_MEMBER -> "enters and reads its own laboratory's results and scores.";
            case AUDITOR -> "reads issued reports, and a laboratory's history where the laboratory granted it.";
        };
    }

    private static String article(Role role) {
        return role == Role.ADMIN || role == Role.AUDITOR ? "an" : "a";
    }

    @POST
    @Path("admin/users/{userId}/enabled")
    @RolesAllowed(Role.ADMIN_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response setEnabled(@PathParam("userId") long userId, @FormParam("enabled") boolean enabled,
                               @FormParam("confirmed") String confirmed) {
        return FormActions.attempt(() -> {
            if (!enabled && currentUser.userId().map(id -> id == userId).orElse(false)) {
                throw new DomainException.Conflict("You cannot disable your own account: ask another administrator.");
            }
            if (!enabled && !Confirmation.confirmed(confirmed)) {
                return confirmations.page(disabling(accounts.get(userId).username(), "/admin/users/" + userId + "/enabled",
                        "/admin/users"), null);
            }
            AccountService.UserView changed = accounts.setEnabled(userId, enabled);
            return usersPage(null, null, null, null, "The account " + changed.username() + " is "
                    + (enabled ? "enabled" : "disabled") + ".", NewUserForm.EMPTY);
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
        return usersPage(null, null, link, error, null, NewUserForm.EMPTY);
    }

    private TemplateInstance usersPage(String query, Integer page, AccountService.UserWithLink link, String error,
                                       String message, NewUserForm form) {
        long total = accounts.search(query, 0, 1).total();
        Paging paging = Paging.of(page, pageSize(), total);
        List<AccountService.UserView> users = accounts.search(query, paging.offset(), paging.size()).items();
        java.util.Map<Long, LaboratoryService.LaboratoryView> labs = laboratories.byIds(users.stream()
                .map(AccountService.UserView::laboratoryId).filter(java.util.Objects::nonNull).toList());
        Long self = currentUser.userId().orElse(null);
        List<UserRow> rows = users.stream().map(u -> new UserRow(u, u.laboratoryId() == null ? null : labs.get(u.laboratoryId()),
                self != null && self == u.id())).toList();
        List<RoleChoice> roles = java.util.Arrays.stream(Role.values())
                .map(r -> new RoleChoice(r.roleName(), Labels.of("RoleName", r.roleName()), r.belongsToLaboratory())).toList();
        return Templates.users(rows, paging, query, link, error, message, form, roles, FormActions.baseUrl(request));
    }

    private static NewUserForm withLaboratoryProblem(NewUserForm f, String problem) {
        return new NewUserForm(f.username(), f.displayName(), f.email(), f.role(), f.laboratoryQuery(), f.matches(),
                f.matchesTotal(), f.chosen(), null, null, null, null, problem, null);
    }

    /** Puts the service's refusal beside the field it is about (the form's top when it names none). */
    private static NewUserForm beside(NewUserForm f, String detail) {
        String lower = detail == null ? "" : detail.toLowerCase(java.util.Locale.ROOT);
        boolean username = lower.contains("username");
        boolean name = !username && lower.contains("display name");
        boolean email = !username && !name && lower.contains("e-mail");
        boolean role = !username && !name && !email && lower.contains("role");
        boolean laboratory = !username && !name && !email && !role && lower.contains("laborator");
        boolean other = !username && !name && !email && !role && !laboratory;
        return new NewUserForm(f.username(), f.displayName(), f.email(), f.role(), f.laboratoryQuery(), f.matches(),
                f.matchesTotal(), f.chosen(), username ? detail : null, name ? detail : null, email ? detail : null,
                role ? detail : null, laboratory ? detail : null, other ? detail : null);
    }

    private static String text(String value) {
        return value == null ? "" : value.strip();
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
