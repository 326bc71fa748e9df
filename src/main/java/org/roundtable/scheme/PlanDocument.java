package org.roundtable.scheme;

import com.fasterxml.jackson.core.io.JsonStringEncoder;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Labels;
import org.roundtable.platform.Secrets;
import org.roundtable.statistics.robust.AlgorithmA;
import org.roundtable.statistics.robust.QuartileRule;

import java.math.BigDecimal;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;

/**
 * Checks an {@link EvaluationPlan} against the scheme's catalogue and writes its canonical JSON.
 *
 * <p>Canonical form: a JSON object with keys sorted by code point at every level, no insignificant
 * whitespace, absent values left out (never {@code null}), numbers kept as the decimal strings that were
 * entered, measurands in order of atomic number, score lists in the order of {@link EvaluationPlan.Score}.
 * Defaults are written out (minimum participants 10, minimum for a data-derived σpt 10, not scored below them,
 * quartile rule, stopping rule, boundary rule, coverage factor 2, score decimals 2, En at k = 2, scores z/z′, the
 * early warnings of laboratories' histories all on with {@link #DEFAULT_EARLY_WARNINGS}), so the document states
 * every choice — except {@code negativeAllowed}, written only as {@code "true"} where the plan accepts negative
 * results of a measurand (absent: refused), so that plans frozen before it existed read the same. The document also
 * carries what the round
 * fixes for evaluation: its code, the late-result policy and the participant-code scope, and each
 * measurand's unit and reporting digits from the catalogue. The SHA-256 of the UTF-8 bytes of this text is
 * the plan's hash.
 */
public final class PlanDocument {

    /** Identifies the layout of the canonical document. */
    public static final String FORMAT = "roundtable-evaluation-plan-1";
    public static final int DEFAULT_MINIMUM_PARTICIPANTS = 10;
    /** Fewest results for σpt = the round's robust SD when the plan states none (common practice, no source). */
    public static final int DEFAULT_MINIMUM_FOR_DATA_DERIVED_SIGMA_PT = 10;
    /** Score decimals when the plan states none. */
    public static final int DEFAULT_SCORE_DECIMALS = org.roundtable.platform.NumberFormats.DEFAULT_SCORE_DECIMALS;
    /** Early warnings when the plan states none (common practice, no source): every rule on with these numbers. */
    public static final EvaluationPlan.EarlyWarningPlan DEFAULT_EARLY_WARNINGS = new EvaluationPlan.EarlyWarningPlan(
            "true", "true", "2", "true", "6", "true", "3", "2");

    private PlanDocument() {
    }

    /** The canonical JSON and its SHA-256 hex. */
    public record Canonical(String json, String sha256) {
    }

    /** Round settings that the plan fixes. */
    public record RoundSettings(String roundCode, Round.LatePolicy latePolicy, Round.CodeScope codeScope) {
    }

    /** Validates the plan against the catalogue and returns its canonical form. */
    public static Canonical canonical(EvaluationPlan plan, List<Measurand> catalogue, RoundSettings round,
                                      ObjectMapper mapper) {
        if (plan == null || plan.measurands() == null || plan.measurands().isEmpty()) {
            throw new DomainException.BadRequest("The plan needs at least one measurand.");
        }
        Map<String, Measurand> byElement = new java.util.HashMap<>();
        catalogue.forEach(m -> byElement.put(m.element, m));
        Set<String> seen = new HashSet<>();
        List<ObjectNode> entries = new ArrayList<>();
        for (int i = 0; i < plan.measurands().size(); i++) {
            EvaluationPlan.MeasurandPlan p = plan.measurands().get(i);
            Where where = new Where(i + 1, "Plan entry " + (i + 1));
            if (p == null) {
                throw new DomainException.BadRequest(where + " is empty.");
            }
            String element = ChemicalElement.require(p.element());
            Measurand m = byElement.get(element);
            if (m == null) {
                throw where.fail("element", element + " is not in the scheme's measurand catalogue.");
            }
            if (!seen.add(element)) {
                throw where.fail("element", element + " is planned twice.");
            }
            entries.add(entry(p, m, new Where(i + 1, where + " (" + element + ")"), mapper));
        }
        entries.sort(Comparator.comparingInt(e -> ChemicalElement.atomicNumber(e.get("element").asText())));
        ObjectNode root = mapper.createObjectNode();
        root.put("format", FORMAT);
        root.put("roundCode", round.roundCode());
        root.put("latePolicy", round.latePolicy().name());
        root.put("participantCodeScope", round.codeScope().name());
        ArrayNode array = root.putArray("measurands");
        entries.forEach(array::add);
        root.set("earlyWarnings", earlyWarnings(plan.earlyWarnings(), mapper));
        String json = write(root);
        return new Canonical(json, Secrets.sha256Hex(json));
    }

