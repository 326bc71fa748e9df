package org.roundtable.statistics.homogeneity;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.roundtable.statistics.precision.OutlierVerdict;

class HomogeneityCheckTest {

    /** Cr in stainless steel, % m/m, 10 items in duplicate: constructed demo data. */
    static final double[][] CHROMIUM = {{18.12, 18.10}, {18.15, 18.13}, {18.09, 18.12},
        {18.14, 18.11}, {18.11, 18.13}, {18.16, 18.12}, {18.10, 18.09}, {18.13, 18.15},
        {18.12, 18.14}, {18.11, 18.10}};

    @ParameterizedTest(name = "g = {0}: F1 = {1} (table {3}), F2 = {2} (table {4})")
    @CsvSource({
        // F1/F2 two-decimal values: PUB, Fearn & Thompson (2001) Analyst 126:1414, reproduced in the
        // IUPAC Harmonized Protocol (2006) and ISO 13528 Annex B (abs 0.005).
        // Six-decimal values: CALC, computed independently in Python and R, no published source (rel 1e-5).
        "20, 1.586501, 0.568504, 1.59, 0.57", "19, 1.603850, 0.591131, 1.60, 0.59",
        "18, 1.622771, 0.616273, 1.62, 0.62", "17, 1.643514, 0.644400, 1.64, 0.64",
        "16, 1.666386, 0.676111, 1.67, 0.68", "15, 1.691771, 0.712182, 1.69, 0.71",
        "14, 1.720156, 0.753632, 1.72, 0.75", "13, 1.752172, 0.801830, 1.75, 0.80",
        "12, 1.788649, 0.858666, 1.79, 0.86", "11, 1.830704, 0.926812, 1.83, 0.93",
        "10, 1.879886, 1.010191, 1.88, 1.01", "9, 1.938414, 1.114791, 1.94, 1.11",
        "8, 2.009591, 1.250232, 2.01, 1.25", "7, 2.098598, 1.432984, 2.10, 1.43"})
    void allowanceFactorsReproduceThePublishedTable(int g, double f1, double f2, double f1Table, double f2Table) {
        assertEquals(f1, HomogeneityCheck.f1(g), f1 * 1e-5);
        assertEquals(f2, HomogeneityCheck.f2(g), f2 * 1e-5);
        assertEquals(f1Table, HomogeneityCheck.f1(g), 0.005);
        assertEquals(f2Table, HomogeneityCheck.f2(g), 0.005);
    }

    @Test
    void chromiumDuplicatesPassTheHomogeneityCheck() {
        // CALC: computed independently in Python and R, no published source (constructed data)
        HomogeneityCheck.Result r = HomogeneityCheck.evaluate(CHROMIUM, 0.10);
        assertEquals(18.121, r.grandMean(), 1e-10);
        assertEquals(0.01663330, r.itemMeansSd(), 0.01663330 * 1e-6);
        assertEquals(0.01673320, r.withinItemSd(), 0.01673320 * 1e-6);
        assertEquals(0.000136666667, r.betweenItemVariance(), 0.000136666667 * 1e-6);
        assertEquals(0.01169045, r.betweenItemSd(), 0.01169045 * 1e-6);
        assertTrue(r.passesSimpleCriterion());
        assertEquals(0.0019747514, r.allowance(), 0.0019747514 * 1e-6);
        assertEquals(0.04443817, Math.sqrt(r.allowance()), 0.04443817 * 1e-6);
        assertEquals(0.167, r.withinToSigmaRatio(), 1e-3);
        assertTrue(r.passesAllowanceCriterion());
        assertTrue(r.sufficientlyHomogeneous());
        assertEquals(OutlierVerdict.ACCEPTED, r.cochran().verdict());
        assertTrue(r.warnings().isEmpty(), r.warnings().toString());
    }

    @Test
    void chromiumMeanSquaresOfTheUnderlyingAnova() {
        // CALC: MS_between = 0.000553333333, MS_within = 0.00028 (Python and R, no published source); rel 1e-8
        org.roundtable.statistics.precision.OneWayAnova.Result a =
                org.roundtable.statistics.precision.OneWayAnova.of(CHROMIUM);
        assertEquals(0.000553333333, a.msBetween(), 0.000553333333 * 1e-8);
        assertEquals(0.00028, a.msWithin(), 0.00028 * 1e-8);
    }

