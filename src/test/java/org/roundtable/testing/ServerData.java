package org.roundtable.testing;

import com.fasterxml.jackson.databind.ObjectMapper;
import io.quarkus.elytron.security.common.BcryptUtil;
import org.roundtable.platform.Secrets;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.Measurand;
import org.roundtable.scheme.ParticipantCodes;
import org.roundtable.scheme.PlanDocument;
import org.roundtable.scheme.Round;

import java.io.IOException;
import java.net.URI;
import java.net.URLEncoder;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.Duration;
import java.util.ArrayList;
import java.util.Base64;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Data for tests and the fault campaign against a {@link PackagedServer}, written with plain SQL into its database
 * (as the server's migrations made it), and the HTTP steps a browser or a LIMS takes (sign-in, submissions).
 */
public final class ServerData {

    public static final List<String> ELEMENTS = List.of("Mn", "Si", "Cr", "Ni", "Mo");
    private static final Pattern CSRF = Pattern.compile("name=\"_csrf\" value=\"([^\"]+)\"");
    private static final Pattern COOKIE = Pattern.compile("^([^=;]+)=([^;]*)");

    private ServerData() {
    }

    /**
     * A scheme with {@link #ELEMENTS} (in %, expected 0.5–2.0), and a round of a split-level pair (items A, B) open
     * for results, refusing late results, with a frozen plan (consensus, fixed σpt 0.05).
     */
    public static long openRound(Connection c, String code, java.time.OffsetDateTime deadline) throws SQLException {
        long scheme = insert(c, "INSERT INTO scheme (name, material_family, created_at) VALUES (?, 'OTHER', now()) RETURNING id",
                "Scheme " + code);
        List<Measurand> catalogue = new ArrayList<>();
        List<EvaluationPlan.MeasurandPlan> plans = new ArrayList<>();
        for (String element : ELEMENTS) {
            insert(c, "INSERT INTO measurand (scheme_id, element, unit, reporting_digits, expected_min, expected_max, "
                    + "method_groups) VALUES (?, ?, '%', 2, 0.5, 2.0, 'SPARK_OES,XRF') RETURNING id", scheme, element);
            Measurand m = new Measurand();
            m.element = element;
            m.unit = "%";
            m.reportingDigits = 2;
            m.methodGroups = "SPARK_OES,XRF";
            catalogue.add(m);
            plans.add(new EvaluationPlan.MeasurandPlan(element, "CONSENSUS_ALL", null, null, null, null, null, "FIXED",
                    "0.05", null, null, null, null, null, null, null, null, null, null, null, null));
        }
        PlanDocument.Canonical plan = PlanDocument.canonical(new EvaluationPlan(plans), catalogue,
                new PlanDocument.RoundSettings(code, Round.LatePolicy.REFUSE, Round.CodeScope.ROUND), new ObjectMapper());
        long round = insert(c, "INSERT INTO round (scheme_id, code, item_description, items_per_laboratory, item_labels, "
                + "dispatch_date, result_deadline, deadline_time_zone, instructions, late_policy, state, state_changed_at, "
                + "created_at) VALUES (?, ?, 'Test pair', 2, 'A,B', current_date - 1, ?, 'UTC', 'Test', 'REFUSE', "
                + "'OPEN_FOR_RESULTS', now(), now()) RETURNING id", scheme, code, deadline);
        insert(c, "INSERT INTO evaluation_plan (round_id, plan_version, canonical_json, sha256, reason, frozen_by, frozen_at) "
                + "VALUES (?, 1, ?, ?, 'Test', 'test', now()) RETURNING round_id", round, plan.json(), plan.sha256());
        return round;
    }

    /** {@code count} laboratories enrolled in the round, each with an API token; returns the tokens. */
    public static String[] laboratories(Connection c, long round, String prefix, int count) throws SQLException {
        String[] tokens = new String[count];
        Set<String> codes = new HashSet<>();
        for (int i = 0; i < count; i++) {
            long lab = insert(c, "INSERT INTO laboratory (name, organisation, country) VALUES (?, ?, 'DE') RETURNING id",
                    prefix + " lab " + i, prefix + " org " + i);
            insert(c, "INSERT INTO round_participant (round_id, laboratory_id, participant_code, enrolled_at, enrolled_by) "
                    + "VALUES (?, ?, ?, now(), 'test') RETURNING id", round, lab, ParticipantCodes.draw(codes));
            long creator = insert(c, "INSERT INTO app_user (username, display_name, role, laboratory_id) "
                    + "VALUES (?, 'token creator', 'lab-manager', ?) RETURNING id", (prefix + "-creator-" + i).toLowerCase(), lab);
            tokens[i] = "rt_" + Secrets.randomToken(32);
            insert(c, "INSERT INTO api_token (laboratory_id, name, token_hash, token_prefix, created_by, created_at) "
                    + "VALUES (?, 'lims', ?, ?, ?, now()) RETURNING id", lab, Secrets.sha256Hex(tokens[i]),
                    tokens[i].substring(0, 10), creator);
        }
        return tokens;
    }

    /** A user of {@code role} (no laboratory) who signs in with {@code password}. */
    public static void user(Connection c, String username, String role, String password) throws SQLException {
        String hash = BcryptUtil.bcryptHash(Base64.getEncoder().encodeToString(
                Secrets.sha256(password.getBytes(StandardCharsets.UTF_8))), 4);
        insert(c, "INSERT INTO app_user (username, display_name, role, password_hash) VALUES (?, ?, ?, ?) RETURNING id",
                username, "Test " + username, role, hash);
    }

    /**
     * The JSON results of one submission: every element on both items, the values made unique to {@code sequence}
     * (below 50⁴), so that two submissions of one laboratory never have the same payload.
     */
    public static String payload(int sequence) {
        StringBuilder json = new StringBuilder("{\"results\":[");
        int rest = sequence;
        for (int e = 0; e < ELEMENTS.size(); e++) {
            for (String item : List.of("A", "B")) {
                if (json.charAt(json.length() - 1) != '[') {
                    json.append(',');
                }
                int digit = e < 4 && item.equals("A") ? rest % 50 : (e * 7) % 50;
                if (e < 4 && item.equals("A")) {
                    rest /= 50;
                }
                int hundredths = 100 + digit;
                json.append("{\"measurand\":\"").append(ELEMENTS.get(e)).append("\",\"item\":\"").append(item)
                        .append("\",\"value\":\"").append(hundredths / 100).append('.')
                        .append(String.format("%02d", hundredths % 100))
                        .append("\",\"unit\":\"%\",\"expandedUncertainty\":\"0.05\",\"coverageFactor\":\"2\",")
                        .append("\"method\":\"spark-oes\",\"replicates\":2}");
            }
        }
        return json.append("]}").toString();
    }

    /** A LIMS submission with an API token and an Idempotency-Key. */
    public static HttpRequest submission(URI base, long round, String token, String key, String payload) {
        return HttpRequest.newBuilder(base.resolve("/api/v1/my-rounds/" + round + "/submission"))
                .timeout(Duration.ofSeconds(30))
                .header("Authorization", "Bearer " + token).header("Content-Type", "application/json")
                .header("Idempotency-Key", key).POST(HttpRequest.BodyPublishers.ofString(payload)).build();
    }

    /** A signed-in browser: its session cookie and the CSRF token its pages carry. */
    public record Session(String cookie, String csrf) {
        public HttpRequest.Builder request(URI uri) {
            return HttpRequest.newBuilder(uri).timeout(Duration.ofSeconds(30)).header("Cookie", "rt_session=" + cookie);
        }
    }

    /** Signs in through the sign-in form at {@code base}, as a browser does. */
    public static Session signIn(HttpClient http, URI base, String username, String password)
            throws IOException, InterruptedException {
        HttpResponse<String> form = http.send(HttpRequest.newBuilder(base.resolve("/login")).build(),
                HttpResponse.BodyHandlers.ofString());
        String formCookie = cookie(form, "rt_form");
        String body = "_csrf=" + enc(csrfOf(form.body())) + "&username=" + enc(username) + "&password=" + enc(password);
        HttpResponse<String> login = http.send(HttpRequest.newBuilder(base.resolve("/login"))
                .header("Cookie", "rt_form=" + formCookie).header("Content-Type", "application/x-www-form-urlencoded")
                .POST(HttpRequest.BodyPublishers.ofString(body)).build(), HttpResponse.BodyHandlers.ofString());
        if (login.statusCode() != 303) {
            throw new IllegalStateException("sign-in of " + username + " answered " + login.statusCode() + ": " + login.body());
        }
        String session = cookie(login, "rt_session");
        HttpResponse<String> account = http.send(HttpRequest.newBuilder(base.resolve("/account"))
                .header("Cookie", "rt_session=" + session).build(), HttpResponse.BodyHandlers.ofString());
        return new Session(session, csrfOf(account.body()));
    }

    public static String csrfOf(String html) {
        Matcher m = CSRF.matcher(html);
        if (!m.find()) {
            throw new IllegalStateException("no CSRF field in the page");
        }
        return m.group(1);
    }

    private static String cookie(HttpResponse<?> response, String name) {
        for (String header : response.headers().allValues("Set-Cookie")) {
            Matcher m = COOKIE.matcher(header);
            if (m.find() && m.group(1).equals(name) && !m.group(2).isEmpty()) {
                return m.group(2);
            }
        }
        throw new IllegalStateException("no cookie " + name + " in the answer (" + response.statusCode() + ")");
    }

    private static String enc(String value) {
        return URLEncoder.encode(value, StandardCharsets.UTF_8);
    }

    public static long insert(Connection c, String sql, Object... params) throws SQLException {
        try (PreparedStatement s = c.prepareStatement(sql)) {
            for (int i = 0; i < params.length; i++) {
                s.setObject(i + 1, params[i]);
            }
            try (ResultSet rs = s.executeQuery()) {
                rs.next();
                return rs.getLong(1);
            }
        }
    }

    public static long count(Connection c, String sql, Object... params) throws SQLException {
        return insert(c, sql, params);
    }

    public static void execute(Connection c, String sql) throws SQLException {
        try (Statement s = c.createStatement()) {
            s.execute(sql);
        }
    }
}
