package org.roundtable.submission;

import jakarta.enterprise.context.ApplicationScoped;
import org.roundtable.platform.DomainException;
import org.roundtable.scheme.RoundAccess;
import org.roundtable.submission.intake.MassFractionUnit;
import org.roundtable.submission.intake.MeasurandRule;
import org.roundtable.submission.intake.MethodGroup;
import org.roundtable.submission.intake.UploadRules;

import java.math.BigDecimal;
import java.util.EnumSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;

/**
 * Turns a round's open measurands into the intake's {@link UploadRules}: the measurand's own unit and, for
 * convenience, the other mass-fraction unit too (converted exactly); "less than" results allowed; negative results
 * only where the frozen plan allows them for the measurand; a missing expected range means no range warning.
 *
 * <p>The rules are kept per round with the stamp they were built for ({@link RoundAccess.SubmissionHead#rulesStamp()},
 * read with the round row under its lock by every submission), so a submission rebuilds nothing while they hold.
 * Every writer of what they are made of changes the stamp, on any instance: a new frozen plan version
 * ({@code PlanStore}, {@code PrecisionPlanStore}), a qualification decision such as a withdrawn measurand
 * ({@code QualificationService}), a measurand added to or changed in the scheme's catalogue
 * ({@code SchemeService.putMeasurand}, versioned rows, never deleted), any change of the round row itself
 * ({@code Round} is versioned: state, item labels, kind).
 */
@ApplicationScoped
public class SubmissionRules {

    /**
     * What a round's uploads are read with, as of one stamp: for a proficiency test the upload rules and the
     * catalogue's order of elements; for a precision experiment its intake rules.
     */
    record Basis(String stamp, UploadRules upload, org.roundtable.submission.intake.PrecisionIntake.Rules precision,
                 List<String> measurandOrder) {
    }

    /** Rounds whose rules are kept at most (rounds open at once are a handful; past this the cache starts over). */
    private static final int KEPT = 512;
    private final java.util.concurrent.ConcurrentHashMap<Long, Basis> kept = new java.util.concurrent.ConcurrentHashMap<>();

    /** The most replicate values a laboratory may list per result. */
    static final int MAXIMUM_REPLICATES = 10;
    private static final BigDecimal NO_UPPER_BOUND_PERCENT = new BigDecimal("100");
    private static final BigDecimal NO_UPPER_BOUND_MG_PER_KG = new BigDecimal("1000000");

    private final RoundAccess rounds;

    public SubmissionRules(RoundAccess rounds) {
        this.rounds = rounds;
    }

    /** The rules last built for the round, whatever their stamp, or null: for reading an upload before the lock. */
    Basis cached(long roundId) {
        return kept.get(roundId);
    }

    /**
     * The rules for the round as of {@code head}'s stamp: the kept ones when the stamp is theirs, else built now
     * (inside the caller's transaction) and kept.
     */
    Basis current(long roundId, RoundAccess.SubmissionHead head) {
        Basis basis = kept.get(roundId);
        if (basis != null && basis.stamp().equals(head.rulesStamp())) {
            return basis;
        }
        Basis built = head.precisionExperiment()
                ? new Basis(head.rulesStamp(), null, forPrecisionExperiment(roundId).orElseThrow(), List.of())
                : new Basis(head.rulesStamp(), rules(rounds.openMeasurands(roundId), head.window().itemLabels()), null,
                rounds.measurandOrder(roundId));
        if (kept.size() >= KEPT) {
            kept.clear();
        }
        kept.put(roundId, built);
        return built;
    }

    private static UploadRules rules(List<RoundAccess.OpenMeasurand> measurands, List<String> itemLabels) {
        if (measurands.isEmpty()) {
            throw new DomainException.Conflict("This round has no measurand open for results.");
        }
        return new UploadRules(measurands.stream().map(SubmissionRules::rule).toList(), itemLabels, MAXIMUM_REPLICATES);
    }

    /** The intake rules of a precision experiment, or empty for another kind of round. */
    public java.util.Optional<org.roundtable.submission.intake.PrecisionIntake.Rules> forPrecisionExperiment(long roundId) {
        if (!rounds.isPrecisionExperiment(roundId)) {
            return java.util.Optional.empty();
        }
        RoundAccess.PrecisionStudy study = rounds.precisionStudy(roundId)
                .orElseThrow(() -> new DomainException.Conflict("The precision experiment has no frozen plan."));
        java.util.Map<String, MassFractionUnit> units = new java.util.LinkedHashMap<>();
        study.units().forEach((element, unit) -> units.put(element, MassFractionUnit.fromSymbol(unit)
                .orElseThrow(() -> new IllegalStateException("catalogue unit " + unit))));
        return java.util.Optional.of(new org.roundtable.submission.intake.PrecisionIntake.Rules(
                study.plan().levelLabels(), units, study.plan().replicates()));
    }

    static MeasurandRule rule(RoundAccess.OpenMeasurand m) {
        MassFractionUnit unit = MassFractionUnit.fromSymbol(m.unit())
                .orElseThrow(() -> new IllegalStateException("catalogue unit " + m.unit()));
        Set<MethodGroup> methods = EnumSet.noneOf(MethodGroup.class);
        for (String group : m.methodGroups()) {
            methods.add(MethodGroup.fromCode(group.strip().toLowerCase(Locale.ROOT).replace('_', '-'))
                    .orElseThrow(() -> new IllegalStateException("catalogue method group " + group)));
        }
        BigDecimal bound = unit == MassFractionUnit.PERCENT ? NO_UPPER_BOUND_PERCENT : NO_UPPER_BOUND_MG_PER_KG;
        // where the plan accepts negative (blank-corrected) results, a catalogue without a lower end warns of none
        BigDecimal low = m.expectedMin() != null ? m.expectedMin() : m.negativeAllowed() ? bound.negate() : BigDecimal.ZERO;
        BigDecimal high = m.expectedMax() != null ? m.expectedMax() : bound;
        return new MeasurandRule(m.element(), unit, EnumSet.allOf(MassFractionUnit.class), m.reportingDigits(), low, high,
                methods, true, m.negativeAllowed());
    }
}
