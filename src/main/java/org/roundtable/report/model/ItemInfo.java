package org.roundtable.report.model;

import java.util.List;
import java.util.Objects;

/**
 * The proficiency test item.
 *
 * @param description what the item is (material, form, size, item labels)
 * @param preparation how it was produced, prepared and checked
 * @param checks homogeneity and stability result per measurand
 */
public record ItemInfo(String description, String preparation, List<ItemCheck> checks) {

    public ItemInfo {
        Objects.requireNonNull(description, "description");
        preparation = preparation == null ? "" : preparation;
        checks = List.copyOf(checks);
    }
}
