package org.roundtable.testing;

import io.quarkus.test.common.TestResourceScope;
import io.quarkus.test.common.WithTestResource;

/**
 * Declares the PostgreSQL test resource for every Quarkus test in the module (global scope), so that
 * all tests share one application start and one database server.
 */
@WithTestResource(value = PostgresTestResource.class, scope = TestResourceScope.GLOBAL)
public final class DatabaseTestConfig {
    private DatabaseTestConfig() {
    }
}
