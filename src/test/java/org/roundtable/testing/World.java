package org.roundtable.testing;

import io.agroal.api.AgroalDataSource;
import io.quarkus.elytron.security.common.BcryptUtil;
import io.restassured.RestAssured;
import io.restassured.response.Response;
import jakarta.enterprise.context.ApplicationScoped;
import org.roundtable.platform.Secrets;

import java.nio.charset.StandardCharsets;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.util.Base64;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static io.restassured.RestAssured.given;

/**
 * Builds small worlds of laboratories, users, tokens and grants straight in the database for tests, and signs
 * users in through the real form (cookie, CSRF token). Every name is unique, so tests never depend on each
 * other or on order.
 */
@ApplicationScoped
public class World {

    public static final String PASSWORD = "correct-battery-staple-7";
    private static final AtomicInteger COUNTER = new AtomicInteger();
    private static final Pattern CSRF = Pattern.compile("name=\"_csrf\" value=\"([^\"]+)\"");
    private static volatile String passwordHash;

    private final AgroalDataSource dataSource;

    public World(AgroalDataSource dataSource) {
        this.dataSource = dataSource;
    }

    /** A signed-in browser: its session cookie and the CSRF token of its pages. */
    public record Browser(String username, String sessionCookie, String csrfToken) {
        public io.restassured.specification.RequestSpecification request() {
            return given().cookie("rt_session", sessionCookie).redirects().follow(false);
        }

        public io.restassured.specification.RequestSpecification form() {
            return request().contentType("application/x-www-form-urlencoded").formParam("_csrf", csrfToken);
        }

        public io.restassured.specification.RequestSpecification json() {
            return request().contentType("application/json").header("X-CSRF-Token", csrfToken);
        }
    }

    public static String unique(String stem) {
        return stem + "-" + COUNTER.incrementAndGet() + "-" + Secrets.randomToken(16).substring(0, 6).toLowerCase()
                .replaceAll("[^a-z0-9]", "x");
    }

    public long laboratory() {
        String name = unique("Lab");
        return insert("INSERT INTO laboratory (name, organisation, country) VALUES (?, ?, 'DE') RETURNING id",
                name, "Org " + name);
    }

    /** A user with {@link #PASSWORD}; {@code laboratoryId} null for roles without a laboratory. */
    public String user(String role, Long laboratoryId) {
        String username = unique(role.replace("-", ""));
        insert("INSERT INTO app_user (username, display_name, role, laboratory_id, password_hash) VALUES (?, ?, ?, ?, ?) RETURNING id",
                username, "Test " + username, role, laboratoryId, hash());
        return username;
    }

    public long userId(String username) {
        return insert("SELECT id FROM app_user WHERE username = ?", username);
    }

    /** An API token of the laboratory; returns the secret. */
    public String apiToken(long laboratoryId) {
        String secret = "rt_" + Secrets.randomToken(32);
        long creator = insert("INSERT INTO app_user (username, display_name, role, laboratory_id) VALUES (?, 'token creator', 'lab-manager', ?) RETURNING id",
                unique("tokencreator"), laboratoryId);
        insert("INSERT INTO api_token (laboratory_id, name, token_hash, token_prefix, created_by, created_at) VALUES (?, ?, ?, ?, ?, now()) RETURNING id",
                laboratoryId, unique("token"), Secrets.sha256Hex(secret), secret.substring(0, 10), creator);
        return secret;
    }

    /** An API token of the laboratory with this scope ({@code SUBMIT} or {@code READ_SCORES}); returns its secret. */
    public String apiToken(long laboratoryId, String scope) {
        String secret = apiToken(laboratoryId);
        sql("UPDATE api_token SET scope = ? WHERE token_hash = ?", scope, Secrets.sha256Hex(secret));
        return secret;
    }

    public long apiTokenId(long laboratoryId) {
        String secret = apiToken(laboratoryId);
        return insert("SELECT id FROM api_token WHERE token_hash = ?", Secrets.sha256Hex(secret));
    }

    /** An active grant of {@code laboratoryId} to the auditor; returns the grant id. */
    public long grant(long laboratoryId, String auditorUsername) {
        long manager = insert("INSERT INTO app_user (username, display_name, role, laboratory_id) VALUES (?, 'grantor', 'lab-manager', ?) RETURNING id",
                unique("grantor"), laboratoryId);
        return insert("INSERT INTO auditor_grant (laboratory_id, auditor_id, granted_by, granted_at, valid_until) "
                        + "VALUES (?, (SELECT id FROM app_user WHERE username = ?), ?, now(), now() + interval '30 days') RETURNING id",
                laboratoryId, auditorUsername, manager);
    }

