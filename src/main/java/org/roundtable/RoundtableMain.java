package org.roundtable;

import io.quarkus.runtime.Quarkus;
import io.quarkus.runtime.annotations.QuarkusMain;
import org.roundtable.evaluation.offline.EvaluateCommand;
import org.roundtable.platform.EmbeddedDatabase;

import java.util.Arrays;

/**
 * Entry point of the packaged application.
 *
 * <ul>
 *   <li>{@code evaluate ...} runs the offline evaluation command: no database, no Quarkus start,
 *       JSON on stdout.</li>
 *   <li>Anything else starts the server. When no database URL is configured ({@code DB_URL} or
 *       {@code quarkus.datasource.jdbc.url}), an embedded PostgreSQL is started first with a persistent
 *       data directory, and the datasource properties are pointed at it.</li>
 * </ul>
 */
@QuarkusMain
public final class RoundtableMain {

    private RoundtableMain() {
    }

    public static void main(String... args) {
        if (args.length > 0 && "evaluate".equals(args[0])) {
            System.exit(EvaluateCommand.run(Arrays.copyOfRange(args, 1, args.length), System.out, System.err));
            return;
        }
        if (!EmbeddedDatabase.databaseUrlConfigured()) {
            EmbeddedDatabase.startForServer();
        }
        Quarkus.run(args);
    }
}
