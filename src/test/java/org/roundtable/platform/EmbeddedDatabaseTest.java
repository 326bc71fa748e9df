package org.roundtable.platform;

import io.zonky.test.db.postgres.embedded.EmbeddedPostgres;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.net.ServerSocket;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.time.Duration;
import java.time.Instant;
import java.util.OptionalLong;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

/**
 * The embedded PostgreSQL of a server: a generated superuser password (file mode 600), password sign-in from
 * 127.0.0.1 only, an old trust-only data folder upgraded at start, and a database killed with SIGKILL started
 * again by the watch.
 */
class EmbeddedDatabaseTest {

    @TempDir
    Path folder;

    @Test
    void aDataFolderIsSecuredAndAKilledDatabaseIsStartedAgain() throws Exception {
        Path dataDir = folder.resolve("pg");
        int port = freePort();
        // a data folder as older versions left it: trust sign-in, no password
        try (EmbeddedPostgres old = EmbeddedDatabase.start(dataDir, port)) {
            assertThat(canConnect(port, "")).isTrue();
        }
        String password = EmbeddedDatabase.password(folder);
        assertThat(Files.getPosixFilePermissions(folder.resolve("db.password")))
                .isEqualTo(PosixFilePermissions.fromString("rw-------"));
        assertThat(EmbeddedDatabase.password(folder)).as("kept, not regenerated").isEqualTo(password);

        EmbeddedPostgres postgres = EmbeddedDatabase.start(dataDir, port, password);
        AutoCloseable watch = null;
        try {
            EmbeddedDatabase.secure(postgres, dataDir, password);
            assertThat(Files.readString(dataDir.resolve("pg_hba.conf"))).isEqualTo(EmbeddedDatabase.HBA);
            assertThat(canConnect(port, password)).isTrue();
            assertThatThrownBy(() -> connect(port, "")).isInstanceOf(SQLException.class);
            assertThatThrownBy(() -> connect(port, "wrong")).isInstanceOf(SQLException.class);

            watch = EmbeddedDatabase.watch(postgres, dataDir, port, password);
            OptionalLong pid = EmbeddedDatabase.postmasterPid(dataDir);
            assertThat(pid).isPresent();
            new ProcessBuilder("kill", "-KILL", Long.toString(pid.getAsLong())).start().waitFor();
            Instant killed = Instant.now();
            Instant until = killed.plus(Duration.ofSeconds(30));
            boolean back = false;
            while (!back && Instant.now().isBefore(until)) {
                Thread.sleep(250);
                back = EmbeddedDatabase.postmasterPid(dataDir).stream().anyMatch(p -> p != pid.getAsLong())
                        && canConnect(port, password);
            }
            assertThat(back).as("ready again within 30 s").isTrue();
        } finally {
            if (watch != null) {
                watch.close();
            }
            Thread.sleep(1200); // the watch has seen the flag
            OptionalLong current = EmbeddedDatabase.postmasterPid(dataDir);
            postgres.close();
            current.ifPresent(p -> ProcessHandle.of(p).ifPresent(ProcessHandle::destroy));
        }
    }

    @Test
    void aStalePidFileNamingAnotherProgramStopsNothing() throws Exception {
        Path dataDir = Files.createDirectories(folder.resolve("pg"));
        Files.writeString(dataDir.resolve("postmaster.pid"), ProcessHandle.current().pid() + "\n" + dataDir + "\n");
        EmbeddedDatabase.stopOrphan(dataDir);
        assertThat(ProcessHandle.current().isAlive()).isTrue();
        assertThat(EmbeddedDatabase.postmasterPid(dataDir)).hasValue(ProcessHandle.current().pid());
    }

    private static boolean canConnect(int port, String password) {
        try (Connection ignored = connect(port, password)) {
            return true;
        } catch (SQLException e) {
            return false;
        }
    }

    private static Connection connect(int port, String password) throws SQLException {
        return DriverManager.getConnection("jdbc:postgresql://127.0.0.1:" + port + "/postgres", "postgres", password);
    }

    private static int freePort() throws Exception {
        try (ServerSocket socket = new ServerSocket(0)) {
            return socket.getLocalPort();
        }
    }
}
