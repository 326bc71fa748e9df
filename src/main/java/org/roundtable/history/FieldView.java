package org.roundtable.history;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Timestamps;

import java.time.LocalDate;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The coordinators' view of the whole field of a scheme: per measurand, the share of satisfactory, questionable and
 * unsatisfactory results over rounds and per method group, read from {@code history_field_summary} (filled when a
 * round report is issued), never from the scores themselves. Each round counts as its latest report to
 * laboratories shows it.
 */
@ApplicationScoped
public class FieldView {

    /** Verdict counts. */
    public record Counts(int satisfactory, int questionable, int unsatisfactory, int notScored) {
        public int scored() {
            return satisfactory + questionable + unsatisfactory;
        }

        /** Percent of the scored results, one decimal; 0 when none. */
        public double share(int part) {
            return scored() == 0 ? 0 : Math.round(1000.0 * part / scored()) / 10.0;
        }

        public double satisfactoryShare() {
            return share(satisfactory);
        }

        public double questionableShare() {
            return share(questionable);
        }

        public double unsatisfactoryShare() {
            return share(unsatisfactory);
        }

        /** The shares as shown on the page (one decimal, by the number rules). */
        public String satisfactoryPercent() {
            return org.roundtable.platform.NumberFormats.decimal(satisfactoryShare(), 1) + " %";
        }

        public String questionablePercent() {
            return org.roundtable.platform.NumberFormats.decimal(questionableShare(), 1) + " %";
        }

        public String unsatisfactoryPercent() {
            return org.roundtable.platform.NumberFormats.decimal(unsatisfactoryShare(), 1) + " %";
        }

        Counts plus(Counts o) {
            return new Counts(satisfactory + o.satisfactory, questionable + o.questionable,
                    unsatisfactory + o.unsatisfactory, notScored + o.notScored);
        }
    }

    /** One round of a measurand. */
    public record RoundRow(String roundCode, LocalDate reportedOn, Counts counts) {
    }

    /** One method group of a measurand over all rounds shown. */
    public record GroupRow(String methodGroup, Counts counts) {
        /** The method group in words. */
        public String label() {
            return HistoryPages.methodLabel(methodGroup);
        }
    }

    /** One measurand. */
    public record Measurand(String element, List<RoundRow> rounds, List<GroupRow> methodGroups, Counts total) {
    }

    /** The field of a scheme. */
    public record Field(long schemeId, String schemeName, List<Measurand> measurands) {
    }

    /** The verdict counts of a scheme ({@code :scheme}) per round, measurand and method group. Public for the benchmark. */
    public static final String FIELD_SQL = """
                WITH visible AS (
                    SELECT DISTINCT ON (p.round_id) p.document_id, p.round_id, p.round_code, p.scheme_name,
                           (SELECT min(f.issued_at) FROM history_publication f WHERE f.round_id = p.round_id) AS reported_at
                      FROM history_publication p
                     WHERE p.scheme_id = :scheme
                       AND NOT EXISTS (SELECT 1 FROM history_publication n WHERE n.replaces_document_id = p.document_id)
                     ORDER BY p.round_id, p.issued_at DESC, p.document_id DESC
                )
                SELECT v.round_code, v.reported_at, v.scheme_name, s.element, s.method_group, s.satisfactory,
                       s.questionable, s.unsatisfactory, s.not_scored
                  FROM visible v JOIN history_field_summary s ON s.document_id = v.document_id
                 ORDER BY s.element, v.reported_at, v.round_id, s.method_group
                """;

    private final EntityManager entityManager;

    public FieldView(EntityManager entityManager) {
        this.entityManager = entityManager;
    }

    /**
     * The scheme's field (coordinators). Plan: {@code history_publication_scheme_idx} finds the scheme's
     * publications, the primary key of {@code history_field_summary} their counts.
     */
    @Transactional
    public Field of(long schemeId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery(FIELD_SQL).setParameter("scheme", schemeId).getResultList();
        if (rows.isEmpty()) {
            @SuppressWarnings("unchecked")
            List<String> name = entityManager.createNativeQuery("SELECT name FROM scheme WHERE id = :id")
                    .setParameter("id", schemeId).getResultList();
            if (name.isEmpty()) {
                throw new DomainException.NotFound("The scheme");
            }
            return new Field(schemeId, name.get(0), List.of());
        }
        return assemble(schemeId, rows);
    }

    /** Rows of {@link #FIELD_SQL} as the field (pure; public for the benchmark). */
    public static Field assemble(long schemeId, List<Object[]> rows) {
        String schemeName = (String) rows.get(0)[2];
        Map<String, Map<String, RoundRow>> rounds = new LinkedHashMap<>();
        Map<String, Map<String, Counts>> groups = new LinkedHashMap<>();
        for (Object[] r : rows) {
            String element = (String) r[3];
            String round = (String) r[0];
            LocalDate on = Timestamps.utc(r[1]).withOffsetSameInstant(ZoneOffset.UTC).toLocalDate();
            Counts c = new Counts(((Number) r[5]).intValue(), ((Number) r[6]).intValue(), ((Number) r[7]).intValue(),
                    ((Number) r[8]).intValue());
            rounds.computeIfAbsent(element, k -> new LinkedHashMap<>())
                    .merge(round, new RoundRow(round, on, c), (a, b) -> new RoundRow(a.roundCode(), a.reportedOn(),
                            a.counts().plus(b.counts())));
            groups.computeIfAbsent(element, k -> new java.util.TreeMap<>()).merge((String) r[4], c, Counts::plus);
        }
        List<Measurand> out = new ArrayList<>();
        for (Map.Entry<String, Map<String, RoundRow>> e : rounds.entrySet()) {
            List<GroupRow> g = groups.get(e.getKey()).entrySet().stream()
                    .map(x -> new GroupRow(x.getKey(), x.getValue())).toList();
            Counts total = g.stream().map(GroupRow::counts).reduce(new Counts(0, 0, 0, 0), Counts::plus);
            out.add(new Measurand(e.getKey(), List.copyOf(e.getValue().values()), g, total));
        }
        return new Field(schemeId, schemeName, out);
    }
}
