package org.roundtable.platform;

/**
 * A failure the user can act on, with the HTTP status it maps to. Feature packages throw the named
 * subclasses; the web error mapper turns them into a problem body or an error page in one place.
 */
public class DomainException extends RuntimeException {

    private final int status;
    private final String title;

    public DomainException(int status, String title, String detail) {
        super(detail);
        this.status = status;
        this.title = title;
    }

    public int status() {
        return status;
    }

    public String title() {
        return title;
    }

    public String detail() {
        return getMessage();
    }

    /** The object does not exist, or the caller may not know that it exists (same answer for both). */
    public static class NotFound extends DomainException {
        public NotFound(String what) {
            super(404, "Not found", what + " was not found.");
        }
    }

    /** The request contradicts the current state (e.g. an action not allowed in this round state). */
    public static class Conflict extends DomainException {
        public Conflict(String detail) {
            super(409, "Not possible now", detail);
        }
    }

    /** The request is malformed or fails validation. */
    public static class BadRequest extends DomainException {
        public BadRequest(String detail) {
            super(400, "Invalid request", detail);
        }
    }

    /** The data is well formed but cannot be accepted. */
    public static class Unprocessable extends DomainException {
        public Unprocessable(String detail) {
            super(422, "Cannot be accepted", detail);
        }
    }

    /** The caller is known but not allowed to do this. */
    public static class Forbidden extends DomainException {
        public Forbidden() {
            super(403, "Not allowed", "You are not allowed to do this.");
        }
    }
}