    // ---- schemes and rounds -------------------------------------------------------------------------------

    /** A scheme with one measurand, Cr in % (2 digits, expected 17 to 20, spark OES or XRF); returns its id. */
    public long scheme() {
        long scheme = insert("INSERT INTO scheme (name, material_family, created_at) VALUES (?, 'STAINLESS_STEEL', now()) RETURNING id",
                unique("Scheme"));
        insert("INSERT INTO measurand (scheme_id, element, unit, reporting_digits, expected_min, expected_max, method_groups) "
                + "VALUES (?, 'Cr', '%', 2, 17, 20, 'SPARK_OES,XRF') RETURNING id", scheme);
        return scheme;
    }

    /** The plan the round builder uses: Cr, Algorithm A consensus, fixed σpt 0.10 %. */
    public static org.roundtable.scheme.EvaluationPlan simplePlan(String sigmaPt) {
        return new org.roundtable.scheme.EvaluationPlan(java.util.List.of(new org.roundtable.scheme.EvaluationPlan.MeasurandPlan(
                "Cr", "CONSENSUS_ALL", null, null, null, null, null, "FIXED", sigmaPt, null, null, null, null, null,
                // a consensus of as few as 2 results (the product's default minimum is 10): tests of other features
                // use rounds of a few laboratories and still want verdicts
                null, "2", null, null, null, null, null)));
    }

    /**
     * A round placed straight in {@code state}, with everything that state implies: a plan (draft in DRAFT,
     * frozen version 1 after), the given laboratories enrolled with codes, a recorded qualification decision
     * for Cr, and one item "A" per laboratory from DISPATCHED on. Returns the round id.
     */
    public long round(org.roundtable.scheme.RoundState state, long... enrolledLaboratories) {
        return round(state, simplePlan("0.10"), org.roundtable.scheme.Round.LatePolicy.REFUSE, false, enrolledLaboratories);
    }

    /**
     * Like {@link #round(org.roundtable.scheme.RoundState, long...)} with the given plan and late-result policy;
     * the scheme's catalogue has Cr (%, 2 digits) and Mn (%, 3 digits, 0.5 to 1.0, spark OES or XRF).
     */
    public long round(org.roundtable.scheme.RoundState state, org.roundtable.scheme.EvaluationPlan evaluationPlan,
                      org.roundtable.scheme.Round.LatePolicy latePolicy, long... enrolledLaboratories) {
        return round(state, evaluationPlan, latePolicy, true, enrolledLaboratories);
    }

