package org.roundtable.platform;

import io.agroal.api.AgroalDataSource;
import io.quarkus.agroal.DataSource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;

import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

@QuarkusTest
class DatabaseRolesTest {

    @Inject
    AgroalDataSource application;

    @Inject
    @DataSource("owner")
    AgroalDataSource owner;

    @Test
    void applicationConnectionsRunAsTheRestrictedRoleWhateverTheLogin() throws SQLException {
        try (Connection c = application.getConnection(); Statement s = c.createStatement();
             ResultSet rs = s.executeQuery("SELECT current_user, session_user, (SELECT rolsuper FROM pg_roles WHERE rolname = session_user)")) {
            rs.next();
            assertThat(rs.getString(1)).isEqualTo("roundtable_app");
            assertThat(rs.getString(2)).isNotEqualTo("roundtable_app");
        }
    }

    @Test
    void applicationRoleCannotUpdateOrDeleteTheAuditTrailAlthoughTheLoginIsASuperuser() throws SQLException {
        try (Connection c = application.getConnection(); Statement s = c.createStatement()) {
            assertThatThrownBy(() -> s.executeUpdate("UPDATE audit_event SET actor = 'someone else'"))
                    .isInstanceOf(SQLException.class)
                    .satisfies(e -> assertThat(((SQLException) e).getSQLState()).isEqualTo("42501"));
            assertThatThrownBy(() -> s.executeUpdate("DELETE FROM audit_event"))
                    .isInstanceOf(SQLException.class)
                    .satisfies(e -> assertThat(((SQLException) e).getSQLState()).isEqualTo("42501"));
            assertThatThrownBy(() -> s.executeUpdate("TRUNCATE audit_event"))
                    .isInstanceOf(SQLException.class)
                    .satisfies(e -> assertThat(((SQLException) e).getSQLState()).isEqualTo("42501"));
        }
    }

    @Test
    void evenTheOwningRoleIsRefusedByTheAppendOnlyTrigger() throws SQLException {
        try (Connection c = owner.getConnection()) {
            c.setAutoCommit(false);
            try (Statement s = c.createStatement()) {
                s.executeUpdate("""
                        INSERT INTO audit_event (sequence_no, occurred_at, actor, action, object_type, previous_hash, entry_hash)
                        VALUES (999999999, now(), 'test', 'probe', 'probe', repeat('0', 64), repeat('f', 64))
                        """);
                assertThatThrownBy(() -> s.executeUpdate("UPDATE audit_event SET actor = 'x' WHERE sequence_no = 999999999"))
                        .isInstanceOf(SQLException.class)
                        .hasMessageContaining("append-only");
            } finally {
                c.rollback();
            }
        }
    }

    @Test
    void flywayIsTheOnlySchemaSourceAndHasRun() throws SQLException {
        try (Connection c = owner.getConnection(); Statement s = c.createStatement();
             ResultSet rs = s.executeQuery("SELECT count(*) FROM flyway_schema_history WHERE success")) {
            rs.next();
            assertThat(rs.getInt(1)).isPositive();
        }
    }
}
