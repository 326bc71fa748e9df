package org.roundtable.scheme;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.scheme.qualification.QualificationService;

import java.time.Clock;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.util.ArrayList;
import java.util.List;

/**
 * The demo's scheme and rounds, loaded through the real services so that the audit trail, the hashes and
 * the state table are exercised as in use. Everything is invented: the scheme office, the numbers (demo only,
 * not reference values). Three rounds:
 * <ul>
 *   <li>NLS-2026-2 — prepared and open for results, the five demo laboratories enrolled, Mn qualified from
 *       homogeneity data, the other measurands accepted by a recorded decision;</li>
 *   <li>NLS-2026-1 — an earlier round: walked to open for results, reported by the demo laboratories, then
 *       closed and its dates and timestamps set back about four months ({@link #closePastRound}; the services
 *       stamp "now" from the injected clock); the demo loader then evaluates it and issues its reports;</li>
 *   <li>NLS-2027-1 — a draft with a draft plan.</li>
 * </ul>
 */
@ApplicationScoped
public class DemoSchemes {

    /** The earlier round the demo shows with its preliminary and final reports. */
    public static final String PAST_ROUND = "NLS-2026-1";

    /** element, unit, digits, expected min, max, method groups, σpt (fixed, demo). */
    record DemoMeasurand(String element, String unit, int digits, String min, String max, List<String> groups, String sigmaPt) {
    }

    static final List<DemoMeasurand> MEASURANDS = List.of(
            new DemoMeasurand("C", "%", 3, "0.02", "1.1", List.of("SPARK_OES", "COMBUSTION"), "0.012"),
            new DemoMeasurand("N", "mg/kg", 0, "10", "550", List.of("INERT_GAS_FUSION", "SPARK_OES"), "9"),
            new DemoMeasurand("Si", "%", 3, "0.02", "1.54", List.of("SPARK_OES", "XRF", "ICP_OES"), "0.010"),
            new DemoMeasurand("P", "%", 4, "0.006", "0.085", List.of("SPARK_OES", "ICP_OES"), "0.0015"),
            new DemoMeasurand("S", "%", 4, "0.001", "0.055", List.of("SPARK_OES", "COMBUSTION"), "0.0012"),
            new DemoMeasurand("Cr", "%", 3, "0.007", "8.14", List.of("SPARK_OES", "XRF", "ICP_OES"), "0.025"),
            new DemoMeasurand("Mn", "%", 3, "0.03", "2.0", List.of("SPARK_OES", "XRF", "ICP_OES"), "0.020"),
            new DemoMeasurand("Ni", "%", 3, "0.006", "5.0", List.of("SPARK_OES", "XRF", "ICP_OES"), "0.015"),
            new DemoMeasurand("Cu", "%", 3, "0.006", "0.5", List.of("SPARK_OES", "ICP_OES"), "0.008"),
            new DemoMeasurand("Mo", "%", 3, "0.007", "1.3", List.of("SPARK_OES", "XRF", "ICP_OES"), "0.010"));

    /**
     * Certified values and their expanded uncertainties U (k = 2) of the demo's disc lots, C to Mo in the order of
     * {@link #MEASURANDS} (invented). With five laboratories a consensus would rest on fewer results than the
     * plan's minimum of 10, so nobody would be scored against it; the demo's rounds are scored against the lot's
     * certified values instead, U ≤ 0.6·σpt so that u(x_pt) ≤ 0.3·σpt and z is used. In the earlier round the fifth
     * laboratory's Mn (0.838 against 0.795, σpt 0.020: z = 2.15) is questionable, so the demo shows more than one
     * verdict.
     */
    static final String[] PAST_LOT_VALUES = {"0.386", "80", "0.233", "0.0142", "0.0091", "0.987", "0.795", "0.152",
        "0.184", "0.241"};
    static final String[] CURRENT_LOT_VALUES = {"0.411", "87", "0.253", "0.0121", "0.0084", "1.054", "0.748", "0.201",
        "0.162", "0.215"};
    static final String[] LOT_UNCERTAINTIES = {"0.005", "4", "0.004", "0.0006", "0.0005", "0.010", "0.008", "0.006",
        "0.003", "0.004"};

