package org.roundtable.evaluation;

import com.fasterxml.jackson.databind.ObjectMapper;
import io.quarkus.narayana.jta.QuarkusTransaction;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.audit.Actor;
import org.roundtable.job.Job;
import org.roundtable.job.JobRunner;
import org.roundtable.job.JobService;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.Measurand;
import org.roundtable.scheme.PlanDocument;
import org.roundtable.scheme.Round;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;

import java.math.BigDecimal;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import java.util.TreeSet;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

/**
 * Evaluation runs as background jobs, and the streamed run ({@link RoundEvaluator}: COPY out, COPY in, hashes
 * computed on the fly) against the definitions the run had when it held every result and outcome in memory.
 */
@QuarkusTest
class EvaluationJobsTest {

    private static final Actor COORDINATOR = new Actor("evaluation-jobs-test", "coordinator", null);

    @Inject
    World world;

    @Inject
    EvaluationService evaluations;

    @Inject
    EvaluationAdjustments adjustments;

    @Inject
    EvaluationJobs evaluationJobs;

    @Inject
    EvaluationJobHandler handler;

    @Inject
    JobService jobs;

    @Inject
    JobRunner runner;

    @Inject
    org.roundtable.scheme.PlanStore plans;

    /** Runs queued jobs (the poller is off in tests) until the job has finished. */
    static EvaluationJobs.JobView runUntilFinished(JobRunner runner, EvaluationJobs evaluationJobs, long round,
                                                   long jobId) {
        for (int i = 0; i < 1000; i++) {
            EvaluationJobs.JobView view = evaluationJobs.status(round, jobId);
            if (view.status().equals("SUCCEEDED") || view.status().equals("FAILED")) {
                return view;
            }
            assertThat(runner.runNext()).as("job %d is due", jobId).isTrue();
        }
        throw new AssertionError("job " + jobId + " did not finish");
    }

    private static EvaluationPlan.MeasurandPlan consensus(String element, String sigmaPt) {
        return new EvaluationPlan.MeasurandPlan(element, "CONSENSUS_ALL", null, null, null, null, null, "FIXED",
                sigmaPt, null, null, null, null, null, null, null, null, null, null, null, null);
    }

    /** One revision of the laboratory's submission holding these results ({@code element item value U method}). */
    private void submit(long round, long lab, boolean late, String... results) {
        long submission = world.insert("INSERT INTO submission (round_id, laboratory_id, current_revision, created_at, "
                + "updated_at) VALUES (?, ?, 0, now(), now()) RETURNING id", round, lab);
        String sha = Secrets.sha256Hex(World.unique("payload"));
        long revision = world.insert("INSERT INTO submission_revision (submission_id, revision, channel, receipt_id, "
                + "payload_sha256, canonical_payload, values_sha256, submitted_by, submitted_role, submitted_at, late) "
                + "VALUES (?, 1, 'JSON', ?, ?, '{}', ?, 'test', 'lab-member', now(), ?) RETURNING id",
                submission, World.unique("RCPT"), sha, sha, late);
        for (String result : results) {
            String[] f = result.split(" ");
            boolean lessThan = f[2].startsWith("<");
            BigDecimal number = new BigDecimal(lessThan ? f[2].substring(1) : f[2]);
            String u = f[3].equals("-") ? null : f[3];
            world.insert("INSERT INTO reported_result (revision_id, element, item_label, value_as_reported, "
                    + "unit_as_reported, less_than, reported_number, value_in_measurand_unit, "
                    + "expanded_uncertainty_as_reported, expanded_uncertainty, coverage_factor, method_group, replicates) "
                    + "VALUES (?, ?, ?, ?, '%', ?, ?, ?, ?, ?, 2, ?, 1) RETURNING revision_id", revision, f[0], f[1], f[2],
                    lessThan, number, number, u, u == null ? null : new BigDecimal(u), f[4]);
        }
        world.sql("UPDATE submission SET current_revision = 1 WHERE id = ?", submission);
    }

