package org.roundtable.scheme;

import jakarta.persistence.Column;
import jakarta.persistence.Entity;
import jakarta.persistence.EnumType;
import jakarta.persistence.Enumerated;
import jakarta.persistence.GeneratedValue;
import jakarta.persistence.GenerationType;
import jakarta.persistence.Id;
import jakarta.persistence.Table;
import jakarta.persistence.Version;

import java.time.LocalDate;
import java.time.OffsetDateTime;

/** A round of a scheme: items, dates, instructions, late-result policy and its place in the workflow. */
@Entity
@Table(name = "round")
public class Round {

    @Id
    @GeneratedValue(strategy = GenerationType.IDENTITY)
    public Long id;

    @Column(name = "scheme_id", nullable = false)
    public Long schemeId;

    @Column(nullable = false)
    public String code;

    @Column(name = "item_description", nullable = false)
    public String itemDescription;

    @Column(name = "items_per_laboratory", nullable = false)
    public int itemsPerLaboratory;

    /** Comma-separated item labels, one per item a laboratory receives. */
    @Column(name = "item_labels", nullable = false)
    public String itemLabels;

    @Column(name = "dispatch_date", nullable = false)
    public LocalDate dispatchDate;

    @Column(name = "result_deadline", nullable = false)
    public OffsetDateTime resultDeadline;

    /** IANA zone the deadline was set in and is shown in (e.g. Europe/Berlin). */
    @Column(name = "deadline_time_zone", nullable = false)
    public String deadlineTimeZone;

    @Column(nullable = false)
    public String instructions;

    @Enumerated(EnumType.STRING)
    @Column(name = "late_policy", nullable = false)
    public LatePolicy latePolicy;

    @Enumerated(EnumType.STRING)
    @Column(name = "code_scope", nullable = false)
    public CodeScope codeScope;

    @Enumerated(EnumType.STRING)
    @Column(nullable = false)
    public RoundState state;

    @Column(name = "state_changed_at", nullable = false)
    public OffsetDateTime stateChangedAt;

    /** Canonical JSON of the plan being edited while the round is a draft. */
    @Column(name = "draft_plan")
    public String draftPlan;

    @Column(name = "created_at", nullable = false)
    public OffsetDateTime createdAt;

    /** A proficiency round or a precision experiment; fixed at creation. */
    @Enumerated(EnumType.STRING)
    @Column(nullable = false)
    public RoundKind kind = RoundKind.PROFICIENCY_TEST;

    @Version
    public int version;

    /** What happens to results that arrive after the deadline. */
    public enum LatePolicy {
        /** Refused. */
        REFUSE,
        /** Accepted until the round is closed, flagged late, and scored like the others. */
        ACCEPT_FLAGGED_SCORED,
        /** Accepted until the round is closed, flagged late, reported without a score. */
        ACCEPT_FLAGGED_UNSCORED
    }

    /** How long a laboratory keeps its participant code. */
    public enum CodeScope {
        /** A new random code in every round (the default). */
        ROUND,
        /** One code per laboratory for all rounds of the scheme. */
        SCHEME
    }
}
