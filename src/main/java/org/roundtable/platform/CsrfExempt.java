package org.roundtable.platform;

import java.lang.annotation.ElementType;
import java.lang.annotation.Retention;
import java.lang.annotation.RetentionPolicy;
import java.lang.annotation.Target;

/**
 * Marks a state-changing endpoint that needs no CSRF token because it acts on no one's behalf (for example
 * the public report verification, which reads only). Use sparingly; the authorization matrix lists each one.
 */
@Retention(RetentionPolicy.RUNTIME)
@Target({ElementType.METHOD, ElementType.TYPE})
public @interface CsrfExempt {
}
