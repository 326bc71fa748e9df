package org.roundtable.scheme;

/** Groups of analytical methods a measurand may be determined by; results are compared per group. */
public enum MethodGroup {
    SPARK_OES, COMBUSTION, INERT_GAS_FUSION, XRF, ICP_OES, WET_CHEMISTRY, OTHER
}