    /** Reads a stored canonical document back into a plan. */
    public static EvaluationPlan read(String canonicalJson, ObjectMapper mapper) {
        try {
            return mapper.readerFor(EvaluationPlan.class)
                    .without(com.fasterxml.jackson.databind.DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES)
                    .readValue(canonicalJson);
        } catch (java.io.IOException e) {
            throw new IllegalStateException("stored plan is not readable", e);
        }
    }

    private static ObjectNode entry(EvaluationPlan.MeasurandPlan p, Measurand m, Where where, ObjectMapper mapper) {
        ObjectNode e = mapper.createObjectNode();
        e.put("element", m.element);
        e.put("unit", m.unit);
        e.put("reportingDigits", Integer.toString(m.reportingDigits));
        List<String> groups = List.of(m.methodGroups.split(","));

        EvaluationPlan.AssignedValueMethod assigned = choice(EvaluationPlan.AssignedValueMethod.class,
                p.assignedValueMethod(), where, "assignedValueMethod", "assigned-value method");
        e.put("assignedValueMethod", assigned.name());
        switch (assigned) {
            case CONSENSUS_METHOD_GROUP -> {
                MethodGroup group = choice(MethodGroup.class, p.methodGroup(), where, "methodGroup", "method group");
                if (!groups.contains(group.name())) {
                    throw where.fail("methodGroup", "method group " + group
                            + " is not allowed for this measurand in the catalogue.", "method group "
                            + Labels.of(group) + " is not allowed for this measurand in the catalogue.");
                }
                e.put("methodGroup", group.name());
            }
            case CERTIFIED_REFERENCE, REFERENCE_LABORATORY -> {
                e.put("referenceValue", positive(p.referenceValue(), where, "referenceValue", "reference value"));
                e.put("referenceExpandedUncertainty",
                        positive(p.referenceExpandedUncertainty(), where, "referenceExpandedUncertainty", "expanded uncertainty U of the reference value"));
                e.put("coverageFactor", p.coverageFactor() == null || p.coverageFactor().isBlank() ? "2"
                        : positive(p.coverageFactor(), where, "coverageFactor", "coverage factor"));
            }
            case EXPERT_CONSENSUS -> {
                if (p.expertLaboratories() == null || p.expertLaboratories().size() < 2) {
                    throw where.fail("expertLaboratories", "an expert consensus names at least two expert laboratories.");
                }
                ArrayNode experts = e.putArray("expertLaboratories");
                new TreeSet<>(p.expertLaboratories().stream().map(id -> integer(id, where, "expertLaboratories", "expert laboratory id"))
                        .map(Long::parseLong).toList()).forEach(id -> experts.add(Long.toString(id)));
            }
            default -> {
            }
        }
        boolean consensus = assigned == EvaluationPlan.AssignedValueMethod.CONSENSUS_ALL
                || assigned == EvaluationPlan.AssignedValueMethod.CONSENSUS_METHOD_GROUP
                || assigned == EvaluationPlan.AssignedValueMethod.EXPERT_CONSENSUS;

        EvaluationPlan.SigmaPtMethod sigma = choice(EvaluationPlan.SigmaPtMethod.class, p.sigmaPtMethod(), where,
                "sigmaPtMethod", "σpt method");
        e.put("sigmaPtMethod", sigma.name());
        boolean dependsOnRoundData = false;
        switch (sigma) {
            case FIXED, EARLIER_ROUNDS -> e.put("sigmaPt", positive(p.sigmaPt(), where, "sigmaPt", "σpt"));
            case PERCENT_OF_ASSIGNED -> {
                e.put("sigmaPtPercent", positive(p.sigmaPtPercent(), where, "sigmaPtPercent", "σpt in % of the assigned value"));
                dependsOnRoundData = consensus;
            }
            case HORWITZ_THOMPSON -> dependsOnRoundData = consensus;
            case PRECISION_DATA -> {
                String sR = positive(p.reproducibilitySd(), where, "reproducibilitySd", "reproducibility SD σR");
                String sr = positive(p.repeatabilitySd(), where, "repeatabilitySd", "repeatability SD σr");
                if (new BigDecimal(sr).compareTo(new BigDecimal(sR)) > 0) {
                    throw where.fail("repeatabilitySd", "σr cannot exceed σR.");
                }
                e.put("reproducibilitySd", sR);
                e.put("repeatabilitySd", sr);
                e.put("replicates", integer(p.replicates(), where, "replicates", "number of replicates n"));
            }
            case ROBUST_SD_OF_ROUND -> {
                dependsOnRoundData = true;
                e.put("sigmaPtDataDerived", "true");
            }
        }
        if (dependsOnRoundData) {
            e.put("provisionalSigmaPt", positive(p.provisionalSigmaPt(), where, "provisionalSigmaPt",
                    "provisional σpt (needed for sample qualification, because σpt depends on the round's data)"));
        } else if (p.provisionalSigmaPt() != null && !p.provisionalSigmaPt().isBlank()) {
            throw where.fail("provisionalSigmaPt", "a provisional σpt is only for σpt methods that depend on the round's data.");
        }

        TreeSet<EvaluationPlan.Score> scores = new TreeSet<>();
        if (p.scores() == null || p.scores().isEmpty()) {
            scores.add(EvaluationPlan.Score.Z_OR_Z_PRIME);
        } else {
            for (String s : p.scores()) {
                scores.add(choice(EvaluationPlan.Score.class, s, where, "scores", "score"));
            }
        }
        if (scores.contains(EvaluationPlan.Score.EN) && consensus) {
            throw where.fail("scores", "En needs a reference value with its expanded uncertainty,"
                    + " not a consensus value.");
        }
        ArrayNode scoreArray = e.putArray("scores");
        scores.forEach(s -> scoreArray.add(s.name()));

        e.put("minimumParticipants", p.minimumParticipants() == null || p.minimumParticipants().isBlank()
                ? Integer.toString(DEFAULT_MINIMUM_PARTICIPANTS) : integer(p.minimumParticipants(), where, "minimumParticipants", "minimum participants"));
        e.put("minimumForDataDerivedSigmaPt", blank(p.minimumForDataDerivedSigmaPt())
                ? Integer.toString(DEFAULT_MINIMUM_FOR_DATA_DERIVED_SIGMA_PT)
                : integer(p.minimumForDataDerivedSigmaPt(), where, "minimumForDataDerivedSigmaPt", "minimum participants for a data-derived σpt"));
        e.put("belowMinimum", blank(p.belowMinimum()) ? EvaluationPlan.BelowMinimum.NOT_SCORED.name()
                : choice(EvaluationPlan.BelowMinimum.class, p.belowMinimum(), where, "belowMinimum", "rule below the minimum").name());
        if (!blank(p.negativeAllowed())) {
            String allowed = p.negativeAllowed().strip().toLowerCase(Locale.ROOT);
            if (!allowed.equals("true") && !allowed.equals("false")) {
                throw where.fail("negativeAllowed", "negative results are either allowed (true) or refused (false).");
            }
            // written only when allowed: a plan that says nothing refuses them, and plans frozen before the
            // setting existed keep their text and hash
            if (allowed.equals("true")) {
                e.put("negativeAllowed", "true");
            }
        }
        if (blank(p.scoreDecimals())) {
            e.put("scoreDecimals", Integer.toString(DEFAULT_SCORE_DECIMALS));
        } else {
            String decimals = p.scoreDecimals().strip();
            if (!decimals.matches("[0-6]")) {
                throw where.fail("scoreDecimals", "the score decimals are a whole number from 0 to 6.");
            }
            e.put("scoreDecimals", decimals);
        }
        e.put("scoreCoverageFactor", blank(p.scoreCoverageFactor()) ? "2"
                : positive(p.scoreCoverageFactor(), where, "scoreCoverageFactor", "coverage factor k of En"));
        if (p.allowedMethodGroupDifference() != null && !p.allowedMethodGroupDifference().isBlank()) {
            e.put("allowedMethodGroupDifference", positive(p.allowedMethodGroupDifference(), where, "allowedMethodGroupDifference",
                    "allowed difference between method groups"));
        }
        if (p.exclusionRules() != null && !p.exclusionRules().isBlank()) {
            if (p.exclusionRules().length() > 2000) {
                throw where.fail("exclusionRules", "the exclusion rules have at most 2000 characters.");
            }
            e.put("exclusionRules", p.exclusionRules().strip());
        }
        e.put("quartileRule", p.quartileRule() == null || p.quartileRule().isBlank() ? QuartileRule.DEFAULT.name()
                : choice(QuartileRule.class, p.quartileRule(), where, "quartileRule", "quartile rule").name());
        e.put("stoppingRule", p.stoppingRule() == null || p.stoppingRule().isBlank()
                ? AlgorithmA.StoppingRule.FULL_CONVERGENCE.name()
                : choice(AlgorithmA.StoppingRule.class, p.stoppingRule(), where, "stoppingRule", "stopping rule").name());
        e.put("boundaryRule", p.boundaryRule() == null || p.boundaryRule().isBlank()
                ? EvaluationPlan.BoundaryRule.SATISFACTORY_TO_2_UNSATISFACTORY_FROM_3.name()
                : choice(EvaluationPlan.BoundaryRule.class, p.boundaryRule(), where, "boundaryRule", "boundary rule").name());
        return e;
    }

