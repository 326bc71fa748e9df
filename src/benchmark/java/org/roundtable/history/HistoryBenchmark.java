package org.roundtable.history;

import io.zonky.test.db.postgres.embedded.EmbeddedPostgres;
import org.flywaydb.core.Flyway;
import org.roundtable.platform.EmbeddedDatabase;

import java.io.PrintWriter;
import java.net.ServerSocket;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.Statement;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;

/**
 * The history page and the field view against PostgreSQL at the sizes of issue 18 (server time without the
 * template's rendering; the real pages through HTTP are timed by the pages benchmark's history part,
 * {@code PagesBenchmark history}, on {@link #fill}).
 *
 * <p>Starts an embedded PostgreSQL 17, runs the real migrations and fills the history's tables (not timed) for one
 * scheme of {@code bench.labs} (default 1,000) laboratories × {@code bench.rounds} (40: ten years of four rounds) ×
 * 15 measurands: one publication per round, every laboratory's score per measurand, the field summary per round,
 * measurand and three method groups. Foreign keys are not checked while filling (session_replication_role =
 * replica); the rows are what issuing writes.
 * <ul>
 *   <li><b>historyMillis</b>: {@link HistoryService#ENTRIES_SQL} for one laboratory (600 results), the rows read into
 *       entries, series with combined scores and warnings ({@link HistoryService#series}) and the page's view with its
 *       SVG charts ({@link HistoryPages#view}); median of 20 after 5 warm-ups;</li>
 *   <li><b>fieldMillis</b>: {@link FieldView#FIELD_SQL} for the scheme and {@link FieldView#assemble}; same
 *       repetitions;</li>
 *   <li>the plans ({@code EXPLAIN}) of both queries, to show which indexes they use.</li>
 * </ul>
 * Writes {@code history.json} in the working directory ({@code target/benchmarks} under {@code -Pbenchmark}).
 */
public final class HistoryBenchmark {

    public static final int LABS = Integer.getInteger("bench.labs", 1_000);
    public static final int ROUNDS = Integer.getInteger("bench.rounds", 40);
    public static final String SCHEME_NAME = "Low-alloy steel by spark OES";
    static final String[] ELEMENTS = {"C", "Si", "Mn", "P", "S", "Cr", "Ni", "Mo", "Cu", "V", "Ti", "Nb", "Al", "B", "N"};

    private HistoryBenchmark() {
    }

    public static void main(String[] args) throws Exception {
        Path work = Files.createTempDirectory("roundtable-history-bench");
        int port;
        try (ServerSocket socket = new ServerSocket(0)) {
            port = socket.getLocalPort();
        }
        try (EmbeddedPostgres postgres = EmbeddedDatabase.start(work.resolve("pg"), port)) {
            String jdbc = postgres.getJdbcUrl("postgres", "postgres");
            Flyway.configure().dataSource(jdbc, "postgres", "").locations("classpath:db/migration")
                    .placeholders(Map.of("appRole", "roundtable_app")).load().migrate();
            try (Connection c = DriverManager.getConnection(jdbc, "postgres", "")) {
                long start = System.nanoTime();
                fill(c);
                System.out.printf("Filled %,d scores in %.1f s%n", (long) LABS * ROUNDS * ELEMENTS.length,
                        (System.nanoTime() - start) / 1e9);
                String history = HistoryService.ENTRIES_SQL.replace("(:statuses)", "('PRELIMINARY', 'FINAL', 'AMENDED')")
                        .replace(":lab", "?");
                String field = FieldView.FIELD_SQL.replace(":scheme", "?");
                long lab = LABS / 2;
                double[] h = time(() -> historyPage(c, history, lab));
                double[] f = time(() -> fieldView(c, field));
                String historyPlan = plan(c, history, lab, lab);
                String fieldPlan = plan(c, field, 1L);
                double load = java.lang.management.ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage();
                System.out.printf("history page: median %.1f ms, p95 %.1f (min %.1f, max %.1f), CPU median %.1f ms%n",
                        h[0], h[1], h[2], h[3], h[4]);
                System.out.printf("field view:   median %.1f ms, p95 %.1f (min %.1f, max %.1f), CPU median %.1f ms%n",
                        f[0], f[1], f[2], f[3], f[4]);
                System.out.printf("load average %.2f on %d processors%n", load, Runtime.getRuntime().availableProcessors());
                System.out.println(historyPlan);
                System.out.println(fieldPlan);
                try (PrintWriter out = new PrintWriter(Files.newBufferedWriter(Path.of("history.json")))) {
                    out.printf("{\"labs\":%d,\"rounds\":%d,\"measurands\":%d,\"runs\":%d,\"historyMillis\":{\"median\":%.2f,"
                                    + "\"p95\":%.2f,\"min\":%.2f,\"max\":%.2f,\"cpuMedian\":%.2f},\"fieldMillis\":{\"median\":%.2f,"
                                    + "\"p95\":%.2f,\"min\":%.2f,\"max\":%.2f,\"cpuMedian\":%.2f},\"loadAverage\":%.2f,"
                                    + "\"historyPlan\":%s,\"fieldPlan\":%s}%n", LABS, ROUNDS, ELEMENTS.length, RUNS,
                            h[0], h[1], h[2], h[3], h[4], f[0], f[1], f[2], f[3], f[4], load,
                            json(historyPlan), json(fieldPlan));
                }
            }
        }
    }

