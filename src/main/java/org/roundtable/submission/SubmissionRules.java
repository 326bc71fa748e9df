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
 * convenience, the other mass-fraction unit too (converted exactly); "less than" results allowed; a missing
 * expected range means no range warning.
 */
@ApplicationScoped
public class SubmissionRules {

    /** The most replicate values a laboratory may list per result. */
    static final int MAXIMUM_REPLICATES = 10;
    private static final BigDecimal NO_UPPER_BOUND_PERCENT = new BigDecimal("100");
    private static final BigDecimal NO_UPPER_BOUND_MG_PER_KG = new BigDecimal("1000000");

    private final RoundAccess rounds;

    public SubmissionRules(RoundAccess rounds) {
        this.rounds = rounds;
    }

    public UploadRules forRound(long roundId) {
        RoundAccess.SubmissionWindow window = rounds.window(roundId);
        List<RoundAccess.OpenMeasurand> measurands = rounds.openMeasurands(roundId);
        if (measurands.isEmpty()) {
            throw new DomainException.Conflict("This round has no measurand open for results.");
        }
        List<MeasurandRule> rules = measurands.stream().map(SubmissionRules::rule).toList();
        return new UploadRules(rules, window.itemLabels(), MAXIMUM_REPLICATES);
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
        BigDecimal low = m.expectedMin() == null ? BigDecimal.ZERO : m.expectedMin();
        BigDecimal high = m.expectedMax() != null ? m.expectedMax()
                : unit == MassFractionUnit.PERCENT ? NO_UPPER_BOUND_PERCENT : NO_UPPER_BOUND_MG_PER_KG;
        return new MeasurandRule(m.element(), unit, EnumSet.allOf(MassFractionUnit.class), m.reportingDigits(), low, high,
                methods, true);
    }
}
