package org.roundtable.security;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import io.restassured.specification.RequestSpecification;
import jakarta.inject.Inject;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Set;
import java.util.TreeSet;
import java.util.function.Function;
import java.util.stream.Collectors;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;

/**
 * Exercises every endpoint as every kind of caller — signed in through the real sign-in form, or with a
 * real API token — against laboratory A's objects, and checks the answer against
 * {@code security/authorization-matrix.csv} (ASVS v5.0.0-8.2.1, 8.2.2, 8.4.1; 3.5.x for CSRF).
 */
@QuarkusTest
class AuthorizationMatrixTest {

    static final List<String> CALLERS = List.of("anonymous", "admin", "coordinator", "manager-own", "manager-other",
            "member-own", "member-other", "auditor-granted", "auditor-other", "token-own", "token-other");
    static final String MISSING_ID = "987654321";

    /** The media types each endpoint consumes, so that requests reach the endpoint rather than a 415. */
    /** Endpoints that need no CSRF token by design ({@code @CsrfExempt} on the method or its class). */
    static final Set<String> CSRF_EXEMPT = EndpointInventory.all().stream()
            .filter(e -> e.javaMethod().isAnnotationPresent(org.roundtable.platform.CsrfExempt.class)
                    || e.javaMethod().getDeclaringClass().isAnnotationPresent(org.roundtable.platform.CsrfExempt.class))
            .map(EndpointInventory.Endpoint::key).collect(Collectors.toSet());

    static final Map<String, java.util.Set<String>> CONSUMES = EndpointInventory.all().stream().collect(Collectors.toMap(
            EndpointInventory.Endpoint::key, e -> {
                jakarta.ws.rs.Consumes c = e.javaMethod().getAnnotation(jakarta.ws.rs.Consumes.class);
                return c == null ? java.util.Set.<String>of() : java.util.Set.of(c.value());
            }));

    record Row(String method, String path, Map<String, String> expected) {
        String key() {
            return method + " " + path;
        }
    }

    /** One caller: how to make its requests. */
    record Caller(String name, Function<RequestSpecification, RequestSpecification> credentials, boolean session,
                  String csrfToken) {
    }

    @Inject
    World world;

    @Inject
    org.roundtable.evaluation.EvaluationService evaluations;

    @Inject
    org.roundtable.testing.Publications publications;

    @Inject
    org.roundtable.evaluation.ExclusionService exclusions;

    @Inject
    org.roundtable.evaluation.EvaluationJobs evaluationJobs;

    private long labA;
    private long labB;

    @BeforeEach
    void twoLaboratories() {
        labA = world.laboratory();
        labB = world.laboratory();
    }

    @Test
    void everyEndpointDeclaresItsSecurityPolicy() {
        List<String> undeclared = EndpointInventory.all().stream().filter(e -> !e.hasSecurityPolicy())
                .map(EndpointInventory.Endpoint::key).toList();
        assertThat(undeclared).as("endpoints without @RolesAllowed, @Authenticated, @PermitAll or @DenyAll").isEmpty();
    }

    @Test
    void everyEndpointIsInTheMatrixAndTheMatrixNamesOnlyRealEndpoints() {
        Set<String> inventory = EndpointInventory.all().stream().map(EndpointInventory.Endpoint::key)
                .collect(Collectors.toCollection(TreeSet::new));
        Set<String> matrix = rows().stream().map(Row::key).collect(Collectors.toCollection(TreeSet::new));
        Set<String> missing = new TreeSet<>(inventory);
        missing.removeAll(matrix);
        Set<String> stale = new TreeSet<>(matrix);
        stale.removeAll(inventory);
        assertThat(missing).as("endpoints missing from security/authorization-matrix.csv").isEmpty();
        assertThat(stale).as("matrix rows that name no endpoint").isEmpty();
    }

