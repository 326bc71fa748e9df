package org.roundtable.submission.intake;

import java.util.Locale;
import java.util.Optional;

/**
 * The method groups a result may be reported under; results are evaluated per group as well as overall
 * (ISO/IEC 17043). The codes are our own and written in lower case; uploads may use any case.
 */
public enum MethodGroup {
    SPARK_OES("spark-oes"),
    COMBUSTION("combustion"),
    INERT_GAS_FUSION("inert-gas-fusion"),
    XRF("xrf"),
    ICP_OES("icp-oes"),
    WET_CHEMISTRY("wet-chemistry"),
    OTHER("other");

    private final String code;

    MethodGroup(String code) {
        this.code = code;
    }

    /** The code as written in uploads and in the canonical payload. */
    public String code() {
        return code;
    }

    /** The group with this code, compared without regard to case. */
    public static Optional<MethodGroup> fromCode(String text) {
        String lower = text.toLowerCase(Locale.ROOT);
        for (MethodGroup group : values()) {
            if (group.code.equals(lower)) {
                return Optional.of(group);
            }
        }
        return Optional.empty();
    }
}
