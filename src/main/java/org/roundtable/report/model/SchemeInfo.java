package org.roundtable.report.model;

import java.util.Objects;

/**
 * The proficiency testing scheme.
 *
 * @param schemeCode short scheme identifier, e.g. {@code LAS}
 * @param schemeName full name, e.g. "Low-alloy steel by spark OES and combustion"
 * @param design how the scheme is designed (rounds per year, items, replicates, what is scored)
 * @param secondReviewerRequired whether the scheme requires a second reviewer to sign each report
 */
public record SchemeInfo(String schemeCode, String schemeName, String design, boolean secondReviewerRequired) {

    public SchemeInfo {
        Objects.requireNonNull(schemeCode, "schemeCode");
        Objects.requireNonNull(schemeName, "schemeName");
        design = design == null ? "" : design;
    }
}
