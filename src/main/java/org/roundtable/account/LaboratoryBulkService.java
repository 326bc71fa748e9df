package org.roundtable.account;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.hibernate.Session;
import org.roundtable.audit.AuditTrail;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;

import java.sql.Array;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

/**
 * Enrols many laboratories at once, each with its first lab manager and a one-time link to set a password.
 * Built for thousands of rows: every row is checked in memory first (nothing is saved if one fails, and the
 * error names the row), then each table gets one set-based statement ({@code INSERT ... SELECT FROM
 * unnest(...) RETURNING}) — no per-row round trips and no password hashing (first sign-ins use the links).
 * The whole batch is one audit event whose after-hash is the SHA-256 of the created ids and usernames.
 */
@ApplicationScoped
public class LaboratoryBulkService {

    /** Upper bound of one batch, to keep a request's memory and transaction bounded. */
    public static final int MAX_BATCH = 20_000;

    private final EntityManager entityManager;
    private final AuditTrail audit;
    private final CurrentUser currentUser;
    private final SecuritySettings settings;
    private final Clock clock;

    public LaboratoryBulkService(EntityManager entityManager, AuditTrail audit, CurrentUser currentUser,
                                 SecuritySettings settings, Clock clock) {
        this.entityManager = entityManager;
        this.audit = audit;
        this.currentUser = currentUser;
        this.settings = settings;
        this.clock = clock;
    }

    /** A created laboratory with its manager and the manager's one-time link path. */
    public record Created(long laboratoryId, String organisation, String name, long managerUserId,
                          String managerUsername, String passwordLinkPath) {
    }

    public record Batch(List<Created> laboratories, OffsetDateTime linksExpireAt) {
    }

    @Transactional(Transactional.TxType.MANDATORY)
    public Batch create(List<LaboratoryService.NewLaboratory> rows) {
        if (rows == null || rows.isEmpty()) {
            throw new DomainException.BadRequest("The list of laboratories is empty.");
        }
        if (rows.size() > MAX_BATCH) {
            throw new DomainException.BadRequest("At most " + MAX_BATCH + " laboratories per request.");
        }
        int n = rows.size();
        String[] organisations = new String[n];
        String[] names = new String[n];
        String[] countries = new String[n];
        String[] contactNames = new String[n];
        String[] contactEmails = new String[n];
        String[] usernames = new String[n];
        Set<String> seenUsernames = new HashSet<>();
        Set<String> seenLabs = new HashSet<>();
        Set<String> isoCountries = Set.of(Locale.getISOCountries());
        for (int i = 0; i < n; i++) {
            LaboratoryService.NewLaboratory row = rows.get(i);
            String where = "Row " + (i + 1) + ": ";
            if (row == null) {
                throw new DomainException.BadRequest(where + "empty.");
            }
            organisations[i] = text(row.organisation(), where, "organisation", 200);
            names[i] = text(row.name(), where, "laboratory name", 200);
            String country = row.country() == null ? "" : row.country().strip().toUpperCase(Locale.ROOT);
            if (!isoCountries.contains(country)) {
                throw new DomainException.BadRequest(where + "the country is a two-letter ISO 3166 code, e.g. DE.");
            }
            countries[i] = country;
            contactNames[i] = optional(row.contactName(), where, 200);
            contactEmails[i] = optional(row.contactEmail(), where, 254);
            try {
                usernames[i] = AccountService.normaliseUsername(row.managerUsername());
            } catch (DomainException e) {
                throw new DomainException.BadRequest(where + e.detail());
            }
            if (!seenUsernames.add(usernames[i])) {
                throw new DomainException.BadRequest(where + "the username " + usernames[i] + " appears twice in the list.");
            }
            if (!seenLabs.add(organisations[i] + "\u0000" + names[i])) {
                throw new DomainException.BadRequest(where + "this organisation and laboratory name appear twice in the list.");
            }
        }
        OffsetDateTime now = OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
        OffsetDateTime expires = now.plus(settings.passwordLinkValidity());
        Long createdBy = currentUser.userId().orElse(null);
        String[] tokens = new String[n];
        String[] tokenHashes = new String[n];
        for (int i = 0; i < n; i++) {
            tokens[i] = Secrets.randomToken(32);
            tokenHashes[i] = Secrets.sha256Hex(tokens[i]);
        }
        List<Created> created = entityManager.unwrap(Session.class).doReturningWork(connection -> {
            refuseExisting(connection, usernames, organisations, names);
            Map<String, Long> labIds = new HashMap<>();
            try (PreparedStatement s = connection.prepareStatement("""
                    INSERT INTO laboratory (organisation, name, country, contact_name, contact_email, created_at)
                    SELECT o, n, c, cn, ce, ? FROM unnest(?::text[], ?::text[], ?::text[], ?::text[], ?::text[]) AS t(o, n, c, cn, ce)
                    RETURNING id, organisation, name
                    """)) {
                s.setObject(1, now);
                s.setArray(2, text(connection, organisations));
                s.setArray(3, text(connection, names));
                s.setArray(4, text(connection, countries));
                s.setArray(5, text(connection, contactNames));
                s.setArray(6, text(connection, contactEmails));
                try (ResultSet rs = s.executeQuery()) {
                    while (rs.next()) {
                        labIds.put(rs.getString(2) + "\u0000" + rs.getString(3), rs.getLong(1));
                    }
                }
            }
            Long[] labOfRow = new Long[n];
            String[] displayNames = new String[n];
            for (int i = 0; i < n; i++) {
                labOfRow[i] = labIds.get(organisations[i] + "\u0000" + names[i]);
                displayNames[i] = contactNames[i] == null ? usernames[i] : contactNames[i];
            }
            Map<String, Long> userIds = new HashMap<>();
            try (PreparedStatement s = connection.prepareStatement("""
                    INSERT INTO app_user (username, display_name, email, role, laboratory_id, created_at)
                    SELECT u, d, e, 'lab-manager', l, ? FROM unnest(?::text[], ?::text[], ?::text[], ?::bigint[]) AS t(u, d, e, l)
                    RETURNING id, username
                    """)) {
                s.setObject(1, now);
                s.setArray(2, text(connection, usernames));
                s.setArray(3, text(connection, displayNames));
                s.setArray(4, text(connection, contactEmails));
                s.setArray(5, connection.createArrayOf("bigint", labOfRow));
                try (ResultSet rs = s.executeQuery()) {
                    while (rs.next()) {
                        userIds.put(rs.getString(2), rs.getLong(1));
                    }
                }
            }
            Long[] userOfRow = new Long[n];
            for (int i = 0; i < n; i++) {
                userOfRow[i] = userIds.get(usernames[i]);
            }
            try (PreparedStatement s = connection.prepareStatement("""
                    INSERT INTO password_reset (token_hash, user_id, created_by, created_at, expires_at)
                    SELECT h, u, ?, ?, ? FROM unnest(?::text[], ?::bigint[]) AS t(h, u)
                    """)) {
                if (createdBy == null) {
                    s.setNull(1, java.sql.Types.BIGINT);
                } else {
                    s.setLong(1, createdBy);
                }
                s.setObject(2, now);
                s.setObject(3, expires);
                s.setArray(4, text(connection, tokenHashes));
                s.setArray(5, connection.createArrayOf("bigint", userOfRow));
                s.executeUpdate();
            }
            List<Created> out = new ArrayList<>(n);
            for (int i = 0; i < n; i++) {
                out.add(new Created(labOfRow[i], organisations[i], names[i], userOfRow[i], usernames[i],
                        "/password/set#" + tokens[i]));
            }
            return out;
        });
        StringBuilder digest = new StringBuilder();
        created.forEach(c -> digest.append(c.laboratoryId()).append(':').append(c.managerUserId()).append(':')
                .append(c.managerUsername()).append('\n'));
        audit.record(new AuditTrail.Event(currentUser.actor(), "laboratory.bulk-created", "laboratory",
                created.get(0).laboratoryId() + ".." + created.get(n - 1).laboratoryId(), null,
                Secrets.sha256Hex(digest.toString()), "laboratories=" + n + " managers=" + n + " links-expire=" + expires));
        return new Batch(created, expires);
    }

