package org.roundtable.scheme;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.math.BigDecimal;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;

/**
 * The plan of a precision experiment (ISO 5725-2) as a coordinator writes it: the levels (materials, one item
 * each), the measurands, the replicates every laboratory reports per level and measurand, the significance
 * levels of the straggler and outlier tests and whether the relationship of s_r and s_R to the level is fitted.
 * {@link #canonical} checks it against the scheme's catalogue, fills the defaults and writes the canonical JSON
 * that is hashed and frozen.
 *
 * @param levels          the levels in the order of the study, each with a short label and the material
 * @param measurands      element symbols from the scheme's catalogue
 * @param replicates      results per laboratory, level and measurand (default 2; 2 to 10)
 * @param stragglerLevel  significance level of the straggler indication (default 0.05)
 * @param outlierLevel    significance level of the outlier indication (default 0.01)
 * @param fitRelationship whether s_r and s_R are fitted against the level (default true)
 */
public record PrecisionPlan(List<Level> levels, List<String> measurands, Integer replicates, String stragglerLevel,
                            String outlierLevel, Boolean fitRelationship) {

    /** Format marker of the canonical JSON. */
    public static final String FORMAT = "roundtable-precision-plan-1";
    /** Most levels a study may have. */
    public static final int MAX_LEVELS = 12;

    /**
     * One level.
     *
     * @param label    1 to 8 letters, digits or -, printed on the item
     * @param material what the material is, in words
     */
    public record Level(String label, String material) {
    }

    /** The canonical JSON and its SHA-256 hex. */
    public record Canonical(String json, String sha256, PrecisionPlan plan) {
    }

    /** The level labels in order. */
    public List<String> levelLabels() {
        return levels.stream().map(Level::label).toList();
    }

    /** The straggler level as a number. */
    public double alphaStraggler() {
        return Double.parseDouble(stragglerLevel);
    }

    /** The outlier level as a number. */
    public double alphaOutlier() {
        return Double.parseDouble(outlierLevel);
    }

    /**
     * Validates the plan against the catalogue and returns its canonical form with the defaults filled in.
     *
     * @throws DomainException.BadRequest naming the first thing that is wrong
     */
    public static Canonical canonical(PrecisionPlan plan, List<Measurand> catalogue, ObjectMapper mapper) {
        if (plan == null || plan.levels() == null || plan.levels().isEmpty()) {
            throw new DomainException.BadRequest("A precision experiment needs at least one level.");
        }
        if (plan.levels().size() > MAX_LEVELS) {
            throw new DomainException.BadRequest("A precision experiment has at most " + MAX_LEVELS + " levels.");
        }
        List<Level> levels = new ArrayList<>();
        Set<String> labels = new HashSet<>();
        for (Level l : plan.levels()) {
            String label = l == null || l.label() == null ? "" : l.label().strip();
            if (!label.matches("[A-Za-z0-9-]{1,8}") || !labels.add(label)) {
                throw new DomainException.BadRequest("Give each level a distinct label of 1 to 8 letters, digits or -"
                        + (label.isEmpty() ? "." : " ('" + label + "' is not).")); 
            }
            String material = l.material() == null ? "" : l.material().strip();
            if (material.isEmpty() || material.length() > 200) {
                throw new DomainException.BadRequest("Describe the material of level " + label + " (1 to 200 characters).");
            }
            levels.add(new Level(label, material));
        }
        if (plan.measurands() == null || plan.measurands().isEmpty()) {
            throw new DomainException.BadRequest("A precision experiment needs at least one measurand.");
        }
        Set<String> known = new HashSet<>();
        catalogue.forEach(m -> known.add(m.element));
        List<String> measurands = new ArrayList<>();
        for (String m : plan.measurands()) {
            String element = m == null ? "" : m.strip();
            if (!known.contains(element)) {
                throw new DomainException.BadRequest("The measurand '" + element + "' is not in the scheme's catalogue.");
            }
            if (measurands.contains(element)) {
                throw new DomainException.BadRequest("The measurand " + element + " is listed twice.");
            }
            measurands.add(element);
        }
        int replicates = plan.replicates() == null ? 2 : plan.replicates();
        if (replicates < 2 || replicates > 10) {
            throw new DomainException.BadRequest("Each laboratory reports 2 to 10 replicates per level (usually 2).");
        }
        BigDecimal straggler = level(plan.stragglerLevel(), "0.05", "straggler");
        BigDecimal outlier = level(plan.outlierLevel(), "0.01", "outlier");
        if (outlier.compareTo(straggler) >= 0) {
            throw new DomainException.BadRequest("The outlier level must be smaller than the straggler level (usually 1 % and 5 %).");
        }
        boolean fit = plan.fitRelationship() == null || plan.fitRelationship();
        PrecisionPlan filled = new PrecisionPlan(List.copyOf(levels), List.copyOf(measurands), replicates,
                straggler.toPlainString(), outlier.toPlainString(), fit);
        Map<String, Object> json = new LinkedHashMap<>();
        json.put("format", FORMAT);
        json.put("levels", filled.levels().stream().map(l -> Map.of("label", l.label(), "material", l.material()))
                .map(m -> new java.util.TreeMap<>(m)).toList());
        json.put("measurands", filled.measurands());
        json.put("replicates", replicates);
        json.put("stragglerLevel", filled.stragglerLevel());
        json.put("outlierLevel", filled.outlierLevel());
        json.put("fitRelationship", fit);
        try {
            String text = mapper.writeValueAsString(json);
            return new Canonical(text, Secrets.sha256Hex(text), filled);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Reads a canonical (or draft) plan back. */
    public static PrecisionPlan read(String json, ObjectMapper mapper) {
        try {
            var node = mapper.readTree(json);
            List<Level> levels = new ArrayList<>();
            node.path("levels").forEach(l -> levels.add(new Level(l.path("label").asText(), l.path("material").asText())));
            List<String> measurands = new ArrayList<>();
            node.path("measurands").forEach(m -> measurands.add(m.asText()));
            return new PrecisionPlan(levels, measurands, node.path("replicates").asInt(2),
                    node.path("stragglerLevel").asText("0.05"), node.path("outlierLevel").asText("0.01"),
                    node.path("fitRelationship").asBoolean(true));
        } catch (JsonProcessingException e) {
            throw new IllegalStateException("stored precision plan unreadable", e);
        }
    }

    private static BigDecimal level(String text, String fallback, String what) {
        String t = text == null || text.isBlank() ? fallback : text.strip();
        try {
            BigDecimal v = new BigDecimal(t);
            if (v.signum() <= 0 || v.compareTo(new BigDecimal("0.2")) > 0) {
                throw new NumberFormatException();
            }
            return v.stripTrailingZeros();
        } catch (NumberFormatException e) {
            throw new DomainException.BadRequest("The " + what + " level is a fraction above 0 and at most 0.2, such as "
                    + fallback + ".");
        }
    }
}
