package org.roundtable.account;

import io.quarkus.security.Authenticated;
import jakarta.annotation.security.RolesAllowed;
import jakarta.validation.Valid;
import jakarta.validation.constraints.NotBlank;
import jakarta.validation.constraints.NotNull;
import jakarta.validation.constraints.Size;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;
import org.roundtable.platform.DomainException;

import java.time.OffsetDateTime;
import java.util.List;

/** JSON API for accounts: who am I, users (admin), laboratories, my laboratory (lab manager), auditor grants. */
@Path("/api/v1")
@Produces(MediaType.APPLICATION_JSON)
@Consumes(MediaType.APPLICATION_JSON)
public class AccountResource {

    private final CurrentUser currentUser;
    private final AccountService accounts;
    private final LaboratoryService laboratories;
    private final ApiTokenService tokens;
    private final AuditorGrantService grants;
    private final TwoStepService twoStep;

    public AccountResource(CurrentUser currentUser, AccountService accounts, LaboratoryService laboratories,
                           ApiTokenService tokens, AuditorGrantService grants, TwoStepService twoStep) {
        this.currentUser = currentUser;
        this.accounts = accounts;
        this.laboratories = laboratories;
        this.tokens = tokens;
        this.grants = grants;
        this.twoStep = twoStep;
    }

    public record Me(String username, String displayName, String role, Long laboratoryId, boolean apiToken) {
    }

    public record PasswordChange(String currentPassword, String newPassword) {
    }

    public record RoleChange(@NotBlank String role, Long laboratoryId) {
    }

    public record NewMember(@NotBlank @Size(max = 64) String username, @NotBlank @Size(max = 200) String displayName,
                            @Size(max = 254) String email, @NotBlank String role) {
    }

    /** A new token: its name, its scope ({@code SUBMIT} when omitted) and an optional expiry. */
    public record NewToken(@NotBlank @Size(max = 100) String name, String scope, OffsetDateTime expiresAt) {
    }

    /** A grant's new end. */
    public record GrantExtension(OffsetDateTime validUntil) {
    }

    public record NewGrant(@NotBlank String auditorUsername, @NotNull OffsetDateTime validUntil) {
    }

    // ---- me -----------------------------------------------------------------------------------------------

    @GET
    @Path("/me")
    @Authenticated
    public Me me() {
        return new Me(currentUser.username(), currentUser.displayName(), currentUser.role().map(Role::roleName).orElse(null),
                currentUser.laboratoryId().orElse(null), currentUser.viaApiToken());
    }

    @POST
    @Path("/me/password")
    @Authenticated
    public void changePassword(PasswordChange change) {
        // checked before the body: an API token never changes a person's password
        if (currentUser.viaApiToken()) {
            throw new DomainException.Forbidden();
        }
        if (change == null) {
            throw new DomainException.BadRequest("The current and the new password are required.");
        }
        accounts.changeOwnPassword(change.currentPassword(), change.newPassword());
    }

    // ---- users (admin) --------------------------------------------------------------------------------------

    @GET
    @Path("/users")
    @RolesAllowed(Role.ADMIN_NAME)
    public List<AccountService.UserView> users() {
        return accounts.listAll();
    }

    @POST
    @Path("/users")
    @RolesAllowed(Role.ADMIN_NAME)
    public AccountService.UserWithLink createUser(@Valid @NotNull AccountService.NewUser user) {
        return accounts.create(user);
    }

    @GET
    @Path("/users/{userId}")
    @RolesAllowed(Role.ADMIN_NAME)
    public AccountService.UserView user(@PathParam("userId") long userId) {
        return accounts.get(userId);
    }

    @POST
    @Path("/users/{userId}/disable")
    @RolesAllowed(Role.ADMIN_NAME)
    public AccountService.UserView disable(@PathParam("userId") long userId) {
        return accounts.setEnabled(userId, false);
    }

    @POST
    @Path("/users/{userId}/enable")
    @RolesAllowed(Role.ADMIN_NAME)
    public AccountService.UserView enable(@PathParam("userId") long userId) {
        return accounts.setEnabled(userId, true);
    }

    @POST
    @Path("/users/{userId}/role")
    @RolesAllowed(Role.ADMIN_NAME)
    public AccountService.UserView changeRole(@PathParam("userId") long userId, @Valid @NotNull RoleChange change) {
        return accounts.changeRole(userId, change.role(), change.laboratoryId());
    }