    interface Task {
        int run() throws Exception;
    }

    static final int RUNS = Integer.getInteger("bench.runs", 40);

    /** Median, 95th percentile (nearest rank), min, max of the wall-clock times, and the median CPU time of this thread. */
    private static double[] time(Task task) throws Exception {
        java.lang.management.ThreadMXBean threads = java.lang.management.ManagementFactory.getThreadMXBean();
        int sink = 0;
        for (int i = 0; i < 10; i++) {
            sink += task.run();
        }
        double[] ms = new double[RUNS];
        double[] cpu = new double[RUNS];
        for (int i = 0; i < ms.length; i++) {
            long cpuStart = threads.getCurrentThreadCpuTime();
            long start = System.nanoTime();
            sink += task.run();
            ms[i] = (System.nanoTime() - start) / 1e6;
            cpu[i] = (threads.getCurrentThreadCpuTime() - cpuStart) / 1e6;
        }
        if (sink == 42) {
            System.out.println();
        }
        Arrays.sort(ms);
        Arrays.sort(cpu);
        int p95 = (int) Math.ceil(0.95 * RUNS) - 1;
        return new double[]{median(ms), ms[p95], ms[0], ms[ms.length - 1], median(cpu)};
    }

    private static double median(double[] sorted) {
        int n = sorted.length;
        return n % 2 == 1 ? sorted[n / 2] : (sorted[n / 2 - 1] + sorted[n / 2]) / 2;
    }

    private static final com.fasterxml.jackson.databind.ObjectMapper JSON = new com.fasterxml.jackson.databind.ObjectMapper();

    /** As {@link HistoryService#warningRules}: the plan of each scheme's latest round, one query. */
    private static java.util.function.Function<Long, EarlyWarnings.Rules> warningRules(Connection c,
            List<HistoryService.Entry> entries) throws Exception {
        Map<Long, Long> latest = new java.util.LinkedHashMap<>();
        for (HistoryService.Entry e : entries) {
            latest.put(e.schemeId(), e.roundId());
        }
        Map<Long, org.roundtable.scheme.EvaluationPlan.EarlyWarningPlan> plans = new java.util.HashMap<>();
        String sql = org.roundtable.scheme.RoundService.EARLY_WARNING_PLANS_SQL.replace("(:rounds)", "(SELECT unnest(?::bigint[]))");
        try (PreparedStatement s = c.prepareStatement(sql)) {
            s.setArray(1, c.createArrayOf("bigint", latest.values().toArray()));
            try (ResultSet rs = s.executeQuery()) {
                while (rs.next()) {
                    plans.put(rs.getLong(1), rs.getString(2) == null ? null
                            : JSON.readValue(rs.getString(2), org.roundtable.scheme.EvaluationPlan.EarlyWarningPlan.class));
                }
            }
        }
        Map<Long, EarlyWarnings.Rules> rules = new java.util.HashMap<>();
        latest.forEach((scheme, round) -> rules.put(scheme, HistoryService.rules(plans.get(round), EarlyWarnings.DEFAULTS)));
        return rules::get;
    }

