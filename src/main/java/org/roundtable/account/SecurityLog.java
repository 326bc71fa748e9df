package org.roundtable.account;

import org.jboss.logging.Logger;

/**
 * Security events for operators (ASVS v5.0.0-16.3.1 to 16.3.3): sign-in and sign-out, failures and
 * throttling, denied requests. Each line carries the actor and the request id (the log format adds UTC time
 * and the id); never passwords, tokens or result values. Values are encoded against log injection.
 */
public final class SecurityLog {

    private static final Logger LOG = Logger.getLogger("roundtable.security");

    private SecurityLog() {
    }

    public static void event(String event, String actor, String detail) {
        LOG.infof("security event=%s actor=%s %s", safe(event), safe(actor), safe(detail));
    }

    public static void denied(String actor, String method, String path, int status) {
        LOG.warnf("security event=denied actor=%s status=%d request=%s %s", safe(actor), status, safe(method), safe(path));
    }

    /** Keeps a log line on one line and free of control characters (ASVS v5.0.0-16.4.1). */
    static String safe(String value) {
        if (value == null) {
            return "-";
        }
        StringBuilder out = new StringBuilder(Math.min(value.length(), 200));
        for (int i = 0; i < value.length() && out.length() < 200; i++) {
            char c = value.charAt(i);
            out.append(Character.isISOControl(c) ? '?' : c);
        }
        return out.toString();
    }
}