    /**
     * A round whose frozen plan has Si, Cr and Mn (the plan orders by atomic number, so the run evaluates in another
     * order than the inputs hash reads: element names), Mn withdrawn by a qualification decision (its results are
     * inputs but not evaluated), two items, uncertainties, two method groups (one with a backslash and a non-ASCII
     * letter, to exercise the COPY escapes both ways), a censored and a late result.
     */
    private long mixedRound(Round.LatePolicy latePolicy) {
        long[] labs = new long[8];
        for (int i = 0; i < labs.length; i++) {
            labs[i] = world.laboratory();
        }
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(consensus("Cr", "0.10"),
                consensus("Mn", "0.010"))), latePolicy, labs);
        long scheme = world.insert("SELECT scheme_id FROM round WHERE id = ?", round);
        world.insert("INSERT INTO measurand (scheme_id, element, unit, reporting_digits, expected_min, expected_max, "
                + "method_groups) VALUES (?, 'Si', '%', 2, 0.1, 1.0, 'SPARK_OES,XRF') RETURNING id", scheme);
        List<Measurand> catalogue = new ArrayList<>();
        for (String element : List.of("Cr", "Mn", "Si")) {
            Measurand m = new Measurand();
            m.element = element;
            m.unit = "%";
            m.reportingDigits = 2;
            m.methodGroups = "SPARK_OES,XRF";
            catalogue.add(m);
        }
        String code = world.text("SELECT code FROM round WHERE id = ?", round);
        PlanDocument.Canonical plan = PlanDocument.canonical(new EvaluationPlan(List.of(consensus("Cr", "0.10"),
                        consensus("Mn", "0.010"), consensus("Si", "0.02"))), catalogue,
                new PlanDocument.RoundSettings(code, latePolicy, Round.CodeScope.ROUND), new ObjectMapper());
        world.insert("INSERT INTO evaluation_plan (round_id, plan_version, canonical_json, sha256, reason, frozen_by, "
                + "frozen_at) VALUES (?, 2, ?, ?, 'Si added', 'test', now()) RETURNING round_id", round, plan.json(),
                plan.sha256());
        world.insert("INSERT INTO qualification_decision (round_id, element, decision, reason, decided_by, decided_at) "
                + "VALUES (?, 'Mn', 'WITHDRAW_MEASURAND', 'Inhomogeneous', 'test', now()) RETURNING id", round);
        world.sql("UPDATE round SET item_labels = 'A,B', items_per_laboratory = 2 WHERE id = ?", round);
        String[] mn = {"0.742", "0.7510", "0.748", "0.739", "0.755", "0.746", "0.790", "0.744"};
        String[] cr = {"18.10", "18.2", "17.95", "18.05", "18.00", "18.6", "18.12", "18.08"};
        String[] si = {"0.31", "0.305", "0.29", "0.33", "0.30", "0.312", "0.298", "0.40"};
        for (int i = 0; i < labs.length; i++) {
            String method = i % 3 == 0 ? "xrf" : "spark\\oes-ü";
            String u = i % 2 == 0 ? "0.006" : "-";
            String siB = i == 5 ? "<0.1" : si[(i + 3) % si.length];
            submit(round, labs[i], i == 6, "Cr A " + cr[i] + " 0.08 " + method, "Cr B " + cr[(i + 1) % cr.length]
                    + " - " + method, "Mn A " + mn[i] + " " + u + " " + method, "Si A " + si[i] + " " + u + " " + method,
                    "Si B " + siB + " - " + method);
        }
        return round;
    }

    /** The inputs hash and outcomes as the run computed them before it streamed (all results in memory at once). */
    private record Definition(String inputsSha256, List<EvaluationViews.MeasurandOutcome> outcomes, int results) {
    }

    private Definition earlierDefinition(long round, String latePolicy, boolean lateUnscored) {
        // every result read at once (element, item, participant code order), grouped, evaluated in plan order and
        // item order (the round's items and any item found in the results), hashed as one text / one JSON
        List<EvaluationService.Row> rows = QuarkusTransaction.requiringNew().call(() -> evaluations.currentResults(round));
        String planSha = world.text("SELECT sha256 FROM evaluation_plan WHERE round_id = ? AND plan_version = 2", round);
        StringBuilder inputs = new StringBuilder();
        inputs.append("round ").append(round).append('\n').append("plan ").append(2).append(' ').append(planSha)
                .append('\n').append("late-policy ").append(latePolicy).append('\n');
        for (EvaluationService.Row r : rows) {
            inputs.append(String.join("\t", Long.toString(r.laboratoryId()), r.participantCode(), r.element(),
                    r.itemLabel(), r.reported(), r.value().toPlainString(), Boolean.toString(r.lessThan()),
                    r.expandedUncertainty() == null ? "" : r.expandedUncertainty().toPlainString(),
                    r.coverageFactor() == null ? "" : r.coverageFactor().toPlainString(), r.methodGroup(),
                    Boolean.toString(r.late()))).append('\n');
        }
        Map<String, List<EvaluationService.Row>> byMeasurand = new TreeMap<>();
        rows.forEach(r -> byMeasurand.computeIfAbsent(r.element() + "\u0000" + r.itemLabel(), k -> new ArrayList<>())
                .add(r));
        Set<String> items = new TreeSet<>(List.of("A", "B"));
        rows.forEach(r -> items.add(r.itemLabel()));
        // the round's blunder marks and qualification decisions, as the run loads them, then appended to the inputs
        EvaluationAdjustments.Loaded adjusted = QuarkusTransaction.requiringNew().call(() -> adjustments.load(round));
        adjusted.appendTo(inputs);
        RoundEvaluator.Step step = evaluations.measurandStep(lateUnscored, adjusted);
        List<EvaluationViews.MeasurandOutcome> expected = new ArrayList<>();
        EvaluationPlan frozen = QuarkusTransaction.requiringNew().call(() -> plans.current(round).orElseThrow());
        for (EvaluationPlan.MeasurandPlan mp : frozen.measurands()) {
            if (mp.element().equals("Mn")) {
                continue; // withdrawn
            }
            for (String item : items) {
                expected.add(step.evaluate(mp, "%", item,
                        byMeasurand.getOrDefault(mp.element() + "\u0000" + item, List.of())));
            }
        }
        return new Definition(Secrets.sha256Hex(inputs.toString()), expected, rows.size());
    }

    @Test
    void theStreamedRunHasTheHashesAndOutputsOfTheRunThatHeldEverythingInMemory() {
        long round = mixedRound(Round.LatePolicy.ACCEPT_FLAGGED_UNSCORED);

        EvaluationViews.Run run = evaluations.run(round, false, COORDINATOR);

        Definition expected = earlierDefinition(round, "ACCEPT_FLAGGED_UNSCORED", true);
        assertThat(expected.results()).isEqualTo(40);
        assertThat(run.run().inputsSha256()).isEqualTo(expected.inputsSha256());
        assertThat(run.measurands()).isEqualTo(expected.outcomes());
        assertThat(run.run().outputsSha256()).isEqualTo(EvaluationService.outputsSha256(expected.outcomes()));
        assertThat(run.measurands()).extracting(m -> m.element() + m.itemLabel()).containsExactly("SiA", "SiB", "CrA",
                "CrB");
        assertThat(run.measurands().get(1).censored()).isEqualTo(1);
        assertThat(run.measurands().get(0).excluded()).isEqualTo(1);
        assertThat(run.measurands().get(0).methodGroups()).extracting(EvaluationViews.MethodGroupStatistics::methodGroup)
                .containsExactly("spark\\oes-ü", "xrf");
    }

    @Test
    void aResultForAnItemTheRoundDoesNotListIsEvaluatedForEveryMeasurandAsBefore() {
        long round = mixedRound(Round.LatePolicy.REFUSE);
        // the intake refuses such results; written straight into the tables, the run still treats them as it did
        long lab = world.laboratory();
        world.insert("INSERT INTO round_participant (round_id, laboratory_id, participant_code, enrolled_at, "
                + "enrolled_by) VALUES (?, ?, 'ZZZZ9', now(), 'test') RETURNING id", round, lab);
        submit(round, lab, false, "Si C 0.31 - xrf");

        EvaluationViews.Run run = evaluations.run(round, false, COORDINATOR);

        Definition expected = earlierDefinition(round, "REFUSE", false);
        assertThat(run.run().inputsSha256()).isEqualTo(expected.inputsSha256());
        assertThat(run.measurands()).isEqualTo(expected.outcomes());
        assertThat(run.run().outputsSha256()).isEqualTo(EvaluationService.outputsSha256(expected.outcomes()));
        assertThat(run.measurands()).extracting(m -> m.element() + m.itemLabel()).containsExactly("SiA", "SiB", "SiC",
                "CrA", "CrB", "CrC");
    }

    @Test
    void aRunThroughTheJobReportsProgressAndGivesTheSameOutputsAsADirectRun() {
        long round = mixedRound(Round.LatePolicy.REFUSE);
        EvaluationViews.Run direct = evaluations.run(round, false, COORDINATOR);

        EvaluationJobs.JobView queued = evaluationJobs.start(round, false, COORDINATOR);
        assertThat(queued.status()).isEqualTo("QUEUED");
        assertThat(queued.progress()).isEqualTo(new EvaluationJobs.Progress(0, 0));
        EvaluationJobs.JobView done = runUntilFinished(runner, evaluationJobs, round, queued.jobId());

        assertThat(done.status()).isEqualTo("SUCCEEDED");
        assertThat(done.error()).isNull();
        assertThat(done.version()).isEqualTo(2);
        // four measurands-and-items evaluated; the total was recorded by the run's own progress reports
        assertThat(done.progress()).isEqualTo(new EvaluationJobs.Progress(4, 4));
        EvaluationViews.Run viaJob = evaluations.run(round, 2);
        assertThat(viaJob.run().inputsSha256()).isEqualTo(direct.run().inputsSha256());
        assertThat(viaJob.run().outputsSha256()).isEqualTo(direct.run().outputsSha256());
        assertThat(viaJob.measurands()).isEqualTo(direct.measurands());
        assertThat(viaJob.run().createdBy()).isEqualTo(COORDINATOR.name());

        // the handler reports progress as it goes: first 0 of 4, last 4 of 4
        Job again = jobs.enqueue(EvaluationJobs.KIND, world.text("SELECT payload FROM job WHERE id = ?", queued.jobId()),
                "test");
        List<int[]> reports = new ArrayList<>();
        String result = handler.run(jobs.find(again.id).orElseThrow(), (d, t) -> reports.add(new int[]{d, t}));
        assertThat(result).isEqualTo("{\"version\":3}");
        assertThat(reports.get(0)).containsExactly(0, 4);
        assertThat(reports.get(reports.size() - 1)).containsExactly(4, 4);
    }

    @Test
    void aJobWhoseRunWasCommittedReturnsThatRunWhenItIsClaimedAgain() throws Exception {
        long round = mixedRound(Round.LatePolicy.REFUSE);
        EvaluationJobs.JobView queued = evaluationJobs.start(round, true, COORDINATOR);
        // the run commits with the job's result, then the instance dies before marking the job done
        evaluationJobs.runJob(queued.jobId(), EvaluationJobs.read(world.text("SELECT payload FROM job WHERE id = ?",
                queued.jobId())), (d, t) -> { });

        String result = handler.run(jobs.find(queued.jobId()).orElseThrow(), (d, t) -> { });

        assertThat(result).isEqualTo("{\"version\":1}");
        assertThat(evaluations.runs(round)).hasSize(1);
    }

    @Test
    void aJobTheRoundNoLongerAllowsFailsAtOnceWithTheReasonInsteadOfBeingRetried() {
        long round = mixedRound(Round.LatePolicy.REFUSE);
        EvaluationJobs.JobView queued = evaluationJobs.start(round, false, COORDINATOR);
        // before the job runs, the round moves on to a state in which no evaluation is possible
        world.sql("UPDATE round SET state = 'CANCELLED' WHERE id = ?", round);

        EvaluationJobs.JobView done = runUntilFinished(runner, evaluationJobs, round, queued.jobId());

        assertThat(done.status()).isEqualTo("FAILED");
        assertThat(done.attempts()).as("a refusal is not retried").isEqualTo(1);
        assertThat(done.error()).startsWith("refused: ").contains("CANCELLED");
        assertThat(evaluations.runs(round)).isEmpty();
    }

    @Test
    void aJobOfAnotherRoundAnswersLikeAMissingOne() {
        long round = mixedRound(Round.LatePolicy.REFUSE);
        long other = world.round(RoundState.CLOSED, world.laboratory());
        long job = evaluationJobs.start(round, false, COORDINATOR).jobId();

        assertThat(evaluationJobs.status(round, job).roundId()).isEqualTo(round);
        assertThatThrownBy(() -> evaluationJobs.status(other, job)).isInstanceOf(DomainException.NotFound.class)
                .hasMessage(catchMessage(() -> evaluationJobs.status(round, 987654321L)));
    }

    @Test
    void aScoreRowMustReferenceAnExistingRunAndLaboratory() {
        long round = mixedRound(Round.LatePolicy.REFUSE);
        long lab = world.laboratory();
        evaluations.run(round, true, COORDINATOR);
        long run = world.insert("SELECT id FROM evaluation_run WHERE round_id = ?", round);
        String insert = "INSERT INTO participant_score (run_id, element, item_label, laboratory_id, position, "
                + "participant_code, reported, method_group) VALUES (?, 'Cr', 'Z', ?, 0, 'TEST', '1', 'xrf')";

        assertThatThrownBy(() -> world.sql(insert, 987654321L, lab)).isInstanceOf(IllegalStateException.class)
                .hasStackTraceContaining("does not exist");
        assertThatThrownBy(() -> world.sql(insert, run, 987654321L)).isInstanceOf(IllegalStateException.class)
                .hasStackTraceContaining("does not exist");
        world.sql(insert, run, lab);
    }

    @Test
    void aRunTheRoundDoesNotAllowIsRefusedBeforeAJobIsQueued() {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        long before = Long.parseLong(world.text("SELECT count(*) FROM job"));

        assertThatThrownBy(() -> evaluationJobs.start(round, false, COORDINATOR))
                .isInstanceOf(DomainException.Conflict.class);
        assertThat(Long.parseLong(world.text("SELECT count(*) FROM job"))).isEqualTo(before);
    }

    private static String catchMessage(Runnable action) {
        try {
            action.run();
        } catch (RuntimeException e) {
            return e.getMessage();
        }
        throw new AssertionError("no exception");
    }
}
