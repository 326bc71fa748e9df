package org.roundtable.history;

import io.smallrye.config.ConfigMapping;
import io.smallrye.config.WithDefault;

/**
 * The history's settings ({@code roundtable.history.*}): the early-warning thresholds of the installation (common
 * practice, no source; see {@link EarlyWarnings}), used only for a plan stored before plans named their early
 * warnings; every newer plan states its own (see {@link HistoryService#warningRules}).
 */
@ConfigMapping(prefix = "roundtable.history")
public interface HistorySettings {

    /** Warn on every unsatisfactory result. */
    @WithDefault("true")
    boolean warnUnsatisfactory();

    /** Consecutive questionable results that warn. */
    @WithDefault("2")
    int questionableInARow();

    /** Consecutive scores of one sign that warn (a bias). */
    @WithDefault("6")
    int sameSignRun();

    /** Consecutive results over which increasing |z| warns (a drift). */
    @WithDefault("3")
    int driftRounds();

    /** The |z| the last result of a drift must reach. */
    @WithDefault("2.0")
    double driftLimit();

    default EarlyWarnings.Rules warningRules() {
        return new EarlyWarnings.Rules(warnUnsatisfactory(), questionableInARow(), sameSignRun(), driftRounds(),
                driftLimit());
    }
}
