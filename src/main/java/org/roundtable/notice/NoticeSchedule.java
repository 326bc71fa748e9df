package org.roundtable.notice;

import io.quarkus.narayana.jta.QuarkusTransaction;
import io.quarkus.scheduler.Scheduled;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.enterprise.context.control.ActivateRequestContext;
import jakarta.persistence.EntityManager;
import org.jboss.logging.Logger;
import org.roundtable.platform.Admission;
import org.roundtable.platform.Timestamps;

import java.time.Clock;
import java.time.Duration;
import java.time.OffsetDateTime;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The notices nobody's request causes: result deadlines within 7 days and within a day (laboratories without
 * results), deadlines passed with results missing (coordinators), comment periods ending within
 * {@link NoticeSettings#commentPeriodNoticeHours()} (every laboratory of the round, once per round and laboratory),
 * grants ending within 14 days and ended (auditors), and the purge of notices older than the kept months.
 * <p>
 * Every instance runs these checks. Like the closing of rounds at their deadline (submission.DeadlineClosing, which
 * relies on the round's row lock and state check), they are safe to run anywhere and again: each notice's
 * (kind, object, recipient) UNIQUE key makes the second instance's insert a no-op, so each is created and sent once.
 */
@ApplicationScoped
public class NoticeSchedule {

    private static final Logger LOG = Logger.getLogger(NoticeSchedule.class);
    /** Deadlines and grant ends older than this are not announced any more (e.g. on the first start after an update). */
    static final Duration LOOK_BACK = Duration.ofDays(7);
    /** Participant codes named in one deadline notice; more are counted. */
    static final int CODES_NAMED = 30;

    private final NoticeService notices;
    private final EntityManager entityManager;
    private final Clock clock;
    private final Admission admission;
    private final NoticeSettings settings;

    public NoticeSchedule(NoticeService notices, EntityManager entityManager, Clock clock, Admission admission,
                          NoticeSettings settings) {
        this.settings = settings;
        this.admission = admission;
        this.notices = notices;
        this.entityManager = entityManager;
        this.clock = clock;
    }

    @Scheduled(every = "${roundtable.notices.check-interval}", delayed = "30s",
            concurrentExecution = Scheduled.ConcurrentExecution.SKIP)
    @ActivateRequestContext
    void scheduled() {
        if (!admission.databaseAvailable()) {
            return; // logged once by Admission; the checks run again when the database answers
        }
        try {
            runChecks();
        } catch (RuntimeException e) {
            if (!admission.isDatabaseOutage(e)) {
                LOG.error("notice checks failed; they run again at the next interval", e);
            }
        }
    }

    /** Runs every check once, each in its own transaction; returns how many notices were created. */
    @ActivateRequestContext
    public int runChecks() {
        OffsetDateTime now = Timestamps.now(clock);
        int created = QuarkusTransaction.requiringNew().call(() -> deadlinesAhead(now));
        created += QuarkusTransaction.requiringNew().call(() -> deadlinesPassed(now));
        created += QuarkusTransaction.requiringNew().call(() -> commentPeriodsEnding(now));
        created += QuarkusTransaction.requiringNew().call(() -> grants(now));
        int purged = QuarkusTransaction.requiringNew().call(notices::purge);
        if (created > 0 || purged > 0) {
            LOG.infof("notice checks: %d created, %d purged", created, purged);
        }
        return created;
    }

    private int deadlinesAhead(OffsetDateTime now) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT r.id, r.code, r.result_deadline, p.laboratory_id
                  FROM round r JOIN round_participant p ON p.round_id = r.id
                 WHERE r.state = 'OPEN_FOR_RESULTS' AND r.result_deadline > :now AND r.result_deadline <= :week
                   AND NOT EXISTS (SELECT 1 FROM submission s WHERE s.round_id = r.id
                                    AND s.laboratory_id = p.laboratory_id AND s.current_revision > 0)
                 ORDER BY r.id, p.laboratory_id
                """).setParameter("now", now).setParameter("week", now.plusDays(7)).getResultList();
        int created = 0;
        for (Object[] r : rows) {
            long round = ((Number) r[0]).longValue();
            OffsetDateTime deadline = Timestamps.utc(r[2]);
            Map<String, Object> params = Map.of("round", r[1], "roundId", round, "deadline", deadline);
            long laboratory = ((Number) r[3]).longValue();
            boolean withinDay = !deadline.isAfter(now.plusDays(1));
            // a deadline less than a day away is told once, as such, not also as "within 7 days"
            created += notices.notifyLaboratory(withinDay ? NoticeKind.DEADLINE_IN_1_DAY : NoticeKind.DEADLINE_IN_7_DAYS,
                    "round:" + round, laboratory, params);
        }
        return created;
    }

    private int deadlinesPassed(OffsetDateTime now) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT r.id, r.code, r.result_deadline, count(*),
                       string_agg(p.participant_code, ', ' ORDER BY p.participant_code)
                  FROM round r JOIN round_participant p ON p.round_id = r.id
                 WHERE r.state IN ('OPEN_FOR_RESULTS', 'CLOSED') AND r.result_deadline <= :now
                   AND r.result_deadline > :since
                   AND NOT EXISTS (SELECT 1 FROM submission s WHERE s.round_id = r.id
                                    AND s.laboratory_id = p.laboratory_id AND s.current_revision > 0)
                 GROUP BY r.id, r.code, r.result_deadline
                 ORDER BY r.id
                """).setParameter("now", now).setParameter("since", now.minus(LOOK_BACK)).getResultList();
        int created = 0;
        for (Object[] r : rows) {
            long round = ((Number) r[0]).longValue();
            int missing = ((Number) r[3]).intValue();
            List<String> codes = List.of(((String) r[4]).split(", "));
            String named = String.join(", ", codes.subList(0, Math.min(codes.size(), CODES_NAMED)))
                    + (codes.size() > CODES_NAMED ? " and " + (codes.size() - CODES_NAMED) + " more" : "");
            Map<String, Object> params = new LinkedHashMap<>();
            params.put("round", r[1]);
            params.put("roundId", round);
            params.put("deadline", Timestamps.utc(r[2]));
            params.put("missing", missing);
            params.put("codes", named);
            created += notices.notifyCoordinators(NoticeKind.DEADLINE_PASSED, "round:" + round, null, params);
        }
        return created;
    }

    private int commentPeriodsEnding(OffsetDateTime now) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT r.id, r.code, r.comment_period_ends_at, p.laboratory_id
                  FROM round r JOIN round_participant p ON p.round_id = r.id
                 WHERE r.state = 'COMMENT_PERIOD' AND r.comment_period_ends_at > :now
                   AND r.comment_period_ends_at <= :ahead
                 ORDER BY r.id, p.laboratory_id
                """).setParameter("now", now)
                .setParameter("ahead", now.plusHours(settings.commentPeriodNoticeHours())).getResultList();
        int created = 0;
        for (Object[] r : rows) {
            long round = ((Number) r[0]).longValue();
            Map<String, Object> params = Map.of("round", r[1], "roundId", round, "until", Timestamps.utc(r[2]));
            created += notices.notifyLaboratory(NoticeKind.COMMENT_PERIOD_ENDING, "comment-period:" + round,
                    ((Number) r[3]).longValue(), params);
        }
        return created;
    }

    private int grants(OffsetDateTime now) {
        int created = 0;
        @SuppressWarnings("unchecked")
        List<Object[]> ending = entityManager.createNativeQuery("""
                SELECT g.id, g.auditor_id, l.name, g.valid_until
                  FROM auditor_grant g JOIN laboratory l ON l.id = g.laboratory_id
                 WHERE g.revoked_at IS NULL AND g.valid_until > :now AND g.valid_until <= :fortnight
                   AND g.granted_at < g.valid_until - interval '14 days'
                 ORDER BY g.id
                """).setParameter("now", now).setParameter("fortnight", now.plusDays(14)).getResultList();
        for (Object[] g : ending) {
            created += notices.notify(NoticeKind.GRANT_ENDING, "grant:" + ((Number) g[0]).longValue(),
                    ((Number) g[1]).longValue(), Map.of("laboratory", g[2], "until", Timestamps.utc(g[3]))) ? 1 : 0;
        }
        @SuppressWarnings("unchecked")
        List<Object[]> ended = entityManager.createNativeQuery("""
                SELECT g.id, g.auditor_id, l.name, LEAST(g.valid_until, COALESCE(g.revoked_at, g.valid_until))
                  FROM auditor_grant g JOIN laboratory l ON l.id = g.laboratory_id
                 WHERE LEAST(g.valid_until, COALESCE(g.revoked_at, g.valid_until)) <= :now
                   AND LEAST(g.valid_until, COALESCE(g.revoked_at, g.valid_until)) > :since
                 ORDER BY g.id
                """).setParameter("now", now).setParameter("since", now.minus(LOOK_BACK)).getResultList();
        for (Object[] g : ended) {
            created += notices.notify(NoticeKind.GRANT_ENDED, "grant:" + ((Number) g[0]).longValue(),
                    ((Number) g[1]).longValue(), Map.of("laboratory", g[2], "until", Timestamps.utc(g[3]))) ? 1 : 0;
        }
        return created;
    }
}