    @Test
    void everyEndpointAnswersEveryCallerAsTheMatrixSays() {
        List<String> failures = new ArrayList<>();
        int cases = 0;
        for (Row row : rows()) {
            Map<String, Caller> callers = callers();
            for (String callerName : CALLERS) {
                cases++;
                Caller caller = callers.get(callerName);
                String expected = row.expected().get(callerName);
                String path = resolve(row.path());
                Response response = send(row, path, caller, true, null);
                String problem = check(expected, response);
                if (problem == null && expected.equals("hide")) {
                    Response missing = send(row, withMissingIds(row.path()), caller, true, null);
                    if (missing.statusCode() != 404 || !answer(missing).equals(answer(response))) {
                        problem = "another laboratory's object and a missing one answer differently";
                    }
                }
                if (problem != null) {
                    failures.add(row.key() + " as " + callerName + ": expected " + expected + ", " + problem);
                }
            }
        }
        assertThat(failures).as("%d cases checked", cases).isEmpty();
    }

    @Test
    void onlyThePublicReadOnlyVerificationIsExemptFromCsrf() {
        assertThat(CSRF_EXEMPT).containsExactly("POST /api/v1/reports/verify");
    }

    @Test
    void everyStateChangingEndpointRefusesRequestsWithoutTheCsrfTokenOrFromAnotherSite() {
        List<String> failures = new ArrayList<>();
        for (Row row : rows()) {
            if (row.method().equals("GET") || CSRF_EXEMPT.contains(row.key())) {
                continue;
            }
            Map<String, Caller> callers = callers();
            // the first caller with a browser credential that the matrix lets through
            Caller caller = CALLERS.stream().filter(c -> !c.startsWith("token"))
                    .filter(c -> !Set.of("deny", "hide", "auth", "login").contains(row.expected().get(c)))
                    .map(callers::get).findFirst().orElse(null);
            if (caller == null) {
                continue;
            }
            String path = resolve(row.path());
            int withoutToken = send(row, path, caller, false, null).statusCode();
            int foreignOrigin = send(row, path, caller, true, "https://elsewhere.example").statusCode();
            if (withoutToken != 403) {
                failures.add(row.key() + " as " + caller.name() + " without CSRF token answered " + withoutToken);
            }
            if (foreignOrigin != 403) {
                failures.add(row.key() + " as " + caller.name() + " from a foreign origin answered " + foreignOrigin);
            }
        }
        assertThat(failures).isEmpty();
    }

    private Response send(Row row, String path, Caller caller, boolean withCsrf, String origin) {
        boolean api = path.startsWith("/api/");
        RequestSpecification request = caller.credentials().apply(given().redirects().follow(false))
                .accept(api ? "application/json, */*;q=0.5" : "text/html");
        if (origin != null) {
            request = request.header("Origin", origin);
        }
        if (row.method().equals("GET")) {
            return request.get(path);
        }
        java.util.Set<String> consumes = CONSUMES.getOrDefault(row.key(), java.util.Set.of());
        if (consumes.contains("multipart/form-data")) {
            request = request.multiPart("file", "results.csv", "measurand,value\n".getBytes(StandardCharsets.UTF_8), "text/csv");
            if (withCsrf && caller.csrfToken() != null) {
                request = request.multiPart("_csrf", caller.csrfToken());
            }
        } else if (consumes.contains("text/csv")) {
            request = request.contentType("text/csv").body("measurand,value\n");
            if (withCsrf && caller.csrfToken() != null) {
                request = request.header("X-CSRF-Token", caller.csrfToken());
            }
        } else if (api) {
            request = request.contentType("application/json").body("{}");
            if (withCsrf && caller.csrfToken() != null) {
                request = request.header("X-CSRF-Token", caller.csrfToken());
            }
        } else {
            request = request.contentType("application/x-www-form-urlencoded").formParam("unused", "1");
            if (withCsrf && caller.csrfToken() != null) {
                request = request.formParam("_csrf", caller.csrfToken());
            }
        }
        return request.request(row.method(), path);
    }

