package org.roundtable.statistics.score;

/** The kinds of performance score (ISO 13528:2015 clause 9). */
public enum ScoreKind {
    /** z = (x − x_pt)/σ_pt. */
    Z("z"),
    /** z′ = (x − x_pt)/sqrt(σ_pt² + u²(x_pt)). */
    Z_PRIME("zPrime"),
    /** ζ = (x − x_pt)/sqrt(u²(x) + u²(x_pt)). */
    ZETA("zeta"),
    /** En = (x − x_pt)/sqrt(U²(x) + U²(x_pt)). */
    EN("en");

    private final String jsonName;

    ScoreKind(String jsonName) {
        this.jsonName = jsonName;
    }

    /** Name used in JSON output ({@code z}, {@code zPrime}, {@code zeta}, {@code en}). */
    public String jsonName() {
        return jsonName;
    }
}