    @Test
    void chromiumAllowanceWithTheTableFactors() {
        // CALC: c = 1.88 (0.03)^2 + 1.01 s_w^2 = 0.0019748000 (rel 1e-8), s_w^2 = MS_within = 0.00028
        HomogeneityCheck.Result r = HomogeneityCheck.evaluate(CHROMIUM, 0.10);
        double c = 1.88 * 0.03 * 0.03 + 1.01 * r.withinItemSd() * r.withinItemSd();
        assertEquals(0.0019748000, c, 0.0019748 * 1e-8);
    }

    @Test
    void inhomogeneousItemsFailBothCriteria() {
        double[][] items = new double[10][];
        for (int t = 0; t < 10; t++) {
            double level = 18.0 + 0.1 * t;
            items[t] = new double[] {level, level + 0.01};
        }
        HomogeneityCheck.Result r = HomogeneityCheck.evaluate(items, 0.10);
        assertFalse(r.passesSimpleCriterion());
        assertFalse(r.passesAllowanceCriterion());
        assertFalse(r.sufficientlyHomogeneous());
    }

    @Test
    void negativeBetweenVarianceIsClampedAndWarned() {
        double[][] items = {{1.0, 1.2}, {1.2, 1.0}, {1.1, 1.1}, {1.05, 1.15}};
        HomogeneityCheck.Result r = HomogeneityCheck.evaluate(items, 1.0);
        assertEquals(0.0, r.betweenItemSd(), 0.0);
        assertTrue(r.warnings().stream().anyMatch(w -> w.code().equals("negative-between-variance")));
        assertTrue(r.warnings().stream().anyMatch(w -> w.code().equals("few-items")));
    }

    @Test
    void aWildDuplicateIsFlaggedByCochran() {
        double[][] items = CHROMIUM.clone();
        items[3] = new double[] {18.14, 18.40};
        HomogeneityCheck.Result r = HomogeneityCheck.evaluate(items, 0.10);
        assertEquals(OutlierVerdict.OUTLIER, r.cochran().verdict());
        assertTrue(r.warnings().stream().anyMatch(w -> w.code().equals("duplicate-outlier")));
    }

    @Test
    void refusesUnequalReplicationAndBadSigma() {
        assertThrows(IllegalArgumentException.class,
                () -> HomogeneityCheck.evaluate(new double[][] {{1, 2}, {1, 2, 3}}, 1));
        assertThrows(IllegalArgumentException.class, () -> HomogeneityCheck.evaluate(CHROMIUM, 0));
    }

    @Test
    void chromiumIsStableWithEitherCriterion() {
        // CALC: y1 = 18.121, u(y1) = s_x/sqrt(g) = 0.00525991; y2 = 18.110, u = s/sqrt(6) = 0.00577350;
        // |d| = 0.011 <= 0.030; expanded limit 0.04562050 (Python and R, no published source); rel 1e-6
        StabilityCheck.Result r = StabilityCheck.evaluate(CHROMIUM,
                new double[] {18.10, 18.13, 18.11, 18.09, 18.12, 18.11}, 0.10);
        assertEquals(18.121, r.startMean(), 18.121 * 1e-6);
        assertEquals(0.00525991, r.startUncertainty(), 0.00525991 * 1e-6);
        assertEquals(18.110, r.endMean(), 18.11 * 1e-6);
        assertEquals(0.00577350, r.endUncertainty(), 0.0057735 * 1e-6);
        assertEquals(0.011, r.difference(), 0.011 * 1e-6);
        assertEquals(0.030, r.simpleLimit(), 1e-12);
        assertEquals(0.04562050, r.expandedLimit(), 0.0456205 * 1e-6);
        assertTrue(r.stable());
        assertTrue(r.stableExpanded());
    }

    @Test
    void treatingTheTwentyResultsAsIndependentGivesTheSmallerLimit() {
        // CALC: with u(y1) = s/sqrt(20) = 0.00452479 the limit is 0.04467065 (rel 1e-6)
        StabilityCheck.Result r = StabilityCheck.evaluate(18.121, 0.00452479, 18.110, 0.00577350, 0.10);
        assertEquals(0.04467065, r.expandedLimit(), 0.04467065 * 1e-6);
    }

    @Test
    void aLargeDriftIsUnstable() {
        StabilityCheck.Result r = StabilityCheck.evaluate(18.12, 0.001, 18.00, 0.001, 0.10);
        assertFalse(r.stable());
        assertFalse(r.stableExpanded());
    }
}