    /** What a caller learns from an answer: the body without the per-request reference. */
    private static String answer(Response response) {
        return response.asString().replaceAll("[0-9a-f]{24}", "<request>");
    }

    private static String check(String expected, Response response) {
        int status = response.statusCode();
        if (status >= 500) {
            return "got " + status + ": " + response.asString();
        }
        return switch (expected) {
            case "ok" -> Set.of(401, 403, 404).contains(status) ? "got " + status : null;
            case "deny" -> status == 403 ? null : "got " + status;
            case "hide" -> status == 404 ? null : "got " + status;
            case "auth" -> status == 401 ? null : "got " + status;
            case "login" -> status == 303 && response.header("Location").contains("/login") ? null : "got " + status;
            default -> Integer.parseInt(expected) == status ? null : "got " + status;
        };
    }

    /** Fresh callers for each endpoint, so that one endpoint's effect (a sign-out, a disabled user) never leaks. */
    private Map<String, Caller> callers() {
        Map<String, Caller> callers = new LinkedHashMap<>();
        String[] form = world.anonymousForm();
        callers.put("anonymous", new Caller("anonymous", r -> r.cookie("rt_form", form[0]), false, form[1]));
        callers.put("admin", session("admin", world.user("admin", null)));
        callers.put("coordinator", session("coordinator", world.user("coordinator", null)));
        callers.put("manager-own", session("manager-own", world.user("lab-manager", labA)));
        callers.put("manager-other", session("manager-other", world.user("lab-manager", labB)));
        callers.put("member-own", session("member-own", world.user("lab-member", labA)));
        callers.put("member-other", session("member-other", world.user("lab-member", labB)));
        String granted = world.user("auditor", null);
        world.grant(labA, granted);
        callers.put("auditor-granted", session("auditor-granted", granted));
        callers.put("auditor-other", session("auditor-other", world.user("auditor", null)));
        String ownToken = world.apiToken(labA);
        String otherToken = world.apiToken(labB);
        callers.put("token-own", new Caller("token-own", r -> r.header("Authorization", "Bearer " + ownToken), false, null));
        callers.put("token-other", new Caller("token-other", r -> r.header("Authorization", "Bearer " + otherToken), false, null));
        return callers;
    }

    private Caller session(String name, String username) {
        World.Browser browser = world.signIn(username);
        return new Caller(name, r -> r.cookie("rt_session", browser.sessionCookie()), true, browser.csrfToken());
    }

