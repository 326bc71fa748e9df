package org.roundtable.submission.intake;

import java.util.HashSet;
import java.util.List;
import java.util.Optional;
import java.util.Set;

/**
 * What the caller (the round) allows in an upload: the measurand catalogue, the item labels and the most replicates.
 *
 * @param measurands        the round's measurands, each element at most once
 * @param itemLabels        one label for a single item, or two for a split-level pair (e.g. {@code "A"}, {@code "B"});
 *                          with one item the {@code item} column is optional
 * @param maximumReplicates the highest replicate count accepted (at least 1)
 */
public record UploadRules(List<MeasurandRule> measurands, List<String> itemLabels, int maximumReplicates) {

    public UploadRules {
        measurands = List.copyOf(measurands);
        itemLabels = List.copyOf(itemLabels);
        if (measurands.isEmpty()) {
            throw new IllegalArgumentException("a round has at least one measurand");
        }
        Set<String> elements = new HashSet<>();
        for (MeasurandRule rule : measurands) {
            if (!elements.add(rule.element())) {
                throw new IllegalArgumentException("measurand listed twice: " + rule.element());
            }
        }
        if (itemLabels.size() != 1 && itemLabels.size() != 2) {
            throw new IllegalArgumentException("a round has one item or a pair of items");
        }
        if (itemLabels.stream().anyMatch(label -> label == null || label.isBlank())
                || Set.copyOf(itemLabels).size() != itemLabels.size()) {
            throw new IllegalArgumentException("item labels must be distinct and not blank");
        }
        if (maximumReplicates < 1) {
            throw new IllegalArgumentException("maximumReplicates must be >= 1");
        }
    }

    /** Whether the round sends a split-level pair, so each result names its item. */
    public boolean paired() {
        return itemLabels.size() == 2;
    }

    /** The rule for an element symbol, if the element is a measurand of the round. */
    public Optional<MeasurandRule> measurand(String element) {
        return measurands.stream().filter(rule -> rule.element().equals(element)).findFirst();
    }
}
