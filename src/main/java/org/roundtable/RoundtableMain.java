package org.roundtable;

import io.quarkus.runtime.Quarkus;
import io.quarkus.runtime.annotations.QuarkusMain;
import org.roundtable.platform.EmbeddedDatabase;

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
        if (!EmbeddedDatabase.databaseUrlConfigured()) {
            EmbeddedDatabase.startForServer();
        }
        Quarkus.run(args);
    }
}