    /** Fills a path's placeholders with fresh objects of laboratory A. */
    private String resolve(String path) {
        String resolved = path;
        if (resolved.contains("{laboratoryId}")) {
            resolved = resolved.replace("{laboratoryId}", Long.toString(labA));
        }
        if (resolved.contains("{userId}")) {
            resolved = resolved.replace("{userId}", Long.toString(world.userId(world.user("lab-member", labA))));
        }
        if (resolved.contains("{tokenId}")) {
            resolved = resolved.replace("{tokenId}", Long.toString(world.apiTokenId(labA)));
        }
        if (resolved.contains("{grantId}")) {
            resolved = resolved.replace("{grantId}", Long.toString(world.grant(labA, world.user("auditor", null))));
        }
        if (resolved.contains("{noticeId}")) {
            long owner = world.userId(world.user("lab-member", labA));
            resolved = resolved.replace("{noticeId}", Long.toString(world.insert("INSERT INTO notice (kind, object_key, "
                    + "recipient_id, params, link, created_at) VALUES ('reminder', ?, ?, '{}', '/my-rounds', now()) RETURNING id",
                    World.unique("matrix"), owner)));
        }
        if (resolved.contains("{measurandId}") && !resolved.contains("/evaluation/{version}/")) {
            // a measurand of the published round's scheme (one item: the section is named by the element); an
            // evaluation run's measurand pages name element and item (resolved with {version} below)
            resolved = resolved.replace("{measurandId}", "Cr");
        }
        if (resolved.contains("{chart}")) {
            resolved = resolved.replace("{chart}", "scores");
        }
        if (resolved.contains("{schemeId}")) {
            resolved = resolved.replace("{schemeId}", Long.toString(world.scheme()));
        }
        if (resolved.contains("{studyId}")) {
            long study = precisionStudy();
            resolved = resolved.replace("{studyId}", Long.toString(study));
            if (resolved.contains("{exclusionId}")) {
                long exclusion = world.insert("INSERT INTO precision_exclusion (round_id, action, laboratory_id, element, "
                        + "level_label, reason, recorded_by, recorded_at) VALUES (?, 'MARK', ?, 'C', '1', 'matrix', 'matrix', now()) "
                        + "RETURNING id", study, labA);
                resolved = resolved.replace("{exclusionId}", Long.toString(exclusion));
            }
            resolved = resolved.replace("{step}", "final");
        }
        if (resolved.contains("{roundId}")) {
            // a round where the endpoints can act: items out, laboratory A enrolled (laboratory B is not)
            // results need a round open for results; other round endpoints a dispatched one
            boolean results = resolved.contains("submission") || resolved.contains("results")
                    || resolved.contains("messages") || resolved.contains("review-flags")
                    || resolved.contains("evaluation") || resolved.contains("exclusion");
            // exports of the published evaluation need one: a closed round evaluated and issued as FINAL
            boolean published = resolved.contains("/published/") || resolved.contains("/scores");
            long round = published ? publications.publishedRound(labA, org.roundtable.report.model.ReportStatus.FINAL)
                    : world.round(results ? org.roundtable.scheme.RoundState.OPEN_FOR_RESULTS
                    : org.roundtable.scheme.RoundState.DISPATCHED, labA);
            resolved = resolved.replace("{roundId}", Long.toString(round));
            if (resolved.contains("{revision}")) {
                world.submitCr(round, labA, "18.12");
                resolved = resolved.replace("{revision}", "1");
            }
            if (resolved.contains("{version}")) {
                int version = evaluations.run(round, true, new org.roundtable.audit.Actor("matrix", "coordinator", null))
                        .run().version();
                resolved = resolved.replace("{version}", Integer.toString(version));
                // the measurand of the simple plan's one item; a chart of the report's section
                resolved = resolved.replace("{measurandId}", "Cr-A").replace("{kind}", "score-bars");
            }
            if (resolved.contains("{exclusionId}")) {
                // a current blunder mark on laboratory A's Cr result
                world.submitCr(round, labA, "18.12");
                String code = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?",
                        round, labA);
                long exclusion = exclusions.mark(round, new org.roundtable.evaluation.ExclusionService.MarkRequest(code, "Cr",
                        "A", "matrix"), new org.roundtable.audit.Actor("matrix", "coordinator", null)).id();
                resolved = resolved.replace("{exclusionId}", Long.toString(exclusion));
            }
            if (resolved.contains("{jobId}")) {
                long job = evaluationJobs.start(round, true, new org.roundtable.audit.Actor("matrix", "coordinator", null))
                        .jobId();
                resolved = resolved.replace("{jobId}", Long.toString(job));
            }
            if (resolved.contains("{itemId}")) {
                resolved = resolved.replace("{itemId}", Long.toString(world.itemOf(round, labA)));
            }
            if (resolved.contains("{documentId}") || resolved.contains("{commentId}")) {
                // a final laboratory report of laboratory A in the round, and A's comment on it
                byte[] bytes = World.unique("document").getBytes(java.nio.charset.StandardCharsets.UTF_8);
                long document = world.insert("INSERT INTO issued_document (report_id, kind, status, round_id, laboratory_id, "
                                + "content_type, bytes, sha256, issued_at, issued_by) VALUES (?, 'LABORATORY', 'FINAL', ?, ?, "
                                + "'application/pdf', ?, ?, now(), 'matrix') RETURNING id", World.unique("MATRIX"), round, labA,
                        bytes, org.roundtable.platform.Secrets.sha256Hex(bytes));
                world.insert("INSERT INTO issued_document_html (document_id, html) VALUES (?, '<p>matrix</p>') "
                        + "RETURNING document_id", document);
                resolved = resolved.replace("{documentId}", Long.toString(document));
                if (resolved.contains("{commentId}")) {
                    long comment = world.insert("INSERT INTO report_comment (round_id, document_id, laboratory_id, "
                            + "participant_code, body, written_by, written_at) VALUES (?, ?, ?, 'MATRIX', 'A comment', "
                            + "'matrix', now()) RETURNING id", round, document, labA);
                    resolved = resolved.replace("{commentId}", Long.toString(comment));
                }
            }
        }
        if (resolved.contains("{exportId}")) {
            byte[] bytes = World.unique("export").getBytes(java.nio.charset.StandardCharsets.UTF_8);
            long export = world.insert("INSERT INTO issued_document (report_id, kind, status, laboratory_id, content_type, "
                    + "bytes, sha256, issued_at, issued_by) VALUES (?, 'HISTORY_EXPORT', 'FINAL', ?, 'text/csv', ?, ?, now(), "
                    + "'matrix') RETURNING id", World.unique("HX"), labA, bytes, org.roundtable.platform.Secrets.sha256Hex(bytes));
            resolved = resolved.replace("{exportId}", Long.toString(export));
        }
        if (resolved.contains("{actionId}")) {
            // an open corrective action of laboratory A (on a round of A), with one PDF attachment
            long round = world.round(org.roundtable.scheme.RoundState.CLOSED, labA);
            long action = world.insert("INSERT INTO corrective_action (laboratory_id, round_id, element, item_label, "
                    + "round_code, verdict, cause, action_taken, created_by, created_at, updated_by, updated_at) VALUES "
                    + "(?, ?, 'Cr', 'A', 'MATRIX', 'UNSATISFACTORY', 'A cause', 'An action', 'matrix', now(), 'matrix', "
                    + "now()) RETURNING id", labA, round);
            resolved = resolved.replace("{actionId}", Long.toString(action));
            if (resolved.contains("{attachmentId}")) {
                byte[] pdf = "%PDF-1.7 matrix".getBytes(java.nio.charset.StandardCharsets.US_ASCII);
                long attachment = world.insert("INSERT INTO corrective_action_attachment (action_id, file_name, "
                        + "content_type, bytes, sha256, added_by, added_at) VALUES (?, 'evidence.pdf', 'application/pdf', "
                        + "?, ?, 'matrix', now()) RETURNING id", action, pdf, org.roundtable.platform.Secrets.sha256Hex(pdf));
                resolved = resolved.replace("{attachmentId}", Long.toString(attachment));
            }
        }
        if (resolved.contains("{")) {
            throw new IllegalStateException("no resolver for a placeholder in " + path + "; add one to AuthorizationMatrixTest");
        }
        return resolved;
    }

    /**
     * A precision experiment being evaluated, laboratory A enrolled (not B), with an evaluation run and an issued
     * draft report, written straight into the tables.
     */
    private long precisionStudy() {
        long scheme = world.insert("INSERT INTO scheme (name, material_family, created_at) VALUES (?, 'LOW_ALLOY_STEEL', now()) RETURNING id",
                World.unique("Matrix study"));
        world.insert("INSERT INTO measurand (scheme_id, element, unit, reporting_digits, method_groups) "
                + "VALUES (?, 'C', '%', 4, 'COMBUSTION') RETURNING id", scheme);
        String plan = "{\"format\":\"roundtable-precision-plan-1\",\"levels\":[{\"label\":\"1\",\"material\":\"Steel chips\"}],"
                + "\"measurands\":[\"C\"],\"replicates\":2,\"stragglerLevel\":\"0.05\",\"outlierLevel\":\"0.01\",\"fitRelationship\":true}";
        long round = world.insert("INSERT INTO round (scheme_id, code, kind, item_description, items_per_laboratory, item_labels, "
                + "dispatch_date, result_deadline, deadline_time_zone, instructions, late_policy, state, state_changed_at, created_at) "
                + "VALUES (?, ?, 'PRECISION_EXPERIMENT', 'Steel chips', 1, '1', current_date, now() + interval '30 days', 'UTC', "
                + "'Twice each level.', 'REFUSE', 'EVALUATING', now(), now()) RETURNING id", scheme, World.unique("MX").toUpperCase());
        world.insert("INSERT INTO precision_plan (round_id, plan_version, canonical_json, sha256, reason, frozen_by, frozen_at) "
                + "VALUES (?, 1, ?, ?, 'matrix', 'matrix', now()) RETURNING round_id", round, plan,
                org.roundtable.platform.Secrets.sha256Hex(plan));
        world.insert("INSERT INTO round_participant (round_id, laboratory_id, participant_code, enrolled_at, enrolled_by) "
                + "VALUES (?, ?, 'MTRXAB', now(), 'matrix') RETURNING id", round, labA);
        long run = world.insert("INSERT INTO precision_evaluation_run (round_id, run_number, plan_version, inputs_sha256, result_json, "
                + "created_by, created_at) VALUES (?, 1, 1, ?, ?, 'matrix', now()) RETURNING id", round,
                org.roundtable.platform.Secrets.sha256Hex("none"), "{\"replicates\":2,\"stragglerLevel\":0.05,"
                        + "\"outlierLevel\":0.01,\"fitRelationship\":true,\"measurands\":[]}");
        byte[] bytes = World.unique("precision-document").getBytes(java.nio.charset.StandardCharsets.UTF_8);
        long document = world.insert("INSERT INTO issued_document (report_id, kind, status, round_id, content_type, bytes, sha256, "
                + "issued_at, issued_by) VALUES (?, 'ROUND', 'PRELIMINARY', ?, 'application/pdf', ?, ?, now(), 'matrix') RETURNING id",
                World.unique("MATRIX-P"), round, bytes, org.roundtable.platform.Secrets.sha256Hex(bytes));
        world.insert("INSERT INTO precision_report (document_id, run_id) VALUES (?, ?) RETURNING document_id", document, run);
        return round;
    }

    private static String withMissingIds(String path) {
        return path.replaceAll("\\{[A-Za-z]+}", MISSING_ID);
    }

    static List<Row> rows() {
        List<Row> rows = new ArrayList<>();
        try (var in = AuthorizationMatrixTest.class.getResourceAsStream("/security/authorization-matrix.csv");
             var reader = new BufferedReader(new InputStreamReader(Objects.requireNonNull(in), StandardCharsets.UTF_8))) {
            String line;
            boolean header = true;
            while ((line = reader.readLine()) != null) {
                if (line.isBlank() || line.startsWith("#")) {
                    continue;
                }
                String[] cells = line.split(",", -1);
                if (header) {
                    assertThat(List.of(cells).subList(2, cells.length)).isEqualTo(CALLERS);
                    header = false;
                    continue;
                }
                if (cells.length != CALLERS.size() + 2) {
                    throw new IllegalStateException("matrix row has " + cells.length + " cells: " + line);
                }
                Map<String, String> expected = new LinkedHashMap<>();
                for (int i = 0; i < CALLERS.size(); i++) {
                    expected.put(CALLERS.get(i), cells[i + 2].strip());
                }
                rows.add(new Row(cells[0].strip(), cells[1].strip(), expected));
            }
        } catch (IOException e) {
            throw new IllegalStateException(e);
        }
        return rows;
    }
}
