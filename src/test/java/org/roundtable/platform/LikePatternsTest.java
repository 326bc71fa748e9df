package org.roundtable.platform;

import org.junit.jupiter.api.Test;

import static org.assertj.core.api.Assertions.assertThat;

/** A search box's text becomes a LIKE pattern in which the typed wildcards match only themselves. */
class LikePatternsTest {

    @Test
    void typedTextIsSurroundedByWildcards() {
        assertThat(LikePatterns.containing("kestrel")).isEqualTo("%kestrel%");
        assertThat(LikePatterns.containing(null)).isEqualTo("%%");
    }

    @Test
    void typedPercentUnderscoreAndBackslashAreEscaped() {
        assertThat(LikePatterns.containing("10%_a\\b")).isEqualTo("%10\\%\\_a\\\\b%");
    }
}
