package org.roundtable.testing;

import io.quarkus.test.common.QuarkusTestResourceLifecycleManager;
import io.zonky.test.db.postgres.embedded.EmbeddedPostgres;
import org.testcontainers.DockerClientFactory;
import org.testcontainers.postgresql.PostgreSQLContainer;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.Map;

/**
 * The real PostgreSQL every Quarkus test runs against, chosen in this order:
 * <ol>
 *   <li>{@code TEST_DB_URL} (with {@code TEST_DB_USER}, {@code TEST_DB_PASSWORD}): a server you provide;</li>
 *   <li>Testcontainers PostgreSQL 17 when a Docker engine answers (set {@code TEST_SKIP_DOCKER=true} to skip
 *       the probe);</li>
 *   <li>an embedded PostgreSQL 17 in a temporary directory on a random port.</li>
 * </ol>
 * One server serves the whole test JVM; tests create their own data and never depend on order.
 */
public class PostgresTestResource implements QuarkusTestResourceLifecycleManager {

    private static Map<String, String> properties;
    private static AutoCloseable running;

    @Override
    public synchronized Map<String, String> start() {
        if (properties == null) {
            properties = choose();
            Runtime.getRuntime().addShutdownHook(new Thread(PostgresTestResource::closeQuietly, "test-postgres-stop"));
        }
        return properties;
    }

    @Override
    public void stop() {
        // kept for the whole JVM: several test profiles may restart Quarkus against the same server
    }

    /** The JDBC properties of the chosen server, for tests that connect outside Quarkus. */
    public static synchronized Map<String, String> connection() {
        if (properties == null) {
            properties = choose();
        }
        return properties;
    }

    private static Map<String, String> choose() {
        String url = System.getenv("TEST_DB_URL");
        if (url != null && !url.isBlank()) {
            return jdbc(url, envOr("TEST_DB_USER", "postgres"), envOr("TEST_DB_PASSWORD", ""), "TEST_DB_URL");
        }
        if (!"true".equalsIgnoreCase(System.getenv("TEST_SKIP_DOCKER")) && dockerAvailable()) {
            PostgreSQLContainer container = new PostgreSQLContainer("postgres:17");
            container.start();
            running = container;
            return jdbc(container.getJdbcUrl(), container.getUsername(), container.getPassword(), "Testcontainers");
        }
        try {
            EmbeddedPostgres embedded = EmbeddedPostgres.builder().start();
            running = embedded;
            return jdbc(embedded.getJdbcUrl("postgres", "postgres"), "postgres", "", "embedded");
        } catch (IOException e) {
            throw new UncheckedIOException("Could not start an embedded PostgreSQL for the tests", e);
        }
    }

    private static boolean dockerAvailable() {
        try {
            return DockerClientFactory.instance().isDockerAvailable();
        } catch (RuntimeException | LinkageError e) {
            return false;
        }
    }

    private static Map<String, String> jdbc(String url, String user, String password, String origin) {
        System.err.println("Tests use PostgreSQL from " + origin + ": " + url.replaceAll("password=[^&]*", "password=***"));
        return Map.of(
                "quarkus.datasource.jdbc.url", url,
                "quarkus.datasource.username", user,
                "quarkus.datasource.password", password);
    }

    private static String envOr(String name, String fallback) {
        String value = System.getenv(name);
        return value == null || value.isBlank() ? fallback : value;
    }

    private static void closeQuietly() {
        try {
            if (running != null) {
                running.close();
            }
        } catch (Exception ignored) {
            // the JVM is exiting
        }
    }
}
