package org.roundtable.account;

import java.util.Arrays;
import java.util.Optional;

/**
 * What a user may do. Names as stored in the database and used in {@code @RolesAllowed}.
 * <ul>
 *   <li>{@code coordinator} runs schemes and rounds and sees the identities behind participant codes;</li>
 *   <li>{@code lab-manager} administers its own laboratory: members, API tokens, auditors' access;</li>
 *   <li>{@code lab-member} enters and views its own laboratory's results and scores;</li>
 *   <li>{@code auditor} reads issued reports, and a laboratory's history where the laboratory granted it;</li>
 *   <li>{@code admin} administers users and configuration, with no access to results beyond a coordinator's.</li>
 * </ul>
 */
public enum Role {
    ADMIN("admin"),
    COORDINATOR("coordinator"),
    LAB_MANAGER("lab-manager"),
    LAB_MEMBER("lab-member"),
    AUDITOR("auditor");

    public static final String ADMIN_NAME = "admin";
    public static final String COORDINATOR_NAME = "coordinator";
    public static final String LAB_MANAGER_NAME = "lab-manager";
    public static final String LAB_MEMBER_NAME = "lab-member";
    public static final String AUDITOR_NAME = "auditor";

    private final String roleName;

    Role(String roleName) {
        this.roleName = roleName;
    }

    public String roleName() {
        return roleName;
    }

    public boolean belongsToLaboratory() {
        return this == LAB_MANAGER || this == LAB_MEMBER;
    }

    public static Optional<Role> fromName(String name) {
        return Arrays.stream(values()).filter(r -> r.roleName.equals(name)).findFirst();
    }
}