    private long round(org.roundtable.scheme.RoundState state, org.roundtable.scheme.EvaluationPlan evaluationPlan,
                       org.roundtable.scheme.Round.LatePolicy latePolicy, boolean withMn, long... enrolledLaboratories) {
        long scheme = scheme();
        String code = unique("R").toUpperCase();
        org.roundtable.scheme.Measurand cr = new org.roundtable.scheme.Measurand();
        cr.element = "Cr";
        cr.unit = "%";
        cr.reportingDigits = 2;
        cr.methodGroups = "SPARK_OES,XRF";
        java.util.List<org.roundtable.scheme.Measurand> catalogue = new java.util.ArrayList<>(java.util.List.of(cr));
        if (withMn) {
            insert("INSERT INTO measurand (scheme_id, element, unit, reporting_digits, expected_min, expected_max, method_groups) "
                    + "VALUES (?, 'Mn', '%', 3, 0.5, 1.0, 'SPARK_OES,XRF') RETURNING id", scheme);
            org.roundtable.scheme.Measurand mn = new org.roundtable.scheme.Measurand();
            mn.element = "Mn";
            mn.unit = "%";
            mn.reportingDigits = 3;
            mn.methodGroups = "SPARK_OES,XRF";
            catalogue.add(mn);
        }
        org.roundtable.scheme.PlanDocument.Canonical plan = org.roundtable.scheme.PlanDocument.canonical(evaluationPlan,
                catalogue, new org.roundtable.scheme.PlanDocument.RoundSettings(code,
                        latePolicy, org.roundtable.scheme.Round.CodeScope.ROUND),
                new com.fasterxml.jackson.databind.ObjectMapper());
        boolean draft = state == org.roundtable.scheme.RoundState.DRAFT;
        long round = insert("INSERT INTO round (scheme_id, code, item_description, items_per_laboratory, item_labels, dispatch_date, "
                        + "result_deadline, deadline_time_zone, instructions, late_policy, state, state_changed_at, draft_plan, created_at) "
                        + "VALUES (?, ?, 'Stainless steel disc, 40 mm', 1, 'A', current_date, now() + interval '30 days', 'Europe/Berlin', "
                        + "'Treat the disc as a routine sample.', ?, ?, now(), ?, now()) RETURNING id",
                scheme, code, latePolicy.name(), state.name(), draft ? plan.json() : null);
        if (!draft) {
            insert("INSERT INTO evaluation_plan (round_id, plan_version, canonical_json, sha256, reason, frozen_by, frozen_at) "
                    + "VALUES (?, 1, ?, ?, 'Frozen before enrolment', 'world', now()) RETURNING round_id", round, plan.json(), plan.sha256());
            for (org.roundtable.scheme.EvaluationPlan.MeasurandPlan m : evaluationPlan.measurands()) {
                insert("INSERT INTO qualification_decision (round_id, element, decision, reason, decided_by, decided_at) "
                        + "VALUES (?, ?, 'ACCEPT', 'Checked by the test world', 'world', now()) RETURNING id", round, m.element());
            }
        }
        boolean itemsOut = state.ordinal() >= org.roundtable.scheme.RoundState.DISPATCHED.ordinal()
                && state != org.roundtable.scheme.RoundState.CANCELLED;
        java.util.Set<String> taken = new java.util.HashSet<>();
        for (long lab : enrolledLaboratories) {
            insert("INSERT INTO round_participant (round_id, laboratory_id, participant_code, enrolled_at, enrolled_by) "
                    + "VALUES (?, ?, ?, now(), 'world') RETURNING id", round, lab, org.roundtable.scheme.ParticipantCodes.draw(taken));
            if (itemsOut) {
                insert("INSERT INTO item_dispatch (round_id, laboratory_id, item_label, status, dispatched_at) "
                        + "VALUES (?, ?, 'A', 'DISPATCHED', now()) RETURNING id", round, lab);
            }
        }
        return round;
    }

    /** Laboratory {@code laboratoryId} submits one Cr result through the JSON API with a fresh token; returns the receipt id. */
    public String submitCr(long roundId, long laboratoryId, String value) {
        return given().header("Authorization", "Bearer " + apiToken(laboratoryId)).contentType("application/json")
                .body("{\"results\":[{\"measurand\":\"Cr\",\"value\":\"" + value + "\",\"unit\":\"%\","
                        + "\"method\":\"spark-oes\",\"replicates\":2}]}")
                .post("/api/v1/my-rounds/" + roundId + "/submission")
                .then().statusCode(201).extract().path("receiptId");
    }

    /**
     * Writes one result of item "A" straight into the submission tables as a new revision of the laboratory's
     * submission (which then holds only this result): {@code reported} is a number or {@code <number}, in %;
     * {@code expandedUncertainty} may be null (k = 2). For evaluation tests that need many laboratories fast.
     */
    public void reportResult(long roundId, long laboratoryId, String element, String reported, String expandedUncertainty,
                             String methodCode, boolean late) {
        long submission = insert("INSERT INTO submission (round_id, laboratory_id, current_revision, created_at, updated_at) "
                + "VALUES (?, ?, 0, now(), now()) ON CONFLICT (round_id, laboratory_id) DO UPDATE SET updated_at = now() "
                + "RETURNING id", roundId, laboratoryId);
        int revision = (int) insert("SELECT current_revision + 1 FROM submission WHERE id = ?", submission);
        String sha = org.roundtable.platform.Secrets.sha256Hex(unique("payload"));
        long revisionId = insert("INSERT INTO submission_revision (submission_id, revision, channel, receipt_id, payload_sha256, "
                + "canonical_payload, values_sha256, submitted_by, submitted_role, submitted_at, late) "
                + "VALUES (?, ?, 'JSON', ?, ?, '{}', ?, 'world', 'lab-member', now(), ?) RETURNING id",
                submission, revision, unique("RCPT"), sha, sha, late);
        boolean lessThan = reported.startsWith("<");
        java.math.BigDecimal number = new java.math.BigDecimal(lessThan ? reported.substring(1) : reported);
        insert("INSERT INTO reported_result (revision_id, element, item_label, value_as_reported, unit_as_reported, less_than, "
                + "reported_number, value_in_measurand_unit, expanded_uncertainty_as_reported, expanded_uncertainty, "
                + "coverage_factor, method_group, replicates) VALUES (?, ?, 'A', ?, '%', ?, ?, ?, ?, ?, 2, ?, 1) RETURNING revision_id",
                revisionId, element, reported, lessThan, number, number, expandedUncertainty,
                expandedUncertainty == null ? null : new java.math.BigDecimal(expandedUncertainty), methodCode);
        sql("UPDATE submission SET current_revision = ? WHERE id = ?", revision, submission);
    }

