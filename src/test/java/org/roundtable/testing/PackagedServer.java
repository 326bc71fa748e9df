package org.roundtable.testing;

import org.roundtable.platform.Secrets;

import java.io.IOException;
import java.net.ServerSocket;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;

/**
 * The packaged application ({@code target/quarkus-app/quarkus-run.jar}) run as a separate process on loopback, for
 * the failsafe tests ({@code *IT}) and the fault campaign: started with its settings as environment variables,
 * waited for until ready, stopped, or killed with {@code SIGKILL} and started again on the same settings.
 */
public final class PackagedServer implements AutoCloseable {

    /** The session key every instance of one installation shares (sessions and CSRF tokens hold on all). */
    public static final String SESSION_KEY = "packaged-server-test-key-" + Secrets.randomToken(16);

    private static final HttpClient HTTP = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(2)).build();

    private final String name;
    private final Path log;
    private final int port;
    private final Map<String, String> environment = new LinkedHashMap<>();
    private final List<String> jvmOptions = new ArrayList<>();
    private Process process;
    private int starts;

    /**
     * A server named {@code name} (its log is {@code workDir/name-N.log} for its N-th start) on a free port.
     * It listens on 127.0.0.1 only and uses {@link #SESSION_KEY}.
     */
    public PackagedServer(String name, Path workDir) {
        this.name = name;
        this.log = workDir;
        this.port = freePort();
        environment.put("PORT", Integer.toString(port));
        environment.put("QUARKUS_HTTP_HOST", "127.0.0.1");
        environment.put("QUARKUS_HTTP_AUTH_SESSION_ENCRYPTION_KEY", SESSION_KEY);
        environment.put("ROUNDTABLE_SECURE_COOKIES", "false");
        environment.put("ROUNDTABLE_TWO_STEP_REQUIRED_ROLES", "");
        environment.put("ROUNDTABLE_MAIL", "off");
        // the JIT's first tier and the parallel collector: the quickest start on two shared cores
        jvmOptions.addAll(List.of("-XX:TieredStopAtLevel=1", "-XX:+UseParallelGC", "-Duser.timezone=UTC"));
    }

    /** Uses an external PostgreSQL (the application's {@code DB_URL}, {@code DB_USER}, {@code DB_PASSWORD}). */
    public PackagedServer database(String jdbcUrl, String user, String password) {
        environment.put("DB_URL", jdbcUrl.replaceAll("\\?.*$", ""));
        environment.put("DB_USER", user);
        environment.put("DB_PASSWORD", password);
        return this;
    }

    /** An environment variable of the server (a configuration property in its environment-variable spelling). */
    public PackagedServer env(String variable, String value) {
        environment.put(variable, value);
        return this;
    }

    /** Options of the server's JVM, e.g. {@code -Xmx768m}, before the ones given so far. */
    public PackagedServer jvm(String... options) {
        jvmOptions.addAll(0, List.of(options));
        return this;
    }

    /** Exactly these options of the server's JVM, without the quick-start ones (e.g. to run the default collector). */
    public PackagedServer jvmOnly(String... options) {
        jvmOptions.clear();
        jvmOptions.addAll(List.of(options));
        return this;
    }

    /** The packaged jar: {@code -Droundtable.jar=...}, else {@code target/quarkus-app/quarkus-run.jar} here or above. */
    public static Path jar() {
        String configured = System.getProperty("roundtable.jar");
        List<Path> candidates = configured != null ? List.of(Path.of(configured))
                : List.of(Path.of("target/quarkus-app/quarkus-run.jar"), Path.of("../quarkus-app/quarkus-run.jar"),
                Path.of("../target/quarkus-app/quarkus-run.jar"));
        return candidates.stream().filter(Files::isRegularFile).findFirst().map(Path::toAbsolutePath)
                .orElseThrow(() -> new IllegalStateException("package the application first (mvn package): no "
                        + candidates.get(0).toAbsolutePath()));
    }

    public synchronized PackagedServer start() {
        if (process != null && process.isAlive()) {
            throw new IllegalStateException(name + " is running already");
        }
        List<String> command = new ArrayList<>();
        command.add(Path.of(System.getProperty("java.home"), "bin", "java").toString());
        command.addAll(jvmOptions);
        command.add("-jar");
        command.add(jar().toString());
        ProcessBuilder builder = new ProcessBuilder(command);
        builder.environment().putAll(environment);
        starts++;
        builder.redirectErrorStream(true).redirectOutput(logFile().toFile());
        try {
            process = builder.start();
        } catch (IOException e) {
            throw new IllegalStateException("could not start " + name, e);
        }
        return this;
    }

    /** The log of the latest start. */
    public Path logFile() {
        return log.resolve(name + "-" + starts + ".log");
    }

    public int port() {
        return port;
    }

    public long pid() {
        return process.pid();
    }

    public URI uri(String path) {
        return URI.create("http://127.0.0.1:" + port + path);
    }

    public boolean alive() {
        return process != null && process.isAlive();
    }

    /** Whether {@code /q/health/ready} answers 200 now. */
    public boolean ready() {
        try {
            return HTTP.send(HttpRequest.newBuilder(uri("/q/health/ready")).timeout(Duration.ofSeconds(3)).build(),
                    HttpResponse.BodyHandlers.discarding()).statusCode() == 200;
        } catch (IOException e) {
            return false;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return false;
        }
    }

    /** Waits until ready; fails with the log's tail when the process ends or {@code limit} passes first. */
    public PackagedServer awaitReady(Duration limit) throws InterruptedException {
        long until = System.nanoTime() + limit.toNanos();
        while (System.nanoTime() < until) {
            if (ready()) {
                return this;
            }
            if (!alive()) {
                throw new IllegalStateException(name + " exited with " + process.exitValue() + ":\n" + tail());
            }
            Thread.sleep(250);
        }
        throw new IllegalStateException(name + " was not ready within " + limit.toSeconds() + " s:\n" + tail());
    }

    /** {@code kill -9}: the process ends at once, with no shutdown hook (an embedded PostgreSQL is left behind). */
    public void kill() throws InterruptedException {
        if (process != null) {
            process.destroyForcibly();
            process.waitFor(30, TimeUnit.SECONDS);
        }
    }

    /** An orderly stop (SIGTERM), then SIGKILL after 30 s. */
    public void stop() throws InterruptedException {
        if (process != null && process.isAlive()) {
            process.destroy();
            if (!process.waitFor(30, TimeUnit.SECONDS)) {
                kill();
            }
        }
    }

    @Override
    public void close() throws InterruptedException {
        stop();
    }

    /** The last 40 lines of the latest log. */
    public String tail() {
        try {
            List<String> lines = Files.readAllLines(logFile());
            return String.join("\n", lines.subList(Math.max(0, lines.size() - 40), lines.size()));
        } catch (IOException e) {
            return "(no log: " + e.getMessage() + ")";
        }
    }

    /** Deletes a folder and everything in it (a test's PostgreSQL data), quietly. */
    public static void deleteTree(Path folder) {
        if (folder == null || !Files.exists(folder)) {
            return;
        }
        try (java.util.stream.Stream<Path> paths = Files.walk(folder)) {
            paths.sorted(java.util.Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
        } catch (IOException e) {
            // left for the system's temporary-file cleanup
        }
    }

    public static int freePort() {
        try (ServerSocket socket = new ServerSocket(0)) {
            return socket.getLocalPort();
        } catch (IOException e) {
            throw new IllegalStateException(e);
        }
    }
}