    static final String INSTRUCTIONS = """
            Treat the disc as a routine sample. Grind a fresh surface before analysis and burn at least two spots away \
            from the edge; report the mean of your routine number of burns, not of extra ones. Report each element in \
            the unit and with the decimal places given in the round. Carbon, sulfur and nitrogen may be determined by \
            combustion or inert-gas fusion on chips taken from the disc. Keep the disc until the final report is issued.""";

    /** Mn homogeneity data for the open round: 10 discs in duplicate (invented, demo only). */
    static final String MN_HOMOGENEITY = """
            item,replicate,measurand,value
            D03,1,Mn,1.212
            D03,2,Mn,1.208
            D11,1,Mn,1.205
            D11,2,Mn,1.210
            D17,1,Mn,1.214
            D17,2,Mn,1.211
            D24,1,Mn,1.209
            D24,2,Mn,1.206
            D31,1,Mn,1.210
            D31,2,Mn,1.213
            D38,1,Mn,1.207
            D38,2,Mn,1.211
            D45,1,Mn,1.213
            D45,2,Mn,1.209
            D52,1,Mn,1.208
            D52,2,Mn,1.212
            D59,1,Mn,1.211
            D59,2,Mn,1.207
            D66,1,Mn,1.206
            D66,2,Mn,1.209
            """;

    private final SchemeService schemes;
    private final RoundService rounds;
    private final EnrolmentService enrolments;
    private final QualificationService qualification;
    private final EntityManager entityManager;
    private final Clock clock;

    public DemoSchemes(SchemeService schemes, RoundService rounds, EnrolmentService enrolments,
                       QualificationService qualification, EntityManager entityManager, Clock clock) {
        this.schemes = schemes;
        this.rounds = rounds;
        this.enrolments = enrolments;
        this.qualification = qualification;
        this.entityManager = entityManager;
        this.clock = clock;
    }

    /** Loads the scheme and rounds; the demo laboratories must exist already. */
    @Transactional(Transactional.TxType.MANDATORY)
    public void load() {
        SchemeService.SchemeView scheme = schemes.create(new SchemeService.NewScheme("Northmarch low-alloy steel scheme",
                "LOW_ALLOY_STEEL"));
        for (DemoMeasurand m : MEASURANDS) {
            schemes.putMeasurand(scheme.id(), new SchemeService.MeasurandEntry(m.element(), m.unit(), m.digits(), m.min(),
                    m.max(), m.groups()));
        }
        @SuppressWarnings("unchecked")
        List<Number> labs = entityManager.createNativeQuery("SELECT id FROM laboratory ORDER BY id LIMIT 5").getResultList();
        LocalDate today = LocalDate.now(clock);

        // an earlier round: open for results now, so that the demo laboratories report in time; closePastRound then
        // closes it and places it about four months back (the report feature publishes it afterwards)
        walk(scheme.id(), PAST_ROUND, "Low-alloy steel disc, 38 mm, lot 26-014", today.minusDays(2),
                today.plusDays(1), labs, RoundAction.OPEN_FOR_RESULTS, PAST_LOT_VALUES);

        // the current round, open for results
        walk(scheme.id(), "NLS-2026-2", "Low-alloy steel disc, 38 mm, lot 26-031", today.minusDays(5), today.plusDays(23),
                labs, RoundAction.OPEN_FOR_RESULTS, CURRENT_LOT_VALUES);

        // next year's round, still a draft
        RoundService.RoundView draft = rounds.create(details(scheme.id(), "NLS-2027-1",
                "Low-alloy steel disc, 38 mm, lot to be chosen", today.plusDays(60), today.plusDays(88)));
        rounds.saveDraftPlan(draft.id(), plan(null));
    }

    /**
     * Closes the earlier demo round once its laboratories have reported and places it about four months back:
     * dispatch 130 days and the deadline 102 days ago, its timestamps 100 days back. Returns its id.
     */
    @Transactional
    public long closePastRound() {
        long past = ((Number) entityManager.createNativeQuery("SELECT id FROM round WHERE code = :c")
                .setParameter("c", PAST_ROUND).getSingleResult()).longValue();
        rounds.transition(past, RoundAction.CLOSE.name());
        shiftBack(past, 100);
        entityManager.createNativeQuery("""
                UPDATE round SET dispatch_date = dispatch_date - 128,
                       result_deadline = result_deadline - make_interval(days => 103) WHERE id = :r
                """).setParameter("r", past).executeUpdate();
        return past;
    }