    /**
     * The early warnings with the defaults filled in; a refusal names the field ({@code earlyWarnings.<name>},
     * no entry) so that a form shows it beside the field.
     */
    private static ObjectNode earlyWarnings(EvaluationPlan.EarlyWarningPlan given, ObjectMapper mapper) {
        EvaluationPlan.EarlyWarningPlan w = given == null ? DEFAULT_EARLY_WARNINGS : given;
        EvaluationPlan.EarlyWarningPlan d = DEFAULT_EARLY_WARNINGS;
        ObjectNode e = mapper.createObjectNode();
        e.put("unsatisfactory", switchValue(w.unsatisfactory(), d.unsatisfactory(), "unsatisfactory"));
        e.put("questionable", switchValue(w.questionable(), d.questionable(), "questionable"));
        e.put("questionableInARow", whole(w.questionableInARow(), d.questionableInARow(), 2, 20, "questionableInARow",
                "questionable results in a row"));
        e.put("bias", switchValue(w.bias(), d.bias(), "bias"));
        e.put("sameSignRun", whole(w.sameSignRun(), d.sameSignRun(), 2, 40, "sameSignRun", "scores of one sign in a row"));
        e.put("drift", switchValue(w.drift(), d.drift(), "drift"));
        e.put("driftRounds", whole(w.driftRounds(), d.driftRounds(), 2, 20, "driftRounds", "rounds of increasing |z|"));
        String limit = blank(w.driftLimit()) ? d.driftLimit() : w.driftLimit().strip();
        if (!limit.matches("[0-9]{1,2}(\\.[0-9]{1,6})?") || new BigDecimal(limit).signum() <= 0
                || new BigDecimal(limit).compareTo(BigDecimal.TEN) > 0) {
            throw warningFail("driftLimit", "the last |z| of a drift is a positive decimal number up to 10, such as 2 or 2.5.");
        }
        e.put("driftLimit", limit);
        return e;
    }

