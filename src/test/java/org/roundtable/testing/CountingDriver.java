package org.roundtable.testing;

import java.lang.reflect.InvocationHandler;
import java.lang.reflect.InvocationTargetException;
import java.lang.reflect.Method;
import java.lang.reflect.Proxy;
import java.sql.CallableStatement;
import java.sql.Connection;
import java.sql.Driver;
import java.sql.DriverPropertyInfo;
import java.sql.PreparedStatement;
import java.sql.SQLException;
import java.sql.SQLFeatureNotSupportedException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.List;
import java.util.Properties;
import java.util.concurrent.ConcurrentLinkedQueue;
import java.util.logging.Logger;

/**
 * A test-only JDBC driver in front of the PostgreSQL driver that counts the statements the application sends, for
 * tests that hold a path to a statement budget (e.g. a submission). Registered for the tests' default datasource by
 * {@code %test.quarkus.datasource.jdbc.driver}; it accepts the PostgreSQL driver's own URLs and
 * {@code jdbc:counting:postgresql:…}, and is otherwise invisible: {@code unwrap} reaches the PostgreSQL connection
 * (COPY keeps working), and nothing is recorded unless a test asks for it.
 *
 * <p>What counts as one statement: one {@code execute}, {@code executeQuery}, {@code executeUpdate} or
 * {@code executeLargeUpdate} call, and one {@code executeBatch} however many rows it carries (a batch is sent in one
 * go). Commits and rollbacks are recorded apart. The connection pool's validity checks are no statements.
 */
public final class CountingDriver implements Driver {

    private static final String PREFIX = "jdbc:counting:";

    /** One recorded call: the thread, the kind ({@code statement}, {@code batch}, {@code commit}, {@code rollback}) and the SQL. */
    public record Call(String thread, String kind, String sql) {
        public boolean isStatement() {
            return kind.equals("statement") || kind.equals("batch");
        }

        @Override
        public String toString() {
            return kind + " [" + thread + "] " + (sql == null ? "" : sql.strip().replaceAll("\\s+", " "));
        }
    }

    private static final ConcurrentLinkedQueue<Call> CALLS = new ConcurrentLinkedQueue<>();
    private static volatile boolean recording;

    static {
        try {
            java.sql.DriverManager.registerDriver(new CountingDriver());
        } catch (SQLException e) {
            throw new ExceptionInInitializerError(e);
        }
    }

    private final Driver postgres = new org.postgresql.Driver();

    /** Starts recording (forgetting what was recorded before). */
    public static void start() {
        CALLS.clear();
        recording = true;
    }

    /** Stops recording and returns what was recorded since {@link #start()}. */
    public static List<Call> stop() {
        recording = false;
        return new ArrayList<>(CALLS);
    }

    /** Whether the tests' datasource goes through this driver (false if a test runs against another configuration). */
    public static boolean installed(javax.sql.DataSource dataSource) {
        try (Connection c = dataSource.getConnection()) {
            return c.isWrapperFor(Counted.class);
        } catch (SQLException e) {
            return false;
        }
    }

    /** Marker reached through {@code unwrap}/{@code isWrapperFor} on a counted connection. */
    public interface Counted {
    }

    private static void record(String kind, String sql) {
        if (recording) {
            CALLS.add(new Call(Thread.currentThread().getName(), kind, sql));
        }
    }

    @Override
    public Connection connect(String url, Properties info) throws SQLException {
        if (!acceptsURL(url)) {
            return null;
        }
        Connection real = postgres.connect(url.startsWith(PREFIX) ? "jdbc:" + url.substring(PREFIX.length()) : url, info);
        return real == null ? null : wrap(Connection.class, real, new ConnectionHandler(real));
    }

    @Override
    public boolean acceptsURL(String url) throws SQLException {
        return url != null && (url.startsWith(PREFIX + "postgresql:") || postgres.acceptsURL(url));
    }

