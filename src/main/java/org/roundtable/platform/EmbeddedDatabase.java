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
     * An orphaned PostgreSQL left on the data folder by a killed server is stopped first; the superuser gets a
     * generated password (kept in {@code ROUNDTABLE_DATA_DIR/db.password}, mode 600) and only password sign-in
     * from 127.0.0.1 is allowed ({@code pg_hba.conf}); older data folders are upgraded to this at start. A watch
     * thread restarts the database if it dies.
     */
    public static EmbeddedPostgres startForServer() {
        Path dataDir = dataDirectory().resolve("pg");
        int port = Integer.parseInt(envOrDefault(PORT_VARIABLE, Integer.toString(DEFAULT_PORT)));
        long started = System.nanoTime();
        stopOrphan(dataDir);
        String password = password(dataDirectory());
        EmbeddedPostgres postgres = start(dataDir, port, password);
        secure(postgres, dataDir, password);
        System.err.printf("Embedded PostgreSQL 17 on 127.0.0.1:%d, data in %s (%.1f s)%n",
                port, dataDir.toAbsolutePath(), (System.nanoTime() - started) / 1e9);
        // 127.0.0.1, not "localhost": pg_hba.conf admits only the IPv4 loopback address
        String url = postgres.getJdbcUrl("postgres", "postgres").replace("//localhost:", "//127.0.0.1:");
        System.setProperty("quarkus.datasource.jdbc.url", url);
        System.setProperty("quarkus.datasource.username", "postgres");
        System.setProperty("quarkus.datasource.password", password);
        watch(postgres, dataDir, port, password);
        return postgres;
    }

    /** Exit status when the embedded database cannot be brought back: {@code rounds-demo/start.sh} starts again. */
    public static final int EXIT_DATABASE_LOST = 3;

    static final String HBA = """
            # Written by Roundtable: only password sign-in (SCRAM) from this machine's loopback address.
            host all all 127.0.0.1/32 scram-sha-256
            """;

    /**
     * The superuser's password, generated once into {@code db.password} in the data folder (owner read/write only).
     */
    static String password(Path dataFolder) {
        Path file = dataFolder.resolve("db.password");
        try {
            Files.createDirectories(dataFolder);
            if (Files.isRegularFile(file) && Files.size(file) > 0) {
                return Files.readString(file).strip();
            }
            byte[] random = new byte[24];
            new java.security.SecureRandom().nextBytes(random);
            String password = java.util.HexFormat.of().formatHex(random);
            Path temp = dataFolder.resolve("db.password.new");
            Files.deleteIfExists(temp);
            Files.createFile(temp, java.nio.file.attribute.PosixFilePermissions.asFileAttribute(
                    java.nio.file.attribute.PosixFilePermissions.fromString("rw-------")));
            Files.writeString(temp, password + "\n");
            Files.move(temp, file, java.nio.file.StandardCopyOption.ATOMIC_MOVE);
            return password;
        } catch (IOException e) {
            throw new UncheckedIOException("Could not keep the database password in " + file, e);
        }
    }

    /**
     * Sets the superuser's password and restricts {@code pg_hba.conf} to SCRAM from 127.0.0.1, then reloads the
     * configuration. Runs at every start, so a data folder made by an older version (trust sign-in) is upgraded.
     */
    static void secure(EmbeddedPostgres postgres, Path dataDir, String password) {
        try (java.sql.Connection c = postgres.getPostgresDatabase().getConnection();
             java.sql.Statement s = c.createStatement()) {
            s.execute("SET password_encryption = 'scram-sha-256'");
            s.execute("ALTER ROLE postgres PASSWORD '" + password.replace("'", "''") + "'");
            Path hba = dataDir.resolve("pg_hba.conf");
            if (!Files.isRegularFile(hba) || !Files.readString(hba).equals(HBA)) {
                Files.writeString(hba, HBA);
                s.execute("SELECT pg_reload_conf()");
            }
        } catch (java.sql.SQLException | IOException e) {
            throw new IllegalStateException("Could not secure the embedded PostgreSQL in " + dataDir, e);
        }
    }

    /**
     * Stops a PostgreSQL still running on {@code dataDir} from a server that was killed (its exit hook never ran):
     * a fast shutdown (SIGINT), then, after 20 s, SIGKILL.
     */
    static void stopOrphan(Path dataDir) {
        java.util.OptionalLong pid = postmasterPid(dataDir);
        if (pid.isEmpty()) {
            return;
        }
        java.util.Optional<ProcessHandle> process = ProcessHandle.of(pid.getAsLong())
                .filter(ProcessHandle::isAlive)
                .filter(p -> p.info().command().map(cmd -> cmd.contains("postgres")).orElse(false));
        if (process.isEmpty()) {
            return;
        }
        System.err.printf("Stopping the PostgreSQL (pid %d) left running on %s by an earlier server%n",
                pid.getAsLong(), dataDir.toAbsolutePath());
        try {
            new ProcessBuilder("kill", "-INT", Long.toString(pid.getAsLong())).inheritIO().start().waitFor();
            process.get().onExit().get(20, java.util.concurrent.TimeUnit.SECONDS);
        } catch (java.util.concurrent.TimeoutException | java.util.concurrent.ExecutionException | IOException e) {
            process.get().destroyForcibly();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    /** The postmaster's pid from {@code postmaster.pid}, if the file is there. */
    static java.util.OptionalLong postmasterPid(Path dataDir) {
        try {
            Path file = dataDir.resolve("postmaster.pid");
            if (!Files.isRegularFile(file)) {
                return java.util.OptionalLong.empty();
            }
            String first = Files.readAllLines(file).stream().findFirst().orElse("").strip();
            return first.matches("\\d+") ? java.util.OptionalLong.of(Long.parseLong(first)) : java.util.OptionalLong.empty();
        } catch (IOException e) {
            return java.util.OptionalLong.empty();
        }
    }

    /**
     * Watches the postmaster every second; when it has died, starts PostgreSQL again on the same folder and port
     * (the application's pool recovers by itself). If it cannot be started within 25 s, the server exits with
     * {@link #EXIT_DATABASE_LOST} and a message, and {@code start.sh} starts everything again.
     */
    static AutoCloseable watch(EmbeddedPostgres running, Path dataDir, int port, String password) {
        java.util.concurrent.atomic.AtomicReference<EmbeddedPostgres> current = new java.util.concurrent.atomic.AtomicReference<>(running);
        java.util.concurrent.atomic.AtomicBoolean stopping = new java.util.concurrent.atomic.AtomicBoolean();
        Runtime.getRuntime().addShutdownHook(new Thread(() -> stopping.set(true), "embedded-postgres-watch-stop"));
        Thread watcher = new Thread(() -> {
            while (!stopping.get()) {
                try {
                    Thread.sleep(1000);
                } catch (InterruptedException e) {
                    return;
                }
                java.util.OptionalLong pid = postmasterPid(dataDir);
                boolean alive = pid.isPresent() && ProcessHandle.of(pid.getAsLong()).map(ProcessHandle::isAlive).orElse(false);
                if (alive || stopping.get()) {
                    continue; // the exit hooks stop the database on purpose
                }
                System.err.println("The embedded PostgreSQL has stopped; starting it again");
                try {
                    current.get().close(); // releases the library's lock on the data folder
                } catch (IOException | RuntimeException e) {
                    // it is gone already: nothing to stop
                }
                long until = System.nanoTime() + Duration.ofSeconds(25).toNanos();
                boolean restarted = false;
                while (!restarted && System.nanoTime() < until) {
                    try {
                        current.set(start(dataDir, port, password));
                        restarted = true;
                        System.err.println("The embedded PostgreSQL is running again");
                    } catch (RuntimeException e) {
                        // backends of the dead postmaster may still hold its shared memory: try again shortly
                        try {
                            Thread.sleep(1000);
                        } catch (InterruptedException interrupted) {
                            return;
                        }
                    }
                }
                if (!restarted) {
                    System.err.println("The embedded PostgreSQL could not be started again within 25 s; the server"
                            + " stops now (exit status " + EXIT_DATABASE_LOST + ") so that it can be started afresh.");
                    Runtime.getRuntime().halt(EXIT_DATABASE_LOST);
                }
            }
        }, "embedded-postgres-watch");
        watcher.setDaemon(true);
        watcher.start();
        return () -> stopping.set(true);
    }

    /**
     * Starts (or restarts on an existing data directory) an embedded server. The server's own
     * shutdown hook stops it when the JVM exits, including after Ctrl-C.
     */
    public static EmbeddedPostgres start(Path dataDir, int port) {
        return start(dataDir, port, null);
    }

    /** As {@link #start(Path, int)}, connecting (for the readiness check) with the superuser's password. */
    public static EmbeddedPostgres start(Path dataDir, int port, String password) {
        try {
            Files.createDirectories(dataDir.getParent());
            EmbeddedPostgres.Builder builder = EmbeddedPostgres.builder()
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
                    .setServerConfig("max_connections", "100");
            if (password != null) {
                builder.setConnectConfig("password", password);
            }
            return builder.start();
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