    private static String switchValue(String value, String fallback, String field) {
        String clean = blank(value) ? fallback : value.strip().toLowerCase(Locale.ROOT);
        if (!clean.equals("true") && !clean.equals("false")) {
            throw warningFail(field, "a warning is switched on (true) or off (false).");
        }
        return clean;
    }

    private static String whole(String value, String fallback, int min, int max, String field, String what) {
        String clean = blank(value) ? fallback : value.strip();
        if (!clean.matches("[0-9]{1,3}") || Integer.parseInt(clean) < min || Integer.parseInt(clean) > max) {
            throw warningFail(field, "the number of " + what + " is a whole number from " + min + " to " + max + ".");
        }
        return Integer.toString(Integer.parseInt(clean));
    }

    private static DomainException warningFail(String field, String message) {
        String sentence = Character.toUpperCase(message.charAt(0)) + message.substring(1);
        return new DomainException.BadRequest("Early warnings: " + message, List.of(new DomainException.Detail(null,
                "earlyWarnings." + field, null, "plan.earlyWarnings." + field, sentence)));
    }

    /**
     * The σpt to judge sample qualification against, in the measurand's unit: the planned value when the
     * plan fixes it before the round's data exist, else the provisional σpt. Empty if neither can be
     * known before results (never the case for a plan that passed {@link #canonical}).
     */
    public static java.util.Optional<QualificationSigma> qualificationSigma(EvaluationPlan.MeasurandPlan p, String unit) {
        if (p.provisionalSigmaPt() != null) {
            return java.util.Optional.of(new QualificationSigma(Double.parseDouble(p.provisionalSigmaPt()), "provisional"));
        }
        EvaluationPlan.SigmaPtMethod sigma = EvaluationPlan.SigmaPtMethod.valueOf(p.sigmaPtMethod());
        Double reference = p.referenceValue() == null ? null : Double.parseDouble(p.referenceValue());
        return switch (sigma) {
            case FIXED, EARLIER_ROUNDS -> java.util.Optional.of(new QualificationSigma(Double.parseDouble(p.sigmaPt()), "planned"));
            case PRECISION_DATA -> java.util.Optional.of(new QualificationSigma(
                    org.roundtable.statistics.sigma.SigmaPt.fromPrecision(Double.parseDouble(p.reproducibilitySd()),
                            Double.parseDouble(p.repeatabilitySd()), Integer.parseInt(p.replicates())), "planned (precision data)"));
            case PERCENT_OF_ASSIGNED -> reference == null ? java.util.Optional.empty() : java.util.Optional.of(
                    new QualificationSigma(Double.parseDouble(p.sigmaPtPercent()) / 100 * reference, "planned (% of reference value)"));
            case HORWITZ_THOMPSON -> reference == null ? java.util.Optional.empty() : java.util.Optional.of(
                    new QualificationSigma(org.roundtable.statistics.sigma.SigmaPt.thompsonHorwitz(reference,
                            "%".equals(unit) ? org.roundtable.statistics.sigma.MassFractionUnit.PERCENT
                                    : org.roundtable.statistics.sigma.MassFractionUnit.MILLIGRAMS_PER_KILOGRAM), "planned (Horwitz/Thompson at the reference value)"));
            case ROBUST_SD_OF_ROUND -> java.util.Optional.empty();
        };
    }

