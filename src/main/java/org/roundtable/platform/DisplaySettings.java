package org.roundtable.platform;

import io.smallrye.config.ConfigMapping;
import io.smallrye.config.WithDefault;

/** How pages show things: the installation's time zone and the page-size budget. */
@ConfigMapping(prefix = "roundtable.display")
public interface DisplaySettings {

    /** The installation's IANA time zone, used for viewers who chose none (env {@code ROUNDTABLE_TIME_ZONE}). */
    @WithDefault("UTC")
    String timeZone();

    /**
     * The page-size budget: no page lists more rows than this at once; longer lists are paged
     * ({@code templates/tags/table.html}, {@link Paging}).
     */
    @WithDefault("50")
    int pageSize();
}
