package org.roundtable.account;

/** Names of the attributes Roundtable puts on a {@code SecurityIdentity}. */
public final class IdentityAttributes {
    public static final String USER_ID = "roundtable.userId";
    public static final String LABORATORY_ID = "roundtable.laboratoryId";
    public static final String DISPLAY_NAME = "roundtable.displayName";
    public static final String SESSION_HASH = "roundtable.sessionHash";
    public static final String TWO_STEP_ON = "roundtable.twoStepOn";
    public static final String TOKEN_ID = "roundtable.tokenId";
    public static final String TOKEN_SCOPE = "roundtable.tokenScope";
    public static final String METHOD = "roundtable.method";
    public static final String METHOD_SESSION = "session";
    public static final String METHOD_TOKEN = "token";

    private IdentityAttributes() {
    }
}