    private static int historyPage(Connection c, String sql, long lab) throws Exception {
        List<HistoryService.Entry> entries = new ArrayList<>();
        try (PreparedStatement s = c.prepareStatement(sql)) {
            s.setLong(1, lab);
            s.setLong(2, lab);
            try (ResultSet rs = s.executeQuery()) {
                int n = rs.getMetaData().getColumnCount();
                while (rs.next()) {
                    Object[] row = new Object[n];
                    for (int i = 0; i < n; i++) {
                        row[i] = rs.getObject(i + 1);
                    }
                    entries.add(HistoryService.entry(row));
                }
            }
        }
        HistoryService.Filter filter = HistoryService.Filter.none();
        List<HistoryService.Series> series = HistoryService.series(entries, filter, warningRules(c, entries),
                LocalDate.of(2026, 12, 1));
        HistoryService.History history = new HistoryService.History(lab, "Benchmark laboratory", "Benchmark", filter,
                entries, series, series.stream().flatMap(x -> x.warnings().stream()).toList(),
                HistoryService.options(entries), null, java.util.Set.of());
        HistoryPages.PageView view = HistoryPages.view(history, true, "/my-laboratory/history", null,
                e -> "/api/v1/my-rounds/" + e.roundId() + "/documents/" + e.documentId(), List.of());
        int size = 0;
        for (HistoryPages.SeriesView s : view.series()) {
            for (HistoryPages.ChartView chart : s.charts()) {
                size += chart.svg().length();
            }
            size += s.valueChart().svg().length();
        }
        if (entries.size() != ROUNDS * ELEMENTS.length) {
            throw new IllegalStateException("expected " + ROUNDS * ELEMENTS.length + " results, read " + entries.size());
        }
        return size;
    }

    private static int fieldView(Connection c, String sql) throws Exception {
        List<Object[]> rows = new ArrayList<>();
        try (PreparedStatement s = c.prepareStatement(sql)) {
            s.setLong(1, 1L);
            try (ResultSet rs = s.executeQuery()) {
                int n = rs.getMetaData().getColumnCount();
                while (rs.next()) {
                    Object[] row = new Object[n];
                    for (int i = 0; i < n; i++) {
                        row[i] = rs.getObject(i + 1);
                    }
                    rows.add(row);
                }
            }
        }
        FieldView.Field f = FieldView.assemble(1L, rows);
        if (f.measurands().size() != ELEMENTS.length || f.measurands().get(0).rounds().size() != ROUNDS) {
            throw new IllegalStateException("unexpected field view");
        }
        return f.measurands().size();
    }

    private static String plan(Connection c, String sql, Object... params) throws Exception {
        StringBuilder out = new StringBuilder();
        try (PreparedStatement s = c.prepareStatement("EXPLAIN (ANALYZE, COSTS OFF, TIMING OFF) " + sql)) {
            for (int i = 0; i < params.length; i++) {
                s.setObject(i + 1, params[i]);
            }
            try (ResultSet rs = s.executeQuery()) {
                while (rs.next()) {
                    out.append(rs.getString(1)).append('\n');
                }
            }
        }
        return out.toString();
    }

    private static String json(String s) {
        return "\"" + s.replace("\\", "\\\\").replace("\"", "\\\"").replace("\n", "\\n") + "\"";
    }