    private static void refuseExisting(Connection connection, String[] usernames, String[] organisations,
                                       String[] names) throws SQLException {
        try (PreparedStatement s = connection.prepareStatement(
                "SELECT username FROM app_user WHERE username = ANY(?::text[]) ORDER BY username LIMIT 5")) {
            s.setArray(1, text(connection, usernames));
            try (ResultSet rs = s.executeQuery()) {
                List<String> taken = new ArrayList<>();
                while (rs.next()) {
                    taken.add(rs.getString(1));
                }
                if (!taken.isEmpty()) {
                    throw new DomainException.Conflict("These usernames are taken: " + String.join(", ", taken) + ".");
                }
            }
        }
        try (PreparedStatement s = connection.prepareStatement("""
                SELECT l.organisation, l.name FROM laboratory l
                  JOIN unnest(?::text[], ?::text[]) AS t(o, n) ON l.organisation = t.o AND l.name = t.n LIMIT 5
                """)) {
            s.setArray(1, text(connection, organisations));
            s.setArray(2, text(connection, names));
            try (ResultSet rs = s.executeQuery()) {
                if (rs.next()) {
                    throw new DomainException.Conflict("A laboratory '" + rs.getString(2) + "' of '" + rs.getString(1)
                            + "' exists already.");
                }
            }
        }
    }

    private static Array text(Connection connection, String[] values) throws SQLException {
        return connection.createArrayOf("text", values);
    }

    private static String text(String value, String where, String what, int max) {
        String clean = value == null ? "" : value.strip();
        if (clean.isEmpty() || clean.length() > max) {
            throw new DomainException.BadRequest(where + "the " + what + " needs 1 to " + max + " characters.");
        }
        return clean;
    }

    private static String optional(String value, String where, int max) {
        if (value == null || value.isBlank()) {
            return null;
        }
        String clean = value.strip();
        if (clean.length() > max) {
            throw new DomainException.BadRequest(where + "a contact field may have at most " + max + " characters.");
        }
        return clean;
    }
}
