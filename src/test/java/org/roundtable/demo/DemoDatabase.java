package org.roundtable.demo;

import io.quarkus.test.common.QuarkusTestResourceLifecycleManager;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.HashMap;
import java.util.Map;
import java.util.concurrent.ThreadLocalRandom;
import org.roundtable.testing.PostgresTestResource;

/**
 * A fresh, empty database on the tests' PostgreSQL server ({@link PostgresTestResource}) for one start of the
 * application with the demo scenario, so that the demo finds an empty database and the other tests' data never
 * meet it.
 */
public class DemoDatabase implements QuarkusTestResourceLifecycleManager {

    @Override
    public Map<String, String> start() {
        Map<String, String> server = PostgresTestResource.connection();
        String url = server.get("quarkus.datasource.jdbc.url");
        String user = server.get("quarkus.datasource.username");
        String password = server.get("quarkus.datasource.password");
        String name = "demo_" + Long.toHexString(ThreadLocalRandom.current().nextLong() & Long.MAX_VALUE);
        try (Connection c = DriverManager.getConnection(url, user, password); Statement s = c.createStatement()) {
            s.execute("CREATE DATABASE " + name);
        } catch (SQLException e) {
            throw new IllegalStateException("could not create the demo's test database", e);
        }
        Map<String, String> properties = new HashMap<>(server);
        properties.put("quarkus.datasource.jdbc.url", url.replaceFirst("(//[^/]+/)[^?]*", "$1" + name));
        return properties;
    }

    @Override
    public void stop() {
        // the database goes with the server at the end of the test run
    }
}
