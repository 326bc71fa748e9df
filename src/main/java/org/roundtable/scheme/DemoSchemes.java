package org.roundtable.scheme;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.transaction.Transactional;
import org.roundtable.scheme.qualification.QualificationService;

import java.time.LocalDate;
import java.time.LocalDateTime;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;

/**
 * The scheme side of the demo scenario (demo.DemoData assembles it): schemes and their catalogues, rounds walked
 * through the real services — plan, enrolment, homogeneity data and decisions, dispatch, opening, closing — so that
 * the audit trail, the hashes and the state table are exercised as in use. Every step runs at the time the demo
 * loader's clock gives it ({@link org.roundtable.platform.LoaderClock}); no date is moved afterwards. Everything is
 * invented: the scheme office, the lots and the numbers (demo only, not reference values).
 */
@ApplicationScoped
public class DemoSchemes {

    /** A measurand of a demo scheme and its plan: fixed σpt (demo), an allowed method-group difference or null. */
    public record DemoMeasurand(String element, String unit, int digits, String min, String max, List<String> groups,
                                String sigmaPt, String allowedGroupDifference) {
    }

    /** A coordinator's decision on a measurand's qualification. */
    public record Decision(String element, String decision, String reason) {
    }

    static final String INSTRUCTIONS = """
            Treat the disc as a routine sample. Grind a fresh surface before analysis and burn at least two spots away \
            from the edge; report the mean of your routine number of burns, not of extra ones. Report each element in \
            the unit and with the decimal places given in the round. Carbon, sulfur and nitrogen may be determined by \
            combustion or inert-gas fusion on chips taken from the disc. Keep the disc until the final report is issued.""";

    private final SchemeService schemes;
    private final RoundService rounds;
    private final EnrolmentService enrolments;
    private final QualificationService qualification;

    public DemoSchemes(SchemeService schemes, RoundService rounds, EnrolmentService enrolments,
                       QualificationService qualification) {
        this.schemes = schemes;
        this.rounds = rounds;
        this.enrolments = enrolments;
        this.qualification = qualification;
    }

    /** A scheme with its measurand catalogue; returns its id. */
    @Transactional
    public long scheme(String name, String materialFamily, List<DemoMeasurand> measurands) {
        SchemeService.SchemeView scheme = schemes.create(new SchemeService.NewScheme(name, materialFamily));
        for (DemoMeasurand m : measurands) {
            schemes.putMeasurand(scheme.id(), new SchemeService.MeasurandEntry(m.element(), m.unit(), m.digits(), m.min(),
                    m.max(), m.groups()));
        }
        return scheme.id();
    }

    /**
     * A round prepared up to dispatch: created with its plan (a consensus by Algorithm A, the fixed σpt of each
     * measurand), the plan frozen, the laboratories enrolled, homogeneity data uploaded, every measurand decided, the
     * qualification confirmed. Returns its id.
     */
    @Transactional
    public long prepare(long schemeId, String code, String itemDescription, LocalDate dispatch, LocalDateTime deadline,
                        List<DemoMeasurand> measurands, List<Long> laboratories, String homogeneityCsv,
                        List<Decision> decisions) {
        RoundService.RoundView round = rounds.create(details(schemeId, code, itemDescription, dispatch, deadline));
        rounds.saveDraftPlan(round.id(), plan(measurands));
        rounds.transition(round.id(), RoundAction.FREEZE_PLAN.name());
        rounds.transition(round.id(), RoundAction.OPEN_ENROLMENT.name());
        for (long lab : laboratories) {
            enrolments.enrol(round.id(), new EnrolmentService.Enrolment(lab, null, null, null, null, null, null));
        }
        if (homogeneityCsv != null) {
            qualification.uploadHomogeneity(round.id(), new QualificationService.Upload(homogeneityCsv));
        }
        Map<String, Decision> byElement = new java.util.HashMap<>();
        decisions.forEach(d -> byElement.put(d.element(), d));
        for (DemoMeasurand m : measurands) {
            Decision d = byElement.getOrDefault(m.element(), new Decision(m.element(), "ACCEPT",
                    "Lot homogeneity for this element shown by the producer's spark OES survey of 20 discs (demo)."));
            qualification.decide(round.id(), new QualificationService.DecisionRequest(d.element(), d.decision(), d.reason()));
        }
        rounds.transition(round.id(), RoundAction.CONFIRM_QUALIFICATION.name());
        return round.id();
    }

    /** Dispatches a prepared round's items. */
    @Transactional
    public void dispatch(long roundId) {
        rounds.transition(roundId, RoundAction.DISPATCH_ITEMS.name());
    }

    /** Opens a dispatched round for results. */
    @Transactional
    public void openForResults(long roundId) {
        rounds.transition(roundId, RoundAction.OPEN_FOR_RESULTS.name());
    }

    /** A laboratory acknowledges its item (label A) in good condition. */
    public void receive(long roundId, long laboratoryId, String username) {
        enrolments.acknowledgeReceiptFor(laboratoryId, new org.roundtable.audit.Actor(username,
                org.roundtable.account.Role.LAB_MANAGER.name(), laboratoryId), roundId,
                new EnrolmentService.Receipt("A", "GOOD", null));
    }

    /** Closes a round for results. */
    @Transactional
    public void close(long roundId) {
        rounds.transition(roundId, RoundAction.CLOSE.name());
    }

    /** A draft round with a draft plan. */
    @Transactional
    public long draft(long schemeId, String code, String itemDescription, LocalDate dispatch, LocalDateTime deadline,
                      List<DemoMeasurand> measurands) {
        RoundService.RoundView draft = rounds.create(details(schemeId, code, itemDescription, dispatch, deadline));
        rounds.saveDraftPlan(draft.id(), plan(measurands));
        return draft.id();
    }

    private static RoundService.RoundDetails details(long schemeId, String code, String items, LocalDate dispatch,
                                                     LocalDateTime deadline) {
        return new RoundService.RoundDetails(schemeId, code, items, 1, List.of("A"), dispatch.toString(),
                deadline.toString(), "Europe/London", INSTRUCTIONS,
                Round.LatePolicy.ACCEPT_FLAGGED_UNSCORED.name(), Round.CodeScope.ROUND.name());
    }

    /** The demo plan: a consensus of all results by Algorithm A, fixed σpt, z or z′. */
    private static EvaluationPlan plan(List<DemoMeasurand> measurands) {
        List<EvaluationPlan.MeasurandPlan> entries = new ArrayList<>();
        for (DemoMeasurand m : measurands) {
            entries.add(new EvaluationPlan.MeasurandPlan(m.element(), "CONSENSUS_ALL", null, null, null, null, null,
                    "FIXED", m.sigmaPt(), null, null, null, null, null, List.of("Z_OR_Z_PRIME"), "10",
                    m.allowedGroupDifference(),
                    "Results reported as \"<\" are not used for the assigned value; obvious blunders are confirmed with the laboratory.",
                    null, null, null));
        }
        return new EvaluationPlan(entries);
    }
}