    /**
     * One scheme (id 1), ROUNDS publications (document id = round id), LABS × ROUNDS × 15 scores (laboratory ids 1 to
     * LABS), the field summary; commits and analyses. Also used by the pages benchmark's history part, which times the
     * real pages over HTTP.
     */
    public static void fill(Connection c) throws Exception {
        c.setAutoCommit(false);
        String elements = "ARRAY['" + String.join("','", ELEMENTS) + "']";
        try (Statement s = c.createStatement()) {
            s.execute("SET session_replication_role = replica");
            s.execute("INSERT INTO history_publication (document_id, round_id, scheme_id, scheme_name, round_code, report_id, "
                    + "status, report_sha256, evaluation_run_id, evaluation_version, issued_at) "
                    + "SELECT r, r, 1, '" + SCHEME_NAME + "', 'LAS-' || r, 'RT-LAS-' || r, 'FINAL', "
                    + "md5(r::text) || md5((r + 1)::text), r, 1, timestamptz '2016-01-15' + (r * interval '91 days') "
                    + "FROM generate_series(1, " + ROUNDS + ") r");
            // z follows a smooth pseudo-random pattern per laboratory, round and measurand, |z| mostly below 3
            s.execute("INSERT INTO history_score (document_id, laboratory_id, round_id, element, item_label, unit, reported, "
                    + "method_group, value, assigned_value, assigned_value_uncertainty, sigma_pt, score_used, z, z_prime, zeta, "
                    + "en, classification, excluded_reason) "
                    + "SELECT r, l, r, (" + elements + ")[e], 'A', '%', to_char(1 + z.z * 0.01, 'FM0.0000'), "
                    + "(ARRAY['spark-oes','combustion','xrf'])[1 + (l % 3)], 1 + z.z * 0.01, 1.0, 0.002, 0.01, 'Z', z.z, null, "
                    + "null, null, CASE WHEN abs(z.z) <= 2 THEN 'SATISFACTORY' WHEN abs(z.z) < 3 THEN 'QUESTIONABLE' "
                    + "ELSE 'UNSATISFACTORY' END, null "
                    + "FROM generate_series(1, " + ROUNDS + ") r, generate_series(1, " + LABS + ") l, generate_series(1, 15) e, "
                    + "LATERAL (SELECT round((sin(l * 12.9898 + r * 78.233 + e * 37.719) * 2.2)::numeric, 2)::float8 AS z) z");
            // the plan of every round names its early warnings (as plans do since they were made configurable)
            s.execute("INSERT INTO evaluation_plan (round_id, plan_version, canonical_json, sha256, reason, frozen_by, frozen_at) "
                    + "SELECT r, 1, '{\"earlyWarnings\":{\"bias\":\"true\",\"drift\":\"true\",\"driftLimit\":\"2\","
                    + "\"driftRounds\":\"3\",\"questionable\":\"true\",\"questionableInARow\":\"2\",\"sameSignRun\":\"6\","
                    + "\"unsatisfactory\":\"true\"},\"format\":\"roundtable-evaluation-plan-1\",\"measurands\":[]}', "
                    + "md5(r::text) || md5(r::text), 'Benchmark', 'benchmark', now() FROM generate_series(1, " + ROUNDS + ") r");
            s.execute("INSERT INTO history_field_summary (document_id, element, method_group, satisfactory, questionable, "
                    + "unsatisfactory, not_scored) SELECT document_id, element, method_group, "
                    + "count(*) FILTER (WHERE classification = 'SATISFACTORY'), "
                    + "count(*) FILTER (WHERE classification = 'QUESTIONABLE'), "
                    + "count(*) FILTER (WHERE classification = 'UNSATISFACTORY'), 0 "
                    + "FROM history_score GROUP BY document_id, element, method_group");
            s.execute("SET session_replication_role = origin");
        }
        c.commit();
        c.setAutoCommit(true);
        try (Statement s = c.createStatement()) {
            s.execute("VACUUM ANALYZE");
        }
    }
}
