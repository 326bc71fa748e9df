package org.roundtable.platform;

/**
 * A failure the user can act on, with the HTTP status it maps to. Feature packages throw the named
 * subclasses; the web error mapper turns them into a problem body or an error page in one place.
 */
public class DomainException extends RuntimeException {

    private final int status;
    private final String title;
    private final java.util.List<Detail> details;

    public DomainException(int status, String title, String detail) {
        this(status, title, detail, java.util.List.of());
    }

    public DomainException(int status, String title, String detail, java.util.List<Detail> details) {
        super(detail);
        this.status = status;
        this.title = title;
        this.details = java.util.List.copyOf(details);
    }

    /**
     * One specific problem behind the failure, e.g. a bad cell of an upload: row (1 = header, null where not
     * applicable), column or field, the offending value, a stable key and a plain message.
     */
    public record Detail(Integer row, String column, String value, String key, String message) {
    }

    public java.util.List<Detail> details() {
        return details;
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

        /** With the specific problems behind it (e.g. the plan entry and field that are wrong). */
        public BadRequest(String detail, java.util.List<Detail> details) {
            super(400, "Invalid request", detail, details);
        }
    }

    /** The data is well formed but cannot be accepted. */
    public static class Unprocessable extends DomainException {
        public Unprocessable(String detail) {
            super(422, "Cannot be accepted", detail);
        }

        public Unprocessable(String detail, java.util.List<Detail> details) {
            super(422, "Cannot be accepted", detail, details);
        }
    }

    /** The caller is known but not allowed to do this. */
    public static class Forbidden extends DomainException {
        public Forbidden() {
            super(403, "Not allowed", "You are not allowed to do this.");
        }
    }
}