    private long walk(long schemeId, String code, String items, LocalDate dispatch, LocalDate deadline, List<Number> labs,
                      RoundAction until, String[] certified) {
        RoundService.RoundView round = rounds.create(details(schemeId, code, items, dispatch, deadline));
        rounds.saveDraftPlan(round.id(), plan(certified));
        rounds.transition(round.id(), RoundAction.FREEZE_PLAN.name());
        rounds.transition(round.id(), RoundAction.OPEN_ENROLMENT.name());
        for (Number lab : labs) {
            enrolments.enrol(round.id(), new EnrolmentService.Enrolment(lab.longValue(), null, null, null, null, null, null));
        }
        qualification.uploadHomogeneity(round.id(), new QualificationService.Upload(MN_HOMOGENEITY));
        for (DemoMeasurand m : MEASURANDS) {
            if (!m.element().equals("Mn")) {
                qualification.decide(round.id(), new QualificationService.DecisionRequest(m.element(), "ACCEPT",
                        "Lot homogeneity for this element shown by the producer's spark OES survey of 20 discs (demo)."));
            }
        }
        rounds.transition(round.id(), RoundAction.CONFIRM_QUALIFICATION.name());
        rounds.transition(round.id(), RoundAction.DISPATCH_ITEMS.name());
        rounds.transition(round.id(), RoundAction.OPEN_FOR_RESULTS.name());
        if (until == RoundAction.CLOSE) {
            rounds.transition(round.id(), RoundAction.CLOSE.name());
        }
        return round.id();
    }

    private void shiftBack(long roundId, int days) {
        entityManager.flush();
        entityManager.createNativeQuery("""
                UPDATE round SET created_at = created_at - make_interval(days => :d),
                       state_changed_at = state_changed_at - make_interval(days => :d) WHERE id = :r
                """).setParameter("d", days).setParameter("r", roundId).executeUpdate();
        entityManager.createNativeQuery("""
                UPDATE item_dispatch SET dispatched_at = dispatched_at - make_interval(days => :d),
                       received_at = dispatched_at - make_interval(days => :d - 3), status = 'RECEIVED',
                       received_by = 'demo', item_condition = 'GOOD' WHERE round_id = :r
                """).setParameter("d", days).setParameter("r", roundId).executeUpdate();
        entityManager.createNativeQuery("""
                UPDATE round_participant SET enrolled_at = enrolled_at - make_interval(days => :d) WHERE round_id = :r
                """).setParameter("d", days).setParameter("r", roundId).executeUpdate();
        entityManager.clear();
    }

    private static RoundService.RoundDetails details(long schemeId, String code, String items, LocalDate dispatch,
                                                     LocalDate deadline) {
        return new RoundService.RoundDetails(schemeId, code, items, 1, List.of("A"), dispatch.toString(),
                LocalDateTime.of(deadline, java.time.LocalTime.of(17, 0)).toString(), "Europe/London", INSTRUCTIONS,
                Round.LatePolicy.ACCEPT_FLAGGED_UNSCORED.name(), Round.CodeScope.ROUND.name());
    }

    /** The demo plan: the lot's certified values where known (null: a consensus, for the draft round). */
    private static EvaluationPlan plan(String[] certified) {
        List<EvaluationPlan.MeasurandPlan> entries = new ArrayList<>();
        for (int i = 0; i < MEASURANDS.size(); i++) {
            DemoMeasurand m = MEASURANDS.get(i);
            entries.add(new EvaluationPlan.MeasurandPlan(m.element(), certified == null ? "CONSENSUS_ALL"
                    : "CERTIFIED_REFERENCE", null, certified == null ? null : certified[i],
                    certified == null ? null : LOT_UNCERTAINTIES[i], certified == null ? null : "2", null,
                    "FIXED", m.sigmaPt(), null, null, null, null, null, List.of("Z_OR_Z_PRIME"), "10",
                    m.element().equals("C") || m.element().equals("S") ? "0.010" : null,
                    "Results reported as \"<\" are not used for the assigned value; obvious blunders are confirmed with the laboratory.",
                    null, null, null));
        }
        return new EvaluationPlan(entries);
    }
}