    /** The current item "A" of the laboratory in the round. */
    public long itemOf(long roundId, long laboratoryId) {
        return insert("SELECT id FROM item_dispatch WHERE round_id = ? AND laboratory_id = ? AND status <> 'REPLACED' ORDER BY id DESC LIMIT 1",
                roundId, laboratoryId);
    }

    public String text(String sql, Object... params) {
        try (Connection c = dataSource.getConnection(); PreparedStatement s = c.prepareStatement(sql)) {
            bind(s, params);
            try (ResultSet rs = s.executeQuery()) {
                return rs.next() ? rs.getString(1) : null;
            }
        } catch (SQLException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Signs in through the sign-in form, as a browser would. */
    public Browser signIn(String username) {
        return signIn(username, PASSWORD);
    }

    public Browser signIn(String username, String password) {
        Response form = given().get("/login");
        String formCookie = form.getCookie("rt_form");
        String token = csrfOf(form.asString());
        Response login = given().redirects().follow(false)
                .cookie("rt_form", formCookie)
                .contentType("application/x-www-form-urlencoded")
                .formParam("_csrf", token).formParam("username", username).formParam("password", password)
                .post("/login");
        if (login.statusCode() != 303) {
            throw new IllegalStateException("sign-in of " + username + " failed with " + login.statusCode() + ": " + login.asString());
        }
        String session = login.getCookie("rt_session");
        String csrf = csrfOf(given().cookie("rt_session", session).get("/account").asString());
        return new Browser(username, session, csrf);
    }

    /** The anonymous form cookie and its CSRF token, as the sign-in page hands them out. */
    public String[] anonymousForm() {
        Response form = given().get("/login");
        return new String[]{form.getCookie("rt_form"), csrfOf(form.asString())};
    }

    public static String csrfOf(String html) {
        Matcher m = CSRF.matcher(html);
        if (!m.find()) {
            throw new IllegalStateException("no CSRF field in page");
        }
        return m.group(1);
    }

    public void sql(String sql, Object... params) {
        try (Connection c = dataSource.getConnection(); PreparedStatement s = c.prepareStatement(sql)) {
            bind(s, params);
            s.execute();
        } catch (SQLException e) {
            throw new IllegalStateException(e);
        }
    }

    public long insert(String sql, Object... params) {
        try (Connection c = dataSource.getConnection(); PreparedStatement s = c.prepareStatement(sql)) {
            bind(s, params);
            try (ResultSet rs = s.executeQuery()) {
                if (!rs.next()) {
                    throw new IllegalStateException("no row from " + sql);
                }
                return rs.getLong(1);
            }
        } catch (SQLException e) {
            throw new IllegalStateException(e);
        }
    }

    private static void bind(PreparedStatement s, Object... params) throws SQLException {
        for (int i = 0; i < params.length; i++) {
            s.setObject(i + 1, params[i]);
        }
    }

    /** Same scheme as Passwords: bcrypt over Base64(SHA-256(password)); cost 4 as in the test profile. */
    private static String hash() {
        if (passwordHash == null) {
            passwordHash = BcryptUtil.bcryptHash(Base64.getEncoder().encodeToString(
                    Secrets.sha256(PASSWORD.getBytes(StandardCharsets.UTF_8))), 4);
        }
        return passwordHash;
    }

    static {
        RestAssured.enableLoggingOfRequestAndResponseIfValidationFails();
    }
}
