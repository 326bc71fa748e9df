package org.roundtable.audit;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.hibernate.Session;
import org.roundtable.platform.Labels;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Locale;

/**
 * The audit trail filtered by actor, kind of action and object, a page at a time with keyset paging on the
 * sequence number (newest first), so that a page costs an index range scan however many entries the trail holds
 * (indexes of V54). No count of all matching entries is made: it would read them all.
 */
@ApplicationScoped
public class AuditSearch {

    /** What to show: each part null or blank for any. */
    public record Filter(String actor, String action, String objectType, String objectId) {

        public Filter {
            actor = blankToNull(actor);
            action = blankToNull(action);
            objectType = blankToNull(objectType);
            objectId = blankToNull(objectId);
        }

        /** The filter as query parameters after the paging parameter ({@code &actor=..}), for links. */
        public String query() {
            StringBuilder q = new StringBuilder();
            append(q, "actor", actor);
            append(q, "action", action);
            append(q, "type", objectType);
            append(q, "object", objectId);
            return q.toString();
        }

        public boolean any() {
            return actor != null || action != null || objectType != null || objectId != null;
        }

        private static void append(StringBuilder q, String name, String value) {
            if (value != null) {
                q.append('&').append(name).append('=').append(java.net.URLEncoder.encode(value,
                        java.nio.charset.StandardCharsets.UTF_8));
            }
        }

        private static String blankToNull(String text) {
            return text == null || text.isBlank() ? null : text.strip();
        }
    }

    /**
     * One page of entries, newest first; {@code older} the {@code before} of the next older page and
     * {@code newer} the {@code after} of the next newer page (null when there is none).
     */
    public record Slice(List<AuditEntry> entries, Long older, Long newer) {
    }

    /** An action as the filter offers it: its code and its words. */
    public record Choice(String value, String label) {
    }

    private final EntityManager entityManager;

    public AuditSearch(EntityManager entityManager) {
        this.entityManager = entityManager;
    }

    /**
     * A page of {@code limit} entries matching {@code filter}: those before entry {@code before} (older), or with
     * {@code after} those after it (newer), or the newest.
     */
    @Transactional
    public Slice page(Filter filter, Long before, Long after, int limit) {
        int size = Math.max(1, Math.min(limit, 1000));
        return entityManager.unwrap(Session.class).doReturningWork(c -> page(c, filter, before, after, size));
    }

    private static Slice page(Connection c, Filter filter, Long before, Long after, int size) throws SQLException {
        boolean forward = after != null && before == null;
        StringBuilder sql = new StringBuilder(AuditRows.SELECT_COLUMNS).append(" WHERE ");
        List<Object> params = new ArrayList<>();
        if (filter.actor() != null) {
            sql.append("actor = ? AND ");
            params.add(filter.actor());
        }
        if (filter.action() != null) {
            sql.append("action = ? AND ");
            params.add(filter.action());
        }
        if (filter.objectType() != null) {
            sql.append("object_type = ? AND ");
            params.add(filter.objectType());
        }
        if (filter.objectId() != null) {
            sql.append("object_id = ? AND ");
            params.add(filter.objectId());
        }
        sql.append(forward ? "sequence_no > ? ORDER BY sequence_no" : "sequence_no < ? ORDER BY sequence_no DESC")
                .append(" LIMIT ?");
        params.add(forward ? after : before == null ? Long.MAX_VALUE : before);
        params.add(size + 1);
        List<AuditEntry> entries = new ArrayList<>();
        try (PreparedStatement s = c.prepareStatement(sql.toString())) {
            for (int i = 0; i < params.size(); i++) {
                s.setObject(i + 1, params.get(i));
            }
            try (ResultSet rs = s.executeQuery()) {
                while (rs.next()) {
                    entries.add(AuditRows.read(rs));
                }
            }
        }
        boolean more = entries.size() > size;
        if (more) {
            entries.remove(entries.size() - 1);
        }
        if (forward) {
            Collections.reverse(entries);
        }
        if (entries.isEmpty()) {
            return new Slice(entries, null, forward || before == null ? null : before - 1);
        }
        long newest = entries.get(0).sequenceNo();
        long oldest = entries.get(entries.size() - 1).sequenceNo();
        Long older = forward ? (oldest > 1 ? oldest : null) : more ? oldest : null;
        Long newer = forward ? (more ? newest : null) : before == null ? null : newest;
        return new Slice(entries, older, newer);
    }

    /** The kinds of action in the trail, in words, for the filter (a loose index scan: one probe per kind). */
    @Transactional
    public List<Choice> actions() {
        return distinct("action").stream().map(a -> new Choice(a, label(a))).sorted(
                java.util.Comparator.comparing(Choice::label, String.CASE_INSENSITIVE_ORDER)).toList();
    }

    /** The kinds of object in the trail, for the filter. */
    @Transactional
    public List<Choice> objectTypes() {
        return distinct("object_type").stream().map(t -> new Choice(t, objectWords(t))).toList();
    }

    @SuppressWarnings("unchecked")
    private List<String> distinct(String column) {
        // column is one of two fixed names, never input
        return entityManager.createNativeQuery(("""
                WITH RECURSIVE kinds(v) AS (
                    (SELECT %1$s FROM audit_event ORDER BY %1$s LIMIT 1)
                    UNION ALL
                    SELECT (SELECT %1$s FROM audit_event WHERE %1$s > kinds.v ORDER BY %1$s LIMIT 1)
                      FROM kinds WHERE kinds.v IS NOT NULL)
                SELECT v FROM kinds WHERE v IS NOT NULL LIMIT 500
                """).formatted(column)).getResultList();
    }

    /**
     * An action in words: its label ({@code AuditAction.<code>}), a round's step by the step's label, else the
     * object and the verb in plain words ({@code sample.sent} → "Sample: sent").
     */
    public static String label(String action) {
        if (action == null) {
            return "";
        }
        if (Labels.has("AuditAction", action)) {
            return Labels.of("AuditAction", action);
        }
        int dot = action.indexOf('.');
        if (dot > 0 && action.startsWith("round.")) {
            String step = action.substring(dot + 1).toUpperCase(Locale.ROOT).replace('-', '_');
            if (Labels.has("RoundAction", step)) {
                return Labels.of("RoundAction", step);
            }
        }
        if (dot > 0 && dot < action.length() - 1) {
            return objectWords(action.substring(0, dot)) + ": "
                    + action.substring(dot + 1).replace('-', ' ').replace('_', ' ').replace('.', ' ');
        }
        return objectWords(action);
    }

    /** An object type in words ({@code api-token} → "API token"; {@code two-step} → "Two step"). */
    public static String objectWords(String type) {
        if (type == null) {
            return "";
        }
        String words = type.replace('-', ' ').replace('_', ' ').strip().replaceFirst("^api ", "API ");
        return words.isEmpty() ? words : Character.toUpperCase(words.charAt(0)) + words.substring(1);
    }
}
