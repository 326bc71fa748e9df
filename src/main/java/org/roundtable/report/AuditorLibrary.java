package org.roundtable.report;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.persistence.Query;
import jakarta.transaction.Transactional;
import org.roundtable.account.AuditorGrantService;
import org.roundtable.account.CurrentUser;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Paging;
import org.roundtable.platform.Timestamps;
import org.roundtable.report.model.ReportStatus;

import java.net.URLEncoder;
import java.nio.charset.StandardCharsets;
import java.time.LocalDate;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * An auditor's library: the final and amended laboratory reports issued to the laboratories that grant the auditor
 * access (within each grant's data window), by laboratory — named, since the laboratory granted access — with its
 * participant code in each round, the scheme, the round and the round report of the same issue. Filtered by
 * laboratory, scheme, round or report number and period of issue; paged.
 */
@ApplicationScoped
public class AuditorLibrary {

    /** The filters of the library; blank ones do not filter. Dates are UTC days, both ends included. */
    public record Filter(Long laboratoryId, Long schemeId, String query, LocalDate from, LocalDate until) {

        /** The filter's part of a link (for the pager), starting with {@code &} when not empty. */
        public String linkQuery() {
            StringBuilder q = new StringBuilder();
            if (laboratoryId != null) {
                q.append("&laboratory=").append(laboratoryId);
            }
            if (schemeId != null) {
                q.append("&scheme=").append(schemeId);
            }
            if (query != null) {
                q.append("&q=").append(URLEncoder.encode(query, StandardCharsets.UTF_8));
            }
            if (from != null) {
                q.append("&from=").append(from);
            }
            if (until != null) {
                q.append("&until=").append(until);
            }
            return q.toString();
        }

        /** Reads the filters from a page's query parameters; a malformed one is a 400 with a plain message. */
        public static Filter of(String laboratory, String scheme, String query, String from, String until) {
            LocalDate f = day(from, "from");
            LocalDate u = day(until, "until");
            if (f != null && u != null && f.isAfter(u)) {
                throw new DomainException.BadRequest("The period starts on or before the day it ends.");
            }
            return new Filter(id(laboratory), id(scheme), query == null || query.isBlank() ? null : query.strip(), f, u);
        }

        private static Long id(String value) {
            if (value == null || value.isBlank()) {
                return null;
            }
            try {
                return Long.valueOf(value.strip());
            } catch (NumberFormatException e) {
                throw new DomainException.BadRequest("Choose the laboratory and the scheme from the lists.");
            }
        }

        private static LocalDate day(String value, String which) {
            if (value == null || value.isBlank()) {
                return null;
            }
            try {
                return LocalDate.parse(value.strip());
            } catch (DateTimeParseException e) {
                throw new DomainException.BadRequest("The period's " + which + " date is not a date (yyyy-mm-dd).");
            }
        }
    }

    /** The filters as typed, shown again in the form (also when one could not be read). */
    public record Typed(String laboratory, String scheme, String query, String from, String until) {

        public boolean selected(String field, long id) {
            String value = "laboratory".equals(field) ? laboratory : scheme;
            return value != null && value.strip().equals(Long.toString(id));
        }
    }

    /** A choice of a filter's list. */
    public record Choice(long id, String name) {
    }

    /**
     * One laboratory report in the library, with the round report of the same issue; {@code supersededBy} the report
     * that replaced it.
     */
    public record Entry(long documentId, String reportId, ReportStatus status, OffsetDateTime issuedAt,
                        String supersededBy, long roundId, String roundCode, String schemeName, long laboratoryId,
                        String laboratoryName, String participantCode, Long roundReportId, String roundReportNumber) {
    }

    /** A page of the library with the filters' lists. */
    public record Shelf(List<Entry> entries, Paging paging, Filter filter, List<Choice> laboratories,
                        List<Choice> schemes) {
    }

    private final EntityManager entityManager;
    private final AuditorGrantService grants;
    private final CurrentUser currentUser;

    public AuditorLibrary(EntityManager entityManager, AuditorGrantService grants, CurrentUser currentUser) {
        this.entityManager = entityManager;
        this.grants = grants;
        this.currentUser = currentUser;
    }

    /** One page of the calling auditor's library. */
    @Transactional
    public Shelf shelf(Filter filter, Integer page, int pageSize) {
        long auditor = currentUser.requireUserId();
        Map<Long, String> names = new LinkedHashMap<>();
        for (AuditorGrantService.GrantedLaboratory l : grants.listGrantedToMe()) {
            names.putIfAbsent(l.laboratoryId(), l.name());
        }
        List<Choice> laboratories = names.entrySet().stream().map(e -> new Choice(e.getKey(), e.getValue()))
                .sorted(java.util.Comparator.comparing(Choice::name)).toList();
        if (names.isEmpty()) {
            return new Shelf(List.of(), Paging.of(page, pageSize, 0), filter, laboratories, List.of());
        }
        // which laboratories, and for each which windows of "first final report" days, the auditor may see
        StringBuilder access = new StringBuilder();
        Map<String, Object> params = new LinkedHashMap<>();
        int i = 0;
        for (Long lab : names.keySet()) {
            for (AuditorGrantService.DataWindow w : grants.activeDataWindows(auditor, lab)) {
                access.append(access.isEmpty() ? "" : " OR ").append("(d.laboratory_id = :lab").append(i);
                params.put("lab" + i, lab);
                if (w.from() != null) {
                    access.append(" AND ff.day >= :wf").append(i);
                    params.put("wf" + i, w.from());
                }
                if (w.until() != null) {
                    access.append(" AND ff.day <= :wu").append(i);
                    params.put("wu" + i, w.until());
                }
                access.append(')');
                i++;
            }
        }
        if (access.isEmpty()) {
            return new Shelf(List.of(), Paging.of(page, pageSize, 0), filter, laboratories, List.of());
        }
        String from = """
                  FROM issued_document d
                  JOIN round r ON r.id = d.round_id
                  JOIN scheme s ON s.id = r.scheme_id
                  LEFT JOIN round_participant p ON p.round_id = d.round_id AND p.laboratory_id = d.laboratory_id
                  LEFT JOIN LATERAL (SELECT (min(f.issued_at) AT TIME ZONE 'UTC')::date AS day FROM issued_document f
                                      WHERE f.round_id = d.round_id AND f.status = 'FINAL') ff ON true
                 WHERE d.kind = 'LABORATORY' AND d.status IN ('FINAL', 'AMENDED') AND (""" + access + ")";
        // the scheme list offers the schemes the auditor has reports of (before the other filters)
        List<Choice> schemes = schemes(from, params);
        StringBuilder where = new StringBuilder();
        if (filter.laboratoryId() != null) {
            where.append(" AND d.laboratory_id = :flab");
            params.put("flab", filter.laboratoryId());
        }
        if (filter.schemeId() != null) {
            where.append(" AND s.id = :fscheme");
            params.put("fscheme", filter.schemeId());
        }
        if (filter.query() != null) {
            where.append(" AND (r.code ILIKE :fq OR d.report_id ILIKE :fq OR p.participant_code ILIKE :fq)");
            params.put("fq", org.roundtable.platform.LikePatterns.containing(filter.query()));
        }
        if (filter.from() != null) {
            where.append(" AND d.issued_at >= :ffrom");
            params.put("ffrom", filter.from().atStartOfDay().atOffset(ZoneOffset.UTC));
        }
        if (filter.until() != null) {
            where.append(" AND d.issued_at < :funtil");
            params.put("funtil", filter.until().plusDays(1).atStartOfDay().atOffset(ZoneOffset.UTC));
        }
        long total = ((Number) bind(entityManager.createNativeQuery("SELECT count(*) " + from + where), params)
                .getSingleResult()).longValue();
        Paging paging = Paging.of(page, pageSize, total);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = bind(entityManager.createNativeQuery("""
                SELECT d.id, d.report_id, d.status, d.issued_at, d.round_id, r.code, s.name, d.laboratory_id,
                       p.participant_code,
                       (SELECT n.report_id FROM issued_document n WHERE n.replaces_document_id = d.id LIMIT 1),
                       (SELECT x.id FROM issued_document x WHERE x.round_id = d.round_id AND x.kind = 'ROUND'
                           AND x.status = d.status AND x.issued_at >= d.issued_at ORDER BY x.issued_at, x.id LIMIT 1),
                       (SELECT x.report_id FROM issued_document x WHERE x.round_id = d.round_id AND x.kind = 'ROUND'
                           AND x.status = d.status AND x.issued_at >= d.issued_at ORDER BY x.issued_at, x.id LIMIT 1)
                """ + from + where + " ORDER BY d.issued_at DESC, d.id DESC LIMIT :limit OFFSET :offset"), params)
                .setParameter("limit", paging.size()).setParameter("offset", paging.offset()).getResultList();
        List<Entry> entries = new ArrayList<>();
        for (Object[] r : rows) {
            long lab = ((Number) r[7]).longValue();
            entries.add(new Entry(((Number) r[0]).longValue(), (String) r[1], ReportStatus.valueOf((String) r[2]),
                    Timestamps.utc(r[3]), (String) r[9], ((Number) r[4]).longValue(), (String) r[5], (String) r[6], lab,
                    names.get(lab), (String) r[8], r[10] == null ? null : ((Number) r[10]).longValue(), (String) r[11]));
        }
        return new Shelf(entries, paging, filter, laboratories, schemes);
    }

    private List<Choice> schemes(String from, Map<String, Object> params) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = bind(entityManager.createNativeQuery("SELECT DISTINCT s.id, s.name " + from
                + " ORDER BY s.name"), params).getResultList();
        return rows.stream().map(r -> new Choice(((Number) r[0]).longValue(), (String) r[1])).toList();
    }

    private static Query bind(Query query, Map<String, Object> params) {
        params.forEach(query::setParameter);
        return query;
    }
}