    /** σpt for qualification and where it came from. */
    public record QualificationSigma(double value, String source) {
    }

    /** Writes a tree with sorted keys, no whitespace, no nulls. */
    static String write(JsonNode node) {
        StringBuilder out = new StringBuilder();
        write(node, out);
        return out.toString();
    }

    private static void write(JsonNode node, StringBuilder out) {
        if (node.isObject()) {
            out.append('{');
            TreeSet<String> names = new TreeSet<>();
            node.fieldNames().forEachRemaining(names::add);
            boolean first = true;
            for (String name : names) {
                JsonNode value = node.get(name);
                if (value == null || value.isNull()) {
                    continue;
                }
                if (!first) {
                    out.append(',');
                }
                first = false;
                string(name, out);
                out.append(':');
                write(value, out);
            }
            out.append('}');
        } else if (node.isArray()) {
            out.append('[');
            for (int i = 0; i < node.size(); i++) {
                if (i > 0) {
                    out.append(',');
                }
                write(node.get(i), out);
            }
            out.append(']');
        } else {
            string(node.asText(), out);
        }
    }

    private static void string(String text, StringBuilder out) {
        out.append('"').append(JsonStringEncoder.getInstance().quoteAsString(text)).append('"');
    }

    /**
     * Where in the plan a check is: the entry's number (from 1) and its words. A failure names the entry and the
     * field in its detail (row = entry, column = field of {@link EvaluationPlan.MeasurandPlan}), so that a form
     * can show the problem beside the field.
     */
    record Where(int entry, String text) {
        DomainException fail(String field, String message) {
            return fail(field, message, message);
        }

        DomainException fail(String field, String message, String fieldMessage) {
            String sentence = Character.toUpperCase(fieldMessage.charAt(0)) + fieldMessage.substring(1);
            return new DomainException.BadRequest(text + ": " + message, List.of(new DomainException.Detail(entry, field, null, "plan." + field, sentence)));
        }

        @Override
        public String toString() {
            return text;
        }
    }

    private static <E extends Enum<E>> E choice(Class<E> type, String value, Where where, String field, String what) {
        try {
            return Enum.valueOf(type, value == null ? "" : value.strip().toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException e) {
            throw where.fail(field, "the " + what + " is one of " + List.of(type.getEnumConstants()) + ".",
                    "choose one of: " + String.join("; ", java.util.Arrays.stream(type.getEnumConstants())
                            .map(Labels::of).toList()) + ".");
        }
    }

    private static String positive(String value, Where where, String field, String what) {
        String clean = value == null ? "" : value.strip();
        if (!clean.matches("[0-9]{1,12}(\\.[0-9]{1,12})?([eE][-+]?[0-9]{1,2})?") || new BigDecimal(clean).signum() <= 0) {
            throw where.fail(field, "the " + what + " is required, as a positive decimal number.");
        }
        return clean;
    }

    private static boolean blank(String value) {
        return value == null || value.isBlank();
    }

    private static String integer(String value, Where where, String field, String what) {
        String clean = value == null ? "" : value.strip();
        if (!clean.matches("[1-9][0-9]{0,5}")) {
            throw where.fail(field, "the " + what + " is a whole number of at least 1.");
        }
        return clean;
    }
}
