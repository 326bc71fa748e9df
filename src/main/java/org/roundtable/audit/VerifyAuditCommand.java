package org.roundtable.audit;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import io.zonky.test.db.postgres.embedded.EmbeddedPostgres;
import org.roundtable.platform.EmbeddedDatabase;

import java.io.PrintStream;
import java.sql.Connection;
import java.sql.DriverManager;
import java.util.LinkedHashMap;
import java.util.Map;

/**
 * {@code verify-audit [--expect-head HASH]}: recomputes the audit chain straight from PostgreSQL, without the
 * server, and prints the result as JSON. Connects to {@code DB_URL} ({@code DB_USER}, {@code DB_PASSWORD}); without
 * it, opens the embedded database in {@code ROUNDTABLE_DATA_DIR} (the server must be stopped). Exit code 0 when
 * the chain is intact, 1 when it is broken, 2 on bad usage or when the database cannot be read.
 */
public final class VerifyAuditCommand {

    private VerifyAuditCommand() {
    }

    public static int run(String[] args, PrintStream out, PrintStream err) {
        String expectedHead = null;
        for (int i = 0; i < args.length; i++) {
            if ("--expect-head".equals(args[i]) && i + 1 < args.length && args[i + 1].matches("[0-9a-f]{64}")) {
                expectedHead = args[++i];
            } else {
                err.println("usage: verify-audit [--expect-head <64 lowercase hex>]");
                return 2;
            }
        }
        EmbeddedPostgres embedded = null;
        try {
            String url = System.getenv("DB_URL");
            String user = System.getenv().getOrDefault("DB_USER", "roundtable");
            String password = System.getenv().getOrDefault("DB_PASSWORD", "");
            if (url == null || url.isBlank()) {
                embedded = EmbeddedDatabase.start(EmbeddedDatabase.dataDirectory().resolve("pg"), 0);
                url = embedded.getJdbcUrl("postgres", "postgres");
                user = "postgres";
                password = "";
            }
            AuditChain.Verification result;
            try (Connection connection = DriverManager.getConnection(url, user, password)) {
                result = AuditRows.verify(connection, expectedHead);
            }
            Map<String, Object> json = new LinkedHashMap<>();
            json.put("intact", result.intact());
            json.put("entriesChecked", result.entriesChecked());
            json.put("headHash", result.headHash());
            json.put("firstBrokenSequenceNo", result.firstBrokenSequenceNo());
            json.put("problem", result.problem());
            out.println(new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT).writeValueAsString(json));
            return result.intact() ? 0 : 1;
        } catch (Exception e) {
            err.println("verify-audit: could not read the audit trail: " + e.getMessage()
                    + (embedded == null && System.getenv("DB_URL") == null ? " (is the server still running on this data folder?)" : ""));
            return 2;
        } finally {
            if (embedded != null) {
                try {
                    embedded.close();
                } catch (Exception ignored) {
                    // best effort
                }
            }
        }
    }
}
