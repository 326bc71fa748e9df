package org.roundtable.notice;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import io.quarkus.security.Authenticated;
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
import org.roundtable.account.CurrentUser;
import org.roundtable.account.Role;
import org.roundtable.platform.DomainException;

import java.net.URI;
import java.util.List;

/**
 * Pages of the notices: a person's notice list (marked read one by one or all at once, each leading to its page),
 * their e-mail choices (a section of the account page), the coordinator's reminder form, and the admin's outbox.
 */
@Path("/")
@Produces(MediaType.TEXT_HTML)
public class NoticePages {

    @CheckedTemplate(basePath = "notice")
    static class Templates {
        static native TemplateInstance list(NoticeService.NoticePage page, String message);

        static native TemplateInstance outbox(List<NoticeService.OutboxMessage> messages, int pageNumber,
                                              boolean hasNext, boolean outboxMode);
    }

    private final NoticeService notices;
    private final NoticeMails mails;
    private final CurrentUser currentUser;

    public NoticePages(NoticeService notices, NoticeMails mails, CurrentUser currentUser) {
        this.notices = notices;
        this.mails = mails;
        this.currentUser = currentUser;
    }

    @GET
    @Path("notices")
    @Authenticated
    public TemplateInstance list(@QueryParam("page") Integer page) {
        return Templates.list(notices.page(person(), page == null ? 1 : page), null);
    }

    @POST
    @Path("notices/{noticeId}/read")
    @Authenticated
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response read(@PathParam("noticeId") long noticeId) {
        return Response.seeOther(URI.create(notices.markRead(person(), noticeId))).build();
    }

    @POST
    @Path("notices/read-all")
    @Authenticated
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public TemplateInstance readAll() {
        long user = person();
        int marked = notices.markAllRead(user);
        return Templates.list(notices.page(user, 1), marked + " notice(s) marked read.");
    }

    @POST
    @Path("notices/choices")
    @Authenticated
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response choices(@FormParam("byEmail") List<String> byEmail) {
        notices.setPreferences(person(), byEmail, currentUser.actor());
        return Response.seeOther(URI.create("/account#notice-choices")).build();
    }

    @POST
    @Path("rounds/{roundId}/reminders")
    @RolesAllowed(Role.COORDINATOR_NAME)
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response remind(@PathParam("roundId") long roundId, @FormParam("message") String message,
                           @FormParam("everyone") boolean everyone) {
        notices.remind(roundId, message, !everyone, currentUser.actor());
        return Response.seeOther(URI.create("/rounds/" + roundId)).build();
    }

    @GET
    @Path("admin/outbox")
    @RolesAllowed(Role.ADMIN_NAME)
    public TemplateInstance outbox(@QueryParam("page") Integer page) {
        int p = page == null ? 1 : Math.max(1, page);
        List<NoticeService.OutboxMessage> messages = notices.outbox(person(), p);
        boolean hasNext = messages.size() > NoticeService.PAGE_SIZE;
        return Templates.outbox(hasNext ? messages.subList(0, NoticeService.PAGE_SIZE) : messages, p, hasNext,
                mails.outbox());
    }

    private long person() {
        if (currentUser.viaApiToken()) {
            throw new DomainException.Forbidden();
        }
        return currentUser.requireUserId();
    }
}
