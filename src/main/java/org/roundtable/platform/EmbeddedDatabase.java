package org.roundtable.platform;

import io.zonky.test.db.postgres.embedded.EmbeddedPostgres;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;

/**
 * Starts the embedded PostgreSQL that serves when no database URL is configured.
 *
 * <p>Data lives in {@code ROUNDTABLE_DATA_DIR/pg} (default {@code data/pg} under the working directory)
 * and survives restarts. The server listens on {@code 127.0.0.1:ROUNDTABLE_DB_PORT} (default 5488, so it
 * never collides with a system PostgreSQL on 5432). The same migrations and the same restricted
 * application role are used as with an external server.
 */
public final class EmbeddedDatabase {

    public static final String DATA_DIR_VARIABLE = "ROUNDTABLE_DATA_DIR";
    public static final String PORT_VARIABLE = "ROUNDTABLE_DB_PORT";
    static final int DEFAULT_PORT = 5488;

    private EmbeddedDatabase() {
    }

    /** True when the operator configured a database by environment or system property. */
    public static boolean databaseUrlConfigured() {
        return notBlank(System.getenv("DB_URL"))
                || notBlank(System.getenv("QUARKUS_DATASOURCE_JDBC_URL"))
                || notBlank(System.getProperty("quarkus.datasource.jdbc.url"));
    }

    /**
     * Starts PostgreSQL for the server process, stops it when the JVM exits, and points both
     * datasources at it through system properties (which outrank application.properties).
     */
    public static EmbeddedPostgres startForServer() {
        Path dataDir = dataDirectory().resolve("pg");
        int port = Integer.parseInt(envOrDefault(PORT_VARIABLE, Integer.toString(DEFAULT_PORT)));
        long started = System.nanoTime();
        EmbeddedPostgres postgres = start(dataDir, port);
        System.err.printf("Embedded PostgreSQL 17 on 127.0.0.1:%d, data in %s (%.1f s)%n",
                port, dataDir.toAbsolutePath(), (System.nanoTime() - started) / 1e9);
        String url = postgres.getJdbcUrl("postgres", "postgres");
        System.setProperty("quarkus.datasource.jdbc.url", url);
        System.setProperty("quarkus.datasource.username", "postgres");
        System.setProperty("quarkus.datasource.password", "");
        return postgres;
    }

    /**
     * Starts (or restarts on an existing data directory) an embedded server. The server's own
     * shutdown hook stops it when the JVM exits, including after Ctrl-C.
     */
    public static EmbeddedPostgres start(Path dataDir, int port) {
        try {
            Files.createDirectories(dataDir.getParent());
            return EmbeddedPostgres.builder()
                    .setDataDirectory(dataDir)
                    .setCleanDataDirectory(false)
                    .setPort(port)
                    .setRegisterShutdownHook(true)
                    .setPGStartupWait(Duration.ofSeconds(60))
                    // The library starts PostgreSQL tuned for throw-away test data (-F, synchronous_commit=off).
                    // The server keeps real data: restore PostgreSQL's durable defaults explicitly.
                    .setServerConfig("fsync", "on")
                    .setServerConfig("synchronous_commit", "on")
                    .setServerConfig("full_page_writes", "on")
                    .setServerConfig("listen_addresses", "127.0.0.1")
                    .setServerConfig("max_connections", "100")
                    .start();
        } catch (IOException e) {
            throw new UncheckedIOException("Could not start the embedded PostgreSQL in " + dataDir, e);
        }
    }

    public static Path dataDirectory() {
        return Path.of(envOrDefault(DATA_DIR_VARIABLE, "data"));
    }

    private static String envOrDefault(String name, String fallback) {
        String value = System.getenv(name);
        return notBlank(value) ? value : fallback;
    }

    private static boolean notBlank(String value) {
        return value != null && !value.isBlank();
    }
}
