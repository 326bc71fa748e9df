package org.roundtable.account;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import io.quarkus.security.Authenticated;
import io.vertx.core.http.HttpServerRequest;
import jakarta.annotation.security.PermitAll;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.FormParam;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.QueryParam;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.roundtable.platform.DomainException;

import java.net.URI;

/** Sign-in, sign-out, setting a password with a one-time link, and changing one's own password. */
@Path("/")
@Produces(MediaType.TEXT_HTML)
public class SignInPage {

    @CheckedTemplate(basePath = "account")
    static class Templates {
        static native TemplateInstance login(String error, String message, String next, String username);

        static native TemplateInstance passwordSet(String error, boolean done, String link);

        static native TemplateInstance account(String error, String message);

        static native TemplateInstance loginCode(String error, String next);

        static native TemplateInstance twoStep(String status, TwoStepService.Enrolment enrolment,
                                               java.util.List<String> recoveryCodes, String error, boolean required);
    }

    private final SignInService signIn;
    private final SessionService sessions;
    private final SessionCookies cookies;
    private final CurrentUser currentUser;
    private final AccountService accounts;
    private final TwoStepService twoStep;
    private final TwoStepEnforcement enforcement;
    private final HttpServerRequest request;

    public SignInPage(SignInService signIn, SessionService sessions, SessionCookies cookies, CurrentUser currentUser,
                      AccountService accounts, TwoStepService twoStep, TwoStepEnforcement enforcement,
                      HttpServerRequest request) {
        this.signIn = signIn;
        this.sessions = sessions;
        this.cookies = cookies;
        this.currentUser = currentUser;
        this.accounts = accounts;
        this.twoStep = twoStep;
        this.enforcement = enforcement;
        this.request = request;
    }

    @GET
    @Path("login")
    @PermitAll
    public TemplateInstance loginForm(@QueryParam("next") String next) {
        return Templates.login(null, null, safeNext(next), null);
    }

    @POST
    @Path("login")
    @PermitAll
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response login(@FormParam("username") String username, @FormParam("password") String password,
                          @FormParam("next") String next) {
        try {
            SignInService.SignInResult result = signIn.signIn(username, password, remoteAddress());
            if (result.secondStepNeeded()) {
                String codePage = "/login/code" + (safeNext(next) == null ? ""
                        : "?next=" + java.net.URLEncoder.encode(safeNext(next), java.nio.charset.StandardCharsets.UTF_8));
                return Response.seeOther(URI.create(codePage)).cookie(cookies.secondStep(result.token())).build();
            }
            // the new session is looked up again on the next request, with its role read from the database
            return Response.seeOther(URI.create(safeNext(next) == null ? "/home" : safeNext(next)))
                    .cookie(cookies.session(result.token())).build();
        } catch (SignInService.SignInRefused refused) {
            return Response.status(refused.status())
                    .entity(Templates.login(refused.detail(), null, safeNext(next), username)).build();
        }
    }

    @GET
    @Path("login/code")
    @PermitAll
    public TemplateInstance codeForm(@QueryParam("next") String next) {
        return Templates.loginCode(null, safeNext(next));
    }

    @POST
    @Path("login/code")
    @PermitAll
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response code(@FormParam("code") String code, @FormParam("next") String next) {
        io.vertx.core.http.Cookie awaiting = request.getCookie(cookies.secondStepCookieName());
        try {
            String token = signIn.completeSecondStep(awaiting == null ? null : awaiting.getValue(), code, remoteAddress());
            return Response.seeOther(URI.create(safeNext(next) == null ? "/home" : safeNext(next)))
                    .cookie(cookies.session(token), cookies.clearSecondStep()).build();
        } catch (SignInService.SignInRefused refused) {
            return Response.status(refused.status()).entity(Templates.loginCode(refused.detail(), safeNext(next))).build();
        }
    }

    @POST
    @Path("logout")
    @Authenticated
    public Response logout() {
        currentUser.sessionHash().ifPresent(hash -> sessions.end(hash, "signed-out"));
        SecurityLog.event("sign-out", currentUser.username(), "");
        return Response.seeOther(URI.create("/login")).cookie(cookies.clearSession()).build();
    }

