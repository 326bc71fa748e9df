package org.roundtable.evaluation;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.transaction.Transactional;
import org.roundtable.scheme.qualification.QualificationService;

import java.util.LinkedHashMap;
import java.util.Map;
import java.util.TreeMap;

/**
 * What an evaluation run takes besides the plan and the results: the blunders marked now
 * ({@link ExclusionService}) and each measurand's latest qualification decision with the between-item SD s_s of
 * its latest homogeneity check and the difference |ȳ1 − ȳ2| of its latest stability check
 * ({@link QualificationService}). Loaded once per run, before the measurands are
 * evaluated, and appended to the run's inputs text.
 */
@ApplicationScoped
public class EvaluationAdjustments {

    private final ExclusionService exclusions;
    private final QualificationService qualification;

    public EvaluationAdjustments(ExclusionService exclusions, QualificationService qualification) {
        this.exclusions = exclusions;
        this.qualification = qualification;
    }

    /**
     * A measurand's latest qualification decision, the s_s of its latest homogeneity check and the difference
     * |ȳ1 − ȳ2| of its latest stability check (each null if there is none).
     */
    public record Decision(String element, String decision, Double betweenItemSd, Double stabilityDifference) {

        /**
         * Whether the decision adds u_hom (and u_stab) to u(x_pt) or widens σpt, and there are the figures to do it
         * with (s_s; for the stability decision also |ȳ1 − ȳ2|).
         */
        public boolean changesNumbers() {
            return betweenItemSd != null
                    && (QualificationService.Decision.ADD_HOMOGENEITY_UNCERTAINTY.name().equals(decision)
                    || QualificationService.Decision.WIDEN_SIGMA_PT.name().equals(decision)
                    || addsStability() && stabilityDifference != null);
        }

        /** Whether the decision is the one that adds u_stab as well as u_hom. */
        public boolean addsStability() {
            return QualificationService.Decision.ADD_HOMOGENEITY_AND_STABILITY_UNCERTAINTY.name().equals(decision);
        }
    }

    /** The adjustments of one run. */
    public record Loaded(Map<String, ExclusionService.Current> exclusions, Map<String, Decision> decisions) {

        /** No blunders, no decisions (for tests of the per-measurand logic). */
        public static final Loaded NONE = new Loaded(Map.of(), Map.of());

        /** The current mark on a result, or null. */
        public ExclusionService.Current exclusionOf(long laboratoryId, String element, String itemLabel) {
            return exclusions.get(ExclusionService.Current.key(laboratoryId, element, itemLabel));
        }

        /** The measurand's latest decision, or null. */
        public Decision decisionOf(String element) {
            return decisions.get(element);
        }

        /**
         * Appends to a run's inputs text, after the result lines, one line per current mark
         * ({@code exclusion <id> <laboratory id> <element> <item> <reason>}, tab-separated, in id order) and one per
         * measurand whose decision changes the numbers ({@code qualification <element> <decision> <s_s>}, in
         * element order; the decision that adds u_stab appends {@code <|ȳ1 − ȳ2|>} as a fifth field). A run without
         * either has exactly the inputs text it had before these lines existed, and a line of the older decisions is
         * unchanged.
         */
        public void appendTo(StringBuilder inputs) {
            exclusions.values().stream().sorted(java.util.Comparator.comparingLong(ExclusionService.Current::id))
                    .forEach(e -> inputs.append(String.join("\t", "exclusion", Long.toString(e.id()),
                            Long.toString(e.laboratoryId()), e.element(), e.itemLabel(), e.reason())).append('\n'));
            new TreeMap<>(decisions).values().stream().filter(Decision::changesNumbers)
                    .forEach(d -> {
                        inputs.append(String.join("\t", "qualification", d.element(), d.decision(),
                                Double.toString(d.betweenItemSd())));
                        if (d.addsStability()) {
                            inputs.append('\t').append(Double.toString(d.stabilityDifference()));
                        }
                        inputs.append('\n');
                    });
        }
    }

    /** Reads the round's current marks and latest decisions (in the run's transaction). */
    @Transactional(Transactional.TxType.MANDATORY)
    public Loaded load(long roundId) {
        Map<String, Decision> decisions = new LinkedHashMap<>();
        for (QualificationService.MeasurandQualification q : qualification.status(roundId)) {
            if (q.decision() != null) {
                decisions.put(q.element(), new Decision(q.element(), q.decision().decision(),
                        q.homogeneity() == null ? null : q.homogeneity().betweenItemSd(),
                        q.stability() == null ? null : q.stability().difference()));
            }
        }
        return new Loaded(exclusions.current(roundId), decisions);
    }
}
