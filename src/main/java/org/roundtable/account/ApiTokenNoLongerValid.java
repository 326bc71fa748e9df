package org.roundtable.account;

/**
 * A presented API token that was issued here but was revoked or has expired: the 401 says the token is no longer
 * valid (an unknown token keeps the generic 401, so a guess learns nothing). Carried as the cause of the
 * authentication failure (which Quarkus does not let us extend).
 */
public class ApiTokenNoLongerValid extends RuntimeException {

    /** The detail of the 401 problem body. */
    public static final String DETAIL = "This API token is no longer valid: it was revoked or has expired. "
            + "Ask your laboratory's manager for a new token.";

    public ApiTokenNoLongerValid(boolean revoked) {
        super(revoked ? "revoked API token" : "expired API token");
    }
}
