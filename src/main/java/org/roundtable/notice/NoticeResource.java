package org.roundtable.notice;

import io.quarkus.security.Authenticated;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.QueryParam;
import jakarta.ws.rs.core.MediaType;
import org.roundtable.account.CurrentUser;
import org.roundtable.platform.DomainException;

import java.util.Map;

/** JSON API of the caller's notices: the list and marking read (a coordinator's reminder: {@link ReminderResource}). */
@Path("/api/v1/notices")
@Produces(MediaType.APPLICATION_JSON)
public class NoticeResource {

    private final NoticeService notices;
    private final CurrentUser currentUser;

    public NoticeResource(NoticeService notices, CurrentUser currentUser) {
        this.notices = notices;
        this.currentUser = currentUser;
    }

    @GET
    @Authenticated
    public NoticeService.NoticePage list(@QueryParam("page") Integer page) {
        return notices.page(person(), page == null ? 1 : page);
    }

    @POST
    @Path("{noticeId}/read")
    @Authenticated
    public Map<String, String> read(@PathParam("noticeId") long noticeId) {
        return Map.of("link", notices.markRead(person(), noticeId));
    }

    private long person() {
        if (currentUser.viaApiToken()) {
            throw new DomainException.Forbidden();
        }
        return currentUser.requireUserId();
    }
}
