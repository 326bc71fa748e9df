package org.roundtable.account;

import java.lang.annotation.ElementType;
import java.lang.annotation.Retention;
import java.lang.annotation.RetentionPolicy;
import java.lang.annotation.Target;

/**
 * What a laboratory's API token may do: submit results (and read what it submitted) or read the laboratory's
 * scores. A token has one scope; endpoints that need one are marked with {@link Required}, and a token with the
 * other scope is refused there (403). Signed-in people are never limited by it.
 */
public enum ApiTokenScope {
    SUBMIT,
    READ_SCORES;

    /** Marks an endpoint (or a resource class) that an API token may call only with this scope. */
    @Retention(RetentionPolicy.RUNTIME)
    @Target({ElementType.METHOD, ElementType.TYPE})
    public @interface Required {
        ApiTokenScope value();
    }

    /** The scope named in a form or request, {@link #SUBMIT} when none is named. */
    public static ApiTokenScope parse(String name) {
        if (name == null || name.isBlank()) {
            return SUBMIT;
        }
        try {
            return valueOf(name.strip().toUpperCase(java.util.Locale.ROOT).replace('-', '_'));
        } catch (IllegalArgumentException e) {
            throw new org.roundtable.platform.DomainException.BadRequest(
                    "A token either submits results or reads scores.");
        }
    }
}