    /** Where a signed-in user starts: the page of their role. */
    @GET
    @Path("home")
    @Authenticated
    public Response home() {
        String target = currentUser.role().map(role -> switch (role) {
            case ADMIN -> "/admin/users";
            case COORDINATOR -> "/coordinator";
            case LAB_MANAGER -> "/laboratory";
            case AUDITOR -> "/auditor";
            case LAB_MEMBER -> "/laboratory";
        }).orElse("/");
        return Response.seeOther(URI.create(target)).build();
    }

    @GET
    @Path("password/set")
    @PermitAll
    public TemplateInstance passwordForm() {
        return Templates.passwordSet(null, false, null);
    }

    @POST
    @Path("password/set")
    @PermitAll
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response setPassword(@FormParam("link") String link, @FormParam("password") String password) {
        try {
            accounts.setPasswordWithLink(link, password);
            return Response.ok(Templates.passwordSet(null, true, null)).build();
        } catch (DomainException e) {
            return Response.status(e.status()).entity(Templates.passwordSet(e.detail(), false, link)).build();
        }
    }

    @GET
    @Path("account")
    @Authenticated
    public TemplateInstance account() {
        return Templates.account(null, null);
    }

    @POST
    @Path("account/password")
    @Authenticated
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response changePassword(@FormParam("currentPassword") String current, @FormParam("newPassword") String next) {
        if (currentUser.viaApiToken()) {
            throw new DomainException.Forbidden();
        }
        try {
            accounts.changeOwnPassword(current, next);
            return Response.seeOther(URI.create("/login")).cookie(cookies.clearSession()).build();
        } catch (DomainException e) {
            return Response.status(e.status()).entity(Templates.account(e.detail(), null)).build();
        }
    }

    @POST
    @Path("account/time-zone")
    @Authenticated
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response setTimeZone(@FormParam("timeZone") String zone) {
        if (currentUser.viaApiToken()) {
            throw new DomainException.Forbidden();
        }
        try {
            accounts.setOwnTimeZone(zone);
            return Response.ok(Templates.account(null, zone == null || zone.isBlank()
                    ? "Times are now shown in the installation's zone." : "Times are now shown in " + zone.strip() + ".")).build();
        } catch (DomainException e) {
            return Response.status(e.status()).entity(Templates.account(e.detail(), null)).build();
        }
    }

    // ---- two-step sign-in --------------------------------------------------------------------------------

    @GET
    @Path("account/two-step")
    @Authenticated
    public TemplateInstance twoStepPage() {
        return Templates.twoStep(twoStep.status(currentUser.requireUserId()).name(), null, null, null, twoStepRequired());
    }

    @POST
    @Path("account/two-step/start")
    @Authenticated
    public TemplateInstance startTwoStep() {
        return Templates.twoStep(TwoStepService.Status.AWAITING_CONFIRMATION.name(), twoStep.start(), null, null,
                twoStepRequired());
    }

    @POST
    @Path("account/two-step/confirm")
    @Authenticated
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response confirmTwoStep(@FormParam("code") String code) {
        try {
            java.util.List<String> recovery = twoStep.confirm(code);
            return Response.ok(Templates.twoStep(TwoStepService.Status.ON.name(), null, recovery, null, false)).build();
        } catch (DomainException e) {
            return Response.status(e.status()).entity(Templates.twoStep(
                    twoStep.status(currentUser.requireUserId()).name(), null, null, e.detail(), twoStepRequired())).build();
        }
    }

    private boolean twoStepRequired() {
        return enforcement.requiredFor(currentUser) && !enforcement.satisfiedBy(currentUser);
    }

    private String remoteAddress() {
        return request.remoteAddress() == null ? null : request.remoteAddress().hostAddress();
    }

    /** Only local paths are followed after sign-in (no open redirect). */
    static String safeNext(String next) {
        if (next == null || next.isBlank() || !next.startsWith("/") || next.startsWith("//") || next.contains("\\")
                || next.length() > 300) {
            return null;
        }
        return next;
    }
}
