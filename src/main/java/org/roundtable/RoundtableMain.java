package org.roundtable;

import io.quarkus.runtime.Quarkus;
import io.quarkus.runtime.annotations.QuarkusMain;
import org.roundtable.audit.VerifyAuditCommand;
import org.roundtable.evaluation.offline.EvaluateCommand;
import org.roundtable.platform.EmbeddedDatabase;

import java.util.Arrays;

/**
 * Entry point of the packaged application.
 *
 * <ul>
 *   <li>{@code evaluate ...} runs the offline evaluation command: no database, no Quarkus start,
 *       JSON on stdout.</li>
 *   <li>{@code verify-audit [--expect-head HASH]} recomputes the audit chain from the database.</li>
 *   <li>Anything else starts the server. When no database URL is configured ({@code DB_URL} or
 *       {@code quarkus.datasource.jdbc.url}), an embedded PostgreSQL is started first with a persistent
 *       data directory, and the datasource properties are pointed at it.</li>
 * </ul>
 */
@QuarkusMain
public final class RoundtableMain {

    RoundtableMain() {
    }

    public static void main(String... args) {
        if (args.length > 0 && "evaluate".equals(args[0])) {
            System.exit(EvaluateCommand.run(Arrays.copyOfRange(args, 1, args.length), System.out, System.err));
            return;
        }
        if (args.length > 0 && "verify-audit".equals(args[0])) {
            System.exit(VerifyAuditCommand.run(Arrays.copyOfRange(args, 1, args.length), System.out, System.err));
            return;
        }
        if (!EmbeddedDatabase.databaseUrlConfigured()) {
            EmbeddedDatabase.startForServer();
        }
        Quarkus.run(args);
    }
}