    @Override
    public DriverPropertyInfo[] getPropertyInfo(String url, Properties info) throws SQLException {
        return postgres.getPropertyInfo(url.startsWith(PREFIX) ? "jdbc:" + url.substring(PREFIX.length()) : url, info);
    }

    @Override
    public int getMajorVersion() {
        return postgres.getMajorVersion();
    }

    @Override
    public int getMinorVersion() {
        return postgres.getMinorVersion();
    }

    @Override
    public boolean jdbcCompliant() {
        return false;
    }

    @Override
    public Logger getParentLogger() throws SQLFeatureNotSupportedException {
        return postgres.getParentLogger();
    }

    @SuppressWarnings("unchecked")
    private static <T> T wrap(Class<T> type, Object real, InvocationHandler handler) {
        return (T) Proxy.newProxyInstance(CountingDriver.class.getClassLoader(), new Class<?>[]{type, Counted.class}, handler);
    }

    private abstract static class Delegating implements InvocationHandler {
        final Object real;

        Delegating(Object real) {
            this.real = real;
        }

        Object forward(Method method, Object[] args) throws Throwable {
            try {
                return method.invoke(real, args);
            } catch (InvocationTargetException e) {
                throw e.getCause();
            }
        }

        /** unwrap/isWrapperFor: the marker and the proxied interface answer here, the rest reaches the driver. */
        Object wrapping(Object proxy, Method method, Object[] args) throws Throwable {
            Class<?> type = (Class<?>) args[0];
            if (method.getName().equals("isWrapperFor")) {
                return type == Counted.class || forward(method, args).equals(Boolean.TRUE);
            }
            if (type == Counted.class) {
                return proxy;
            }
            return forward(method, args);
        }
    }

    private static final class ConnectionHandler extends Delegating {
        ConnectionHandler(Connection real) {
            super(real);
        }

        @Override
        public Object invoke(Object proxy, Method method, Object[] args) throws Throwable {
            switch (method.getName()) {
                case "unwrap", "isWrapperFor" -> {
                    return wrapping(proxy, method, args);
                }
                case "createStatement" -> {
                    return wrap(Statement.class, null, new StatementHandler(forward(method, args), null));
                }
                case "prepareStatement" -> {
                    return wrap(PreparedStatement.class, null, new StatementHandler(forward(method, args), (String) args[0]));
                }
                case "prepareCall" -> {
                    return wrap(CallableStatement.class, null, new StatementHandler(forward(method, args), (String) args[0]));
                }
                case "commit" -> record("commit", null);
                case "rollback" -> record("rollback", null);
                case "equals" -> {
                    return proxy == args[0];
                }
                case "hashCode" -> {
                    return System.identityHashCode(proxy);
                }
                default -> {
                }
            }
            return forward(method, args);
        }
    }

    private static final class StatementHandler extends Delegating {
        private final String sql;
        private String batchSql;

        StatementHandler(Object real, String sql) {
            super(real);
            this.sql = sql;
        }

        @Override
        public Object invoke(Object proxy, Method method, Object[] args) throws Throwable {
            switch (method.getName()) {
                case "unwrap", "isWrapperFor" -> {
                    return wrapping(proxy, method, args);
                }
                case "execute", "executeQuery", "executeUpdate", "executeLargeUpdate" ->
                        record("statement", args != null && args.length > 0 && args[0] instanceof String s ? s : sql);
                case "addBatch" -> {
                    if (args != null && args.length == 1 && args[0] instanceof String s) {
                        batchSql = batchSql == null ? s : batchSql + "; " + s;
                    }
                }
                case "executeBatch", "executeLargeBatch" -> {
                    record("batch", sql != null ? sql : batchSql);
                    batchSql = null;
                }
                case "equals" -> {
                    return proxy == args[0];
                }
                case "hashCode" -> {
                    return System.identityHashCode(proxy);
                }
                default -> {
                }
            }
            return forward(method, args);
        }
    }
}
