package org.roundtable.scheme;

import com.fasterxml.jackson.databind.ObjectMapper;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import java.time.OffsetDateTime;
import java.util.List;
import java.util.Optional;
import org.roundtable.platform.Timestamps;

/** The frozen versions of precision experiments' plans (table {@code precision_plan}, append-only). */
@ApplicationScoped
public class PrecisionPlanStore {

    private final EntityManager entityManager;
    private final ObjectMapper mapper;

    public PrecisionPlanStore(EntityManager entityManager, ObjectMapper mapper) {
        this.entityManager = entityManager;
        this.mapper = mapper;
    }

    /** One frozen version, read back. */
    public record Version(int version, String sha256, String reason, String frozenBy, OffsetDateTime frozenAt,
                          PrecisionPlan plan) {
    }

    @Transactional(Transactional.TxType.MANDATORY)
    public List<Version> versions(long roundId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT plan_version, sha256, reason, frozen_by, frozen_at, canonical_json
                  FROM precision_plan WHERE round_id = :round ORDER BY plan_version
                """).setParameter("round", roundId).getResultList();
        return rows.stream().map(r -> new Version(((Number) r[0]).intValue(), r[1].toString(), (String) r[2],
                (String) r[3], Timestamps.utc(r[4]), PrecisionPlan.read((String) r[5], mapper))).toList();
    }

    /** The plan in force: the latest frozen version. */
    @Transactional(Transactional.TxType.MANDATORY)
    public Optional<Version> current(long roundId) {
        List<Version> all = versions(roundId);
        return all.isEmpty() ? Optional.empty() : Optional.of(all.get(all.size() - 1));
    }

    @Transactional(Transactional.TxType.MANDATORY)
    Version append(long roundId, PrecisionPlan.Canonical canonical, String reason, String actor, OffsetDateTime at) {
        int next = current(roundId).map(Version::version).orElse(0) + 1;
        entityManager.createNativeQuery("""
                INSERT INTO precision_plan (round_id, plan_version, canonical_json, sha256, reason, frozen_by, frozen_at)
                VALUES (:round, :version, :json, :sha, :reason, :by, :at)
                """)
                .setParameter("round", roundId).setParameter("version", next).setParameter("json", canonical.json())
                .setParameter("sha", canonical.sha256()).setParameter("reason", reason).setParameter("by", actor)
                .setParameter("at", at).executeUpdate();
        return new Version(next, canonical.sha256(), reason, actor, at, canonical.plan());
    }
}