    @POST
    @Path("/users/{userId}/password-link")
    @RolesAllowed(Role.ADMIN_NAME)
    public AccountService.UserWithLink passwordLink(@PathParam("userId") long userId) {
        return accounts.startPasswordReset(userId);
    }

    @POST
    @Path("/users/{userId}/two-step/reset")
    @RolesAllowed(Role.ADMIN_NAME)
    public AccountService.UserView resetTwoStep(@PathParam("userId") long userId) {
        AccountService.UserView user = accounts.get(userId);
        twoStep.reset(userId);
        return user;
    }

    // ---- laboratories ----------------------------------------------------------------------------------------

    @GET
    @Path("/laboratories")
    @RolesAllowed({Role.COORDINATOR_NAME, Role.ADMIN_NAME})
    public List<LaboratoryService.LaboratoryView> laboratories() {
        return laboratories.listAll();
    }

    @POST
    @Path("/laboratories")
    @RolesAllowed({Role.COORDINATOR_NAME, Role.ADMIN_NAME})
    public LaboratoryService.CreatedLaboratory createLaboratory(@Valid @NotNull LaboratoryService.NewLaboratory laboratory) {
        return laboratories.create(laboratory);
    }

    @GET
    @Path("/laboratories/{laboratoryId}")
    @Authenticated
    public LaboratoryService.LaboratoryView laboratory(@PathParam("laboratoryId") long laboratoryId) {
        return laboratories.get(laboratoryId);
    }

    // ---- my laboratory (lab manager) --------------------------------------------------------------------------

    @GET
    @Path("/my-laboratory/members")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public List<AccountService.UserView> members() {
        return accounts.listOwnLaboratoryMembers();
    }

    @POST
    @Path("/my-laboratory/members")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public AccountService.UserWithLink createMember(@Valid @NotNull NewMember member) {
        return accounts.createOwnLaboratoryMember(member.username(), member.displayName(), member.email(), member.role());
    }

    @POST
    @Path("/my-laboratory/members/{userId}/disable")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public AccountService.UserView disableMember(@PathParam("userId") long userId) {
        return accounts.setOwnLaboratoryMemberEnabled(userId, false);
    }

    @POST
    @Path("/my-laboratory/members/{userId}/enable")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public AccountService.UserView enableMember(@PathParam("userId") long userId) {
        return accounts.setOwnLaboratoryMemberEnabled(userId, true);
    }

    @POST
    @Path("/my-laboratory/members/{userId}/password-link")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public AccountService.UserWithLink memberPasswordLink(@PathParam("userId") long userId) {
        return accounts.startOwnLaboratoryMemberReset(userId);
    }

    @GET
    @Path("/my-laboratory/tokens")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public List<ApiTokenService.TokenView> tokens() {
        return tokens.listOwn();
    }

    @POST
    @Path("/my-laboratory/tokens")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public ApiTokenService.CreatedToken createToken(@Valid @NotNull NewToken token) {
        return tokens.create(token.name(), ApiTokenScope.parse(token.scope()), token.expiresAt());
    }

    @POST
    @Path("/my-laboratory/tokens/{tokenId}/revoke")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public ApiTokenService.TokenView revokeToken(@PathParam("tokenId") long tokenId) {
        return tokens.revoke(tokenId);
    }

    @GET
    @Path("/my-laboratory/auditor-grants")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public List<AuditorGrantService.GrantView> grants() {
        return grants.listOwnLaboratory();
    }

    @POST
    @Path("/my-laboratory/auditor-grants")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public AuditorGrantService.GrantView grant(@Valid @NotNull NewGrant grant) {
        return grants.grant(grant.auditorUsername(), grant.validUntil());
    }

    @POST
    @Path("/my-laboratory/auditor-grants/{grantId}/revoke")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public AuditorGrantService.GrantView revokeGrant(@PathParam("grantId") long grantId) {
        return grants.revoke(grantId);
    }

    @POST
    @Path("/my-laboratory/auditor-grants/{grantId}/extend")
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public AuditorGrantService.GrantView extendGrant(@PathParam("grantId") long grantId, GrantExtension extension) {
        // the grant is looked up before the body is read: another laboratory's grant is "not found"
        return grants.extend(grantId, extension == null ? null : extension.validUntil());
    }

    // ---- auditors ------------------------------------------------------------------------------------------------

    @GET
    @Path("/auditor/laboratories")
    @RolesAllowed(Role.AUDITOR_NAME)
    public List<AuditorGrantService.GrantedLaboratory> grantedLaboratories() {
        return grants.listGrantedToMe();
    }
}
