package org.roundtable.notice;

import jakarta.enterprise.context.RequestScoped;
import jakarta.inject.Named;
import org.roundtable.account.CurrentUser;

import java.util.List;

/**
 * For templates: the reader's unread count in the header ({@code tags/noticeCount.html}) and their e-mail choices
 * on the account page. Empty for anonymous callers and API tokens (notices belong to people).
 */
@RequestScoped
@Named("notices")
public class NoticeHeader {

    private final CurrentUser currentUser;
    private final NoticeService notices;
    private Long unread;

    public NoticeHeader(CurrentUser currentUser, NoticeService notices) {
        this.currentUser = currentUser;
        this.notices = notices;
    }

    /**
     * Whether the reader is a person signed in (not an API token), who has notices. Not on an I/O thread: pages
     * rendered there (a refusal before the request reached a worker) cannot ask the database, so they show no count.
     */
    public boolean available() {
        return !io.vertx.core.Context.isOnEventLoopThread() && currentUser.signedIn() && !currentUser.viaApiToken() && currentUser.userId().isPresent();
    }

    public long unreadCount() {
        if (!available()) {
            return 0;
        }
        if (unread == null) {
            unread = notices.unreadCount(currentUser.userId().orElseThrow());
        }
        return unread;
    }

    public List<NoticeService.Preference> preferences() {
        return available() ? notices.preferences(currentUser.userId().orElseThrow()) : List.of();
    }
}
