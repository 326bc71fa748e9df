package org.roundtable.scheme;

import org.roundtable.platform.Timestamps;
import com.fasterxml.jackson.databind.ObjectMapper;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;

import java.time.OffsetDateTime;
import java.util.List;
import java.util.Optional;

/** The frozen versions of rounds' evaluation plans (table {@code evaluation_plan}, append-only). */
@ApplicationScoped
public class PlanStore {

    private final EntityManager entityManager;
    private final ObjectMapper mapper;

    public PlanStore(EntityManager entityManager, ObjectMapper mapper) {
        this.entityManager = entityManager;
        this.mapper = mapper;
    }

    /** One frozen version. */
    public record PlanVersion(int version, String sha256, String reason, String frozenBy, OffsetDateTime frozenAt,
                              String canonicalJson) {
    }

    @Transactional(Transactional.TxType.MANDATORY)
    public List<PlanVersion> versions(long roundId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT plan_version, sha256, reason, frozen_by, frozen_at, canonical_json
                  FROM evaluation_plan WHERE round_id = :round ORDER BY plan_version
                """).setParameter("round", roundId).getResultList();
        return rows.stream().map(r -> new PlanVersion(((Number) r[0]).intValue(), r[1].toString(), (String) r[2],
                (String) r[3], Timestamps.utc(r[4]), (String) r[5])).toList();
    }

    @Transactional(Transactional.TxType.MANDATORY)
    public Optional<PlanVersion> latest(long roundId) {
        List<PlanVersion> all = versions(roundId);
        return all.isEmpty() ? Optional.empty() : Optional.of(all.get(all.size() - 1));
    }

    /** The plan in force: the latest frozen version, read back. */
    @Transactional(Transactional.TxType.MANDATORY)
    public Optional<EvaluationPlan> current(long roundId) {
        return latest(roundId).map(v -> PlanDocument.read(v.canonicalJson(), mapper));
    }

    @Transactional(Transactional.TxType.MANDATORY)
    PlanVersion append(long roundId, PlanDocument.Canonical canonical, String reason, String actor, OffsetDateTime at) {
        int next = latest(roundId).map(PlanVersion::version).orElse(0) + 1;
        entityManager.createNativeQuery("""
                INSERT INTO evaluation_plan (round_id, plan_version, canonical_json, sha256, reason, frozen_by, frozen_at)
                VALUES (:round, :version, :json, :sha, :reason, :by, :at)
                """)
                .setParameter("round", roundId).setParameter("version", next).setParameter("json", canonical.json())
                .setParameter("sha", canonical.sha256()).setParameter("reason", reason).setParameter("by", actor)
                .setParameter("at", at).executeUpdate();
        return new PlanVersion(next, canonical.sha256(), reason, actor, at, canonical.json());
    }
}
