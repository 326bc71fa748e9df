package org.roundtable.testing;

import io.quarkus.test.common.TestResourceScope;
import io.quarkus.test.common.WithTestResource;

/** Declares the test SMTP port for every Quarkus test (global scope, like {@link DatabaseTestConfig}). */
@WithTestResource(value = SmtpTestPort.class, scope = TestResourceScope.GLOBAL)
public final class MailTestConfig {
    private MailTestConfig() {
    }
}
