package org.roundtable.scheme;

import jakarta.ws.rs.core.MultivaluedMap;
import org.roundtable.platform.DomainException;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * The evaluation plan as a form: one row per measurand of the scheme's catalogue, each with the fields of
 * {@link EvaluationPlan.MeasurandPlan}. Posted fields are named {@code <element>.<field>} ({@code Cr.sigmaPt});
 * a row takes part in the plan when {@code <element>.include} is posted. The form only carries what was typed:
 * checking it is {@link PlanDocument}'s, as for a plan sent as JSON, and its problems come back beside the
 * fields they concern ({@link #problems}).
 */
public final class PlanForm {

    /** The text fields of a row, in the order of the plan entry. */
    static final List<String> TEXT_FIELDS = List.of("referenceValue", "referenceExpandedUncertainty", "coverageFactor",
            "sigmaPt", "sigmaPtPercent", "reproducibilitySd", "repeatabilitySd", "replicates", "provisionalSigmaPt",
            "minimumParticipants", "allowedMethodGroupDifference", "exclusionRules", "scoreDecimals",
            "scoreCoverageFactor", "minimumForDataDerivedSigmaPt");
    /** The choice fields of a row. */
    static final List<String> CHOICE_FIELDS = List.of("assignedValueMethod", "methodGroup", "sigmaPtMethod",
            "quartileRule", "stoppingRule", "boundaryRule", "belowMinimum");

    /** The switches of the early warnings (posted as {@code earlyWarnings.<name>} check boxes). */
    static final List<String> WARNING_SWITCHES = List.of("unsatisfactory", "questionable", "bias", "drift");
    /** The numbers of the early warnings (posted as {@code earlyWarnings.<name>}). */
    static final List<String> WARNING_NUMBERS = List.of("questionableInARow", "sameSignRun", "driftRounds", "driftLimit");
    /** Posted with the early-warning fields, so that an unticked box means "off" and not "not in the form". */
    static final String WARNINGS_SHOWN = "earlyWarnings.shown";

    private final List<Row> rows;
    private final Warnings warnings = new Warnings();
    private String error;

    private PlanForm(List<Row> rows) {
        this.rows = rows;
    }

    /** One measurand of the catalogue with what the coordinator chose or typed for it. */
    public static final class Row {
        private final String element;
        private final String unit;
        private final int reportingDigits;
        private final List<String> methodGroups;
        private boolean included;
        private boolean negativeAllowed;
        private final Map<String, String> values = new HashMap<>();
        private final Set<String> scores = new LinkedHashSet<>();
        private final Set<String> experts = new LinkedHashSet<>();
        private final Map<String, String> problems = new HashMap<>();

        Row(Measurand m) {
            this.element = m.element;
            this.unit = m.unit;
            this.reportingDigits = m.reportingDigits;
            this.methodGroups = List.of(m.methodGroups.split(","));
        }

        public String element() {
            return element;
        }

        public String unit() {
            return unit;
        }

        public int reportingDigits() {
            return reportingDigits;
        }

        public List<String> methodGroups() {
            return methodGroups;
        }

        public boolean included() {
            return included;
        }

        /** Whether negative results of this measurand are accepted (blank-corrected trace elements). */
        public boolean negativeAllowed() {
            return negativeAllowed;
        }

        /** The posted name of a field of this row. */
        public String name(String field) {
            return element + "." + field;
        }

        /** The element id of a field of this row. */
        public String id(String field) {
            return element + "-" + field;
        }

        /** What was typed or chosen, or empty text. */
        public String value(String field) {
            String v = values.get(field);
            return v == null ? "" : v;
        }

        /** Whether {@code option} is the choice of {@code field}. */
        public boolean chosen(String field, String option) {
            return option.equals(values.get(field));
        }

        public boolean scored(String score) {
            return scores.contains(score);
        }

        public boolean expert(long laboratoryId) {
            return experts.contains(Long.toString(laboratoryId));
        }

        /** The problem of a field, or null. */
        public String problem(String field) {
            return problems.get(field);
        }

        public boolean hasProblems() {
            return !problems.isEmpty();
        }

        EvaluationPlan.MeasurandPlan plan() {
            return new EvaluationPlan.MeasurandPlan(element, v("assignedValueMethod"), v("methodGroup"),
                    v("referenceValue"), v("referenceExpandedUncertainty"), v("coverageFactor"),
                    experts.isEmpty() ? null : List.copyOf(experts), v("sigmaPtMethod"), v("sigmaPt"),
                    v("sigmaPtPercent"), v("reproducibilitySd"), v("repeatabilitySd"), v("replicates"),
                    v("provisionalSigmaPt"), scores.isEmpty() ? null : List.copyOf(scores), v("minimumParticipants"),
                    v("allowedMethodGroupDifference"), v("exclusionRules"), v("quartileRule"), v("stoppingRule"),
                    v("boundaryRule"), v("scoreDecimals"), v("scoreCoverageFactor"),
                    v("minimumForDataDerivedSigmaPt"), v("belowMinimum"), negativeAllowed ? "true" : null);
        }

        private String v(String field) {
            String value = values.get(field);
            return value == null || value.isBlank() ? null : value.strip();
        }

        private void put(String field, String value) {
            if (value != null && !value.isBlank()) {
                values.put(field, value);
            }
        }

        private void defaults() {
            values.putIfAbsent("assignedValueMethod", EvaluationPlan.AssignedValueMethod.CONSENSUS_ALL.name());
            values.putIfAbsent("sigmaPtMethod", EvaluationPlan.SigmaPtMethod.FIXED.name());
            values.putIfAbsent("boundaryRule", EvaluationPlan.BoundaryRule.SATISFACTORY_TO_2_UNSATISFACTORY_FROM_3.name());
            values.putIfAbsent("belowMinimum", EvaluationPlan.BelowMinimum.NOT_SCORED.name());
            if (scores.isEmpty()) {
                scores.add(EvaluationPlan.Score.Z_OR_Z_PRIME.name());
            }
        }
    }

    /** The plan's early warnings as the form shows them: each switch, each number as typed, problems per field. */
    public static final class Warnings {
        private final Map<String, String> values = new HashMap<>();
        private final Map<String, String> problems = new HashMap<>();

        /** Whether the rule {@code name} is switched on. */
        public boolean on(String name) {
            return "true".equals(values.get(name));
        }

        /** A number as typed (or the plan's), or empty text. */
        public String value(String name) {
            String v = values.get(name);
            return v == null ? "" : v;
        }

        /** The posted name of a field. */
        public String name(String field) {
            return "earlyWarnings." + field;
        }

        /** The element id of a field. */
        public String id(String field) {
            return "warnings-" + field;
        }

        /** The problem of a field, or null. */
        public String problem(String field) {
            return problems.get(field);
        }

        public boolean hasProblems() {
            return !problems.isEmpty();
        }

        private void fill(EvaluationPlan.EarlyWarningPlan w) {
            EvaluationPlan.EarlyWarningPlan d = PlanDocument.DEFAULT_EARLY_WARNINGS;
            EvaluationPlan.EarlyWarningPlan p = w == null ? d : w;
            values.put("unsatisfactory", or(p.unsatisfactory(), d.unsatisfactory()));
            values.put("questionable", or(p.questionable(), d.questionable()));
            values.put("questionableInARow", or(p.questionableInARow(), d.questionableInARow()));
            values.put("bias", or(p.bias(), d.bias()));
            values.put("sameSignRun", or(p.sameSignRun(), d.sameSignRun()));
            values.put("drift", or(p.drift(), d.drift()));
            values.put("driftRounds", or(p.driftRounds(), d.driftRounds()));
            values.put("driftLimit", or(p.driftLimit(), d.driftLimit()));
        }

        private static String or(String value, String fallback) {
            return value == null ? fallback : value;
        }

        EvaluationPlan.EarlyWarningPlan plan() {
            return new EvaluationPlan.EarlyWarningPlan(values.get("unsatisfactory"), values.get("questionable"),
                    v("questionableInARow"), values.get("bias"), v("sameSignRun"), values.get("drift"),
                    v("driftRounds"), v("driftLimit"));
        }

        private String v(String field) {
            String value = values.get(field);
            return value == null || value.isBlank() ? null : value.strip();
        }
    }

    public List<Row> rows() {
        return rows;
    }

    /** The early warnings of the plan. */
    public Warnings warnings() {
        return warnings;
    }

    /** The laboratories chosen as experts in any row (their ids), for the expert lists' choices. */
    public Set<Long> chosenExperts() {
        Set<Long> ids = new LinkedHashSet<>();
        for (Row row : rows) {
            for (String id : row.experts) {
                try {
                    ids.add(Long.parseLong(id.strip()));
                } catch (NumberFormatException e) {
                    // not a laboratory number: the save refuses it beside the field
                }
            }
        }
        return ids;
    }

    /** The problem of the whole form (shown above it), or null. */
    public String error() {
        return error;
    }

    public boolean hasProblems() {
        return error != null || warnings.hasProblems() || rows.stream().anyMatch(Row::hasProblems);
    }

    /**
     * The form for a catalogue, filled from a plan (the round's draft or frozen plan, or one to copy): rows of
     * planned measurands are ticked; without a plan every row is ticked with the usual choices. Entries for
     * elements outside the catalogue are dropped (their names are returned by {@link #dropped}).
     */
    static PlanForm of(List<Measurand> catalogue, EvaluationPlan plan) {
        PlanForm form = new PlanForm(catalogue.stream().map(Row::new).toList());
        form.warnings.fill(plan == null ? null : plan.earlyWarnings());
        Map<String, EvaluationPlan.MeasurandPlan> byElement = new HashMap<>();
        if (plan != null && plan.measurands() != null) {
            plan.measurands().forEach(p -> byElement.put(p.element(), p));
        }
        for (Row row : form.rows) {
            EvaluationPlan.MeasurandPlan p = byElement.get(row.element);
            row.included = p != null || byElement.isEmpty();
            if (p != null) {
                row.put("assignedValueMethod", p.assignedValueMethod());
                row.put("methodGroup", p.methodGroup());
                row.put("referenceValue", p.referenceValue());
                row.put("referenceExpandedUncertainty", p.referenceExpandedUncertainty());
                row.put("coverageFactor", p.coverageFactor());
                if (p.expertLaboratories() != null) {
                    row.experts.addAll(p.expertLaboratories());
                }
                row.put("sigmaPtMethod", p.sigmaPtMethod());
                row.put("sigmaPt", p.sigmaPt());
                row.put("sigmaPtPercent", p.sigmaPtPercent());
                row.put("reproducibilitySd", p.reproducibilitySd());
                row.put("repeatabilitySd", p.repeatabilitySd());
                row.put("replicates", p.replicates());
                row.put("provisionalSigmaPt", p.provisionalSigmaPt());
                if (p.scores() != null) {
                    row.scores.addAll(p.scores());
                }
                row.put("minimumParticipants", p.minimumParticipants());
                row.put("allowedMethodGroupDifference", p.allowedMethodGroupDifference());
                row.put("exclusionRules", p.exclusionRules());
                row.put("quartileRule", p.quartileRule());
                row.put("stoppingRule", p.stoppingRule());
                row.put("boundaryRule", p.boundaryRule());
                row.put("scoreDecimals", p.scoreDecimals());
                row.put("scoreCoverageFactor", p.scoreCoverageFactor());
                row.put("minimumForDataDerivedSigmaPt", p.minimumForDataDerivedSigmaPt());
                row.put("belowMinimum", p.belowMinimum());
                row.negativeAllowed = p.negativeResultsAllowed();
            }
            row.defaults();
        }
        return form;
    }

    /** Elements of {@code plan} that are not in the catalogue (left out of the form). */
    static List<String> dropped(List<Measurand> catalogue, EvaluationPlan plan) {
        Set<String> known = new java.util.HashSet<>();
        catalogue.forEach(m -> known.add(m.element));
        return plan == null || plan.measurands() == null ? List.of()
                : plan.measurands().stream().map(EvaluationPlan.MeasurandPlan::element).filter(e -> !known.contains(e)).toList();
    }

    /** The form as posted: every value kept exactly as typed, so that a refused save shows it again. */
    static PlanForm posted(List<Measurand> catalogue, MultivaluedMap<String, String> posted) {
        PlanForm form = new PlanForm(catalogue.stream().map(Row::new).toList());
        if (posted.containsKey(WARNINGS_SHOWN)) {
            for (String name : WARNING_SWITCHES) {
                form.warnings.values.put(name, posted.containsKey("earlyWarnings." + name) ? "true" : "false");
            }
            for (String name : WARNING_NUMBERS) {
                String typed = posted.getFirst("earlyWarnings." + name);
                form.warnings.values.put(name, typed == null ? "" : typed);
            }
        } else {
            form.warnings.fill(null); // a client that does not post the section keeps the usual warnings
        }
        for (Row row : form.rows) {
            row.included = posted.containsKey(row.name("include"));
            row.negativeAllowed = posted.containsKey(row.name("negativeAllowed"));
            for (String field : TEXT_FIELDS) {
                row.put(field, posted.getFirst(row.name(field)));
            }
            for (String field : CHOICE_FIELDS) {
                row.put(field, posted.getFirst(row.name(field)));
            }
            List<String> scores = posted.get(row.name("scores"));
            if (scores != null) {
                scores.stream().filter(s -> s != null && !s.isBlank()).forEach(row.scores::add);
            }
            List<String> experts = posted.get(row.name("expertLaboratories"));
            if (experts != null) {
                experts.stream().filter(s -> s != null && !s.isBlank()).forEach(row.experts::add);
            }
        }
        return form;
    }

    /** The plan of the ticked rows, in catalogue order; refused when no row is ticked. */
    EvaluationPlan plan() {
        List<EvaluationPlan.MeasurandPlan> entries = new ArrayList<>();
        for (Row row : rows) {
            if (row.included) {
                entries.add(row.plan());
            }
        }
        if (entries.isEmpty()) {
            throw new DomainException.BadRequest("Tick at least one measurand to evaluate.");
        }
        return new EvaluationPlan(entries, warnings.plan());
    }

    /**
     * Puts a refusal beside the field it concerns (the plan entry and field named in its detail), or above the
     * form when it names none.
     */
    PlanForm problems(DomainException e) {
        List<Row> ticked = rows.stream().filter(r -> r.included).toList();
        String first = null;
        for (DomainException.Detail d : e.details()) {
            if (d.row() == null && d.column() != null && d.column().startsWith("earlyWarnings.")) {
                warnings.problems.put(d.column().substring("earlyWarnings.".length()), d.message());
                if (first == null) {
                    first = "Early warnings: " + d.message();
                }
                continue;
            }
            if (d.row() != null && d.column() != null && d.row() >= 1 && d.row() <= ticked.size()) {
                Row row = ticked.get(d.row() - 1);
                row.problems.put(d.column(), d.message());
                if (first == null) {
                    first = row.element + ": " + d.message();
                }
            }
        }
        error = first != null ? "The plan is not saved — " + first + " See the field marked below." : e.detail();
        return this;
    }

    /** A problem above the form. */
    PlanForm error(String message) {
        this.error = message;
        return this;
    }
}
