package org.roundtable.account;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.persistence.LockModeType;
import jakarta.transaction.Transactional;
import org.roundtable.audit.AuditTrail;
import org.roundtable.audit.ObjectHash;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;

import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.regex.Pattern;

/**
 * Users and their passwords: creating users (admin: any role; lab manager: members of its own laboratory),
 * disabling and enabling, changing roles, one-time password links (first sign-in and reset — no mail server
 * is assumed, the link is shown to whoever started it), and changing one's own password. Every change is
 * audited; disabling, a role change and a new password end the user's sessions at once.
 */
@ApplicationScoped
public class AccountService {

    static final Pattern USERNAME = Pattern.compile("^[a-z0-9][a-z0-9._@-]{2,63}$");

    private final UserAccountRepository users;
    private final LaboratoryRepository laboratories;
    private final Passwords passwords;
    private final SessionService sessions;
    private final AuditTrail audit;
    private final CurrentUser currentUser;
    private final SecuritySettings settings;
    private final EntityManager entityManager;
    private final Clock clock;

    public AccountService(UserAccountRepository users, LaboratoryRepository laboratories, Passwords passwords,
                          SessionService sessions, AuditTrail audit, CurrentUser currentUser,
                          SecuritySettings settings, EntityManager entityManager, Clock clock) {
        this.users = users;
        this.laboratories = laboratories;
        this.passwords = passwords;
        this.sessions = sessions;
        this.audit = audit;
        this.currentUser = currentUser;
        this.settings = settings;
        this.entityManager = entityManager;
        this.clock = clock;
    }

    /** A user as shown to administrators and lab managers (no secrets). */
    public record UserView(long id, String username, String displayName, String email, String role,
                           Long laboratoryId, boolean enabled, boolean passwordSet, OffsetDateTime createdAt) {
        static UserView of(UserAccount u) {
            return new UserView(u.id, u.username, u.displayName, u.email, u.role, u.laboratoryId, u.enabled,
                    u.passwordHash != null, u.createdAt);
        }
    }

    /** A new or reset user with the one-time link path that lets them set a password. */
    public record UserWithLink(UserView user, String passwordLinkPath, OffsetDateTime linkExpiresAt) {
    }

    public record NewUser(String username, String displayName, String email, String role, Long laboratoryId) {
    }

    // ---- administrators ------------------------------------------------------------------------------

    @Transactional
    public List<UserView> listAll() {
        return users.listAll(io.quarkus.panache.common.Sort.by("username")).stream().map(UserView::of).toList();
    }

    /** Up to {@code limit} users whose username or name contains {@code query} (all when blank), and the total. */
    @Transactional
    public LaboratoryService.Page<UserView> search(String query, int limit) {
        return search(query, 0, limit);
    }

    /** Users whose username or name contains {@code query}, {@code limit} of them from row {@code offset}. */
    @Transactional
    public LaboratoryService.Page<UserView> search(String query, int offset, int limit) {
        String like = org.roundtable.platform.LikePatterns.containing(
                query == null ? "" : query.strip().toLowerCase(Locale.ROOT));
        String where = "lower(username) like ?1 or lower(displayName) like ?1";
        List<UserView> items = users.find(where, io.quarkus.panache.common.Sort.by("username"), like)
                .range(offset, offset + limit - 1).list().stream().map(UserView::of).toList();
        return new LaboratoryService.Page<>(items, users.count(where, like));
    }

    @Transactional
    public UserView get(long userId) {
        return UserView.of(users.findByIdOptional(userId).orElseThrow(() -> new DomainException.NotFound("The user")));
    }

    /** Creates a user of any role (admin). */
    @Transactional
    public UserWithLink create(NewUser request) {
        Role role = Role.fromName(request.role())
                .orElseThrow(() -> new DomainException.BadRequest("Unknown role: " + request.role()));
        Long laboratoryId = request.laboratoryId();
        if (role.belongsToLaboratory()) {
            if (laboratoryId == null || laboratories.findByIdOptional(laboratoryId).isEmpty()) {
                throw new DomainException.BadRequest("A laboratory role needs an existing laboratory.");
            }
        } else if (laboratoryId != null) {
            throw new DomainException.BadRequest("Only laboratory roles belong to a laboratory.");
        }
        return createUser(request.username(), request.displayName(), request.email(), role, laboratoryId);
    }

    /** Creates a user without the audit-and-link ceremony's caller checks; used by enrolment and the demo. */
    @Transactional(Transactional.TxType.MANDATORY)
    public UserWithLink createUser(String username, String displayName, String email, Role role, Long laboratoryId) {
        String name = normaliseUsername(username);
        if (users.count("username", name) > 0) {
            throw new DomainException.Conflict("The username " + name + " is taken.");
        }
        UserAccount user = new UserAccount();
        user.username = name;
        user.displayName = requireText(displayName, "display name", 200);
        user.email = email == null || email.isBlank() ? null : requireText(email, "e-mail", 254);
        user.role = role.roleName();
        user.laboratoryId = laboratoryId;
        user.createdAt = now();
        users.persist(user);
        audit.record(new AuditTrail.Event(currentUser.actor(), "user.created", "user", user.id.toString(), null,
                hash(user), "username=" + user.username + " role=" + user.role));
        return issueLink(user);
    }

    @Transactional
    public UserView setEnabled(long userId, boolean enabled) {
        UserAccount user = lockedUser(userId);
        return applyEnabled(user, enabled);
    }

    @Transactional
    public UserView changeRole(long userId, String roleName, Long laboratoryId) {
        UserAccount user = lockedUser(userId);
        Role role = Role.fromName(roleName).orElseThrow(() -> new DomainException.BadRequest("Unknown role: " + roleName));
        if (role.belongsToLaboratory() && (laboratoryId == null || laboratories.findByIdOptional(laboratoryId).isEmpty())) {
            throw new DomainException.BadRequest("A laboratory role needs an existing laboratory.");
        }
        if (user.id.equals(currentUser.userId().orElse(null))) {
            throw new DomainException.Conflict("You cannot change your own role.");
        }
        String before = hash(user);
        user.role = role.roleName();
        user.laboratoryId = role.belongsToLaboratory() ? laboratoryId : null;
        entityManager.flush();
        sessions.endAllOf(user.id, "role-changed");
        audit.record(new AuditTrail.Event(currentUser.actor(), "user.role-changed", "user", user.id.toString(),
                before, hash(user), "role=" + user.role));
        return UserView.of(user);
    }

    @Transactional
    public UserWithLink startPasswordReset(long userId) {
        UserAccount user = lockedUser(userId);
        return issueLink(user);
    }

    // ---- laboratory managers: members of their own laboratory ---------------------------------------

    @Transactional
    public List<UserView> listOwnLaboratoryMembers() {
        return users.list("laboratoryId = ?1 order by username", currentUser.requireLaboratoryId())
                .stream().map(UserView::of).toList();
    }

    @Transactional
    public UserWithLink createOwnLaboratoryMember(String username, String displayName, String email, String roleName) {
        Role role = Role.fromName(roleName).filter(Role::belongsToLaboratory)
                .orElseThrow(() -> new DomainException.BadRequest("A laboratory member is a lab-member or a lab-manager."));
        return createUser(username, displayName, email, role, currentUser.requireLaboratoryId());
    }

    @Transactional
    public UserView setOwnLaboratoryMemberEnabled(long userId, boolean enabled) {
        return applyEnabled(ownLaboratoryMember(userId), enabled);
    }

    @Transactional
    public UserWithLink startOwnLaboratoryMemberReset(long userId) {
        return issueLink(ownLaboratoryMember(userId));
    }

    // ---- everyone ---------------------------------------------------------------------------------------

    /** Sets a new password with a one-time link; ends all sessions of the user. */
    @Transactional
    public void setPasswordWithLink(String linkToken, String newPassword) {
        if (linkToken == null || linkToken.isBlank() || linkToken.length() > 100) {
            throw new DomainException.Unprocessable("This link is not valid. Ask for a new one.");
        }
        String hash = Secrets.sha256Hex(linkToken);
        @SuppressWarnings("unchecked")
        List<Number> found = entityManager.createNativeQuery("""
                SELECT user_id FROM password_reset
                 WHERE token_hash = :hash AND used_at IS NULL AND expires_at > :now
                 FOR UPDATE
                """).setParameter("hash", hash).setParameter("now", now()).getResultList();
        if (found.isEmpty()) {
            throw new DomainException.Unprocessable("This link is not valid or has expired. Ask for a new one.");
        }
        UserAccount user = lockedUser(found.get(0).longValue());
        if (!user.enabled) {
            throw new DomainException.Unprocessable("This link is not valid or has expired. Ask for a new one.");
        }
        passwords.checkAcceptable(newPassword, user.username);
        entityManager.createNativeQuery("UPDATE password_reset SET used_at = :now WHERE token_hash = :hash")
                .setParameter("now", now()).setParameter("hash", hash).executeUpdate();
        applyNewPassword(user, newPassword, "password.set-with-link");
    }

    /** Changes the signed-in user's password after re-checking the current one (ASVS v5.0.0-6.2.3). */
    @Transactional
    public void changeOwnPassword(String currentPassword, String newPassword) {
        UserAccount user = lockedUser(currentUser.requireUserId());
        if (user.passwordHash == null || !passwords.matches(currentPassword, user.passwordHash)) {
            throw new DomainException.Unprocessable("The current password is not correct.");
        }
        passwords.checkAcceptable(newPassword, user.username);
        applyNewPassword(user, newPassword, "password.changed");
    }

    /**
     * Sets the signed-in user's display time zone: an IANA zone of the offered list, or empty/null for the
     * installation's zone. Audited.
     */
    @Transactional
    public void setOwnTimeZone(String zone) {
        String chosen = zone == null || zone.isBlank() ? null : zone.strip();
        if (chosen != null && !org.roundtable.platform.TimeDisplay.isOffered(chosen)) {
            throw new DomainException.BadRequest("Choose a time zone from the list.");
        }
        UserAccount user = lockedUser(currentUser.requireUserId());
        String before = user.timeZone;
        user.timeZone = chosen;
        entityManager.flush();
        audit.record(new AuditTrail.Event(currentUser.actor(), "user.time-zone", "user", user.id.toString(), null, null,
                "from=" + (before == null ? "installation" : before) + " to=" + (chosen == null ? "installation" : chosen)));
    }

    // ---- internals -------------------------------------------------------------------------------------

    private void applyNewPassword(UserAccount user, String newPassword, String action) {
        user.passwordHash = passwords.hash(newPassword);
        user.passwordChangedAt = now();
        entityManager.flush();
        sessions.endAllOf(user.id, "password-changed");
        audit.record(new AuditTrail.Event(currentUser.signedIn() ? currentUser.actor()
                : new org.roundtable.audit.Actor(user.username, user.role, user.laboratoryId),
                action, "user", user.id.toString(), null, null, null));
        SecurityLog.event(action, user.username, "");
    }

    private UserView applyEnabled(UserAccount user, boolean enabled) {
        if (user.id.equals(currentUser.userId().orElse(null)) && !enabled) {
            throw new DomainException.Conflict("You cannot disable your own account.");
        }
        if (user.enabled != enabled) {
            String before = hash(user);
            user.enabled = enabled;
            entityManager.flush();
            if (!enabled) {
                sessions.endAllOf(user.id, "disabled");
            }
            audit.record(new AuditTrail.Event(currentUser.actor(), enabled ? "user.enabled" : "user.disabled", "user",
                    user.id.toString(), before, hash(user), null));
            SecurityLog.event(enabled ? "account-enabled" : "account-disabled", currentUser.username(),
                    "user=" + user.username);
        }
        return UserView.of(user);
    }

    private UserWithLink issueLink(UserAccount user) {
        String token = Secrets.randomToken(32);
        OffsetDateTime now = now();
        OffsetDateTime expires = now.plus(settings.passwordLinkValidity());
        // a new link replaces any earlier unused one
        entityManager.createNativeQuery("UPDATE password_reset SET used_at = :now WHERE user_id = :user AND used_at IS NULL")
                .setParameter("now", now).setParameter("user", user.id).executeUpdate();
        entityManager.createNativeQuery("""
                INSERT INTO password_reset (token_hash, user_id, created_by, created_at, expires_at)
                VALUES (:hash, :user, :by, :now, :expires)
                """)
                .setParameter("hash", Secrets.sha256Hex(token))
                .setParameter("user", user.id)
                .setParameter("by", currentUser.userId().orElse(null))
                .setParameter("now", now)
                .setParameter("expires", expires)
                .executeUpdate();
        audit.record(new AuditTrail.Event(currentUser.actor(), "password.link-issued", "user", user.id.toString(),
                null, null, "expires=" + expires));
        return new UserWithLink(UserView.of(user), "/password/set#" + token, expires);
    }

    private UserAccount ownLaboratoryMember(long userId) {
        long laboratoryId = currentUser.requireLaboratoryId();
        UserAccount user = users.findByIdOptional(userId)
                .filter(u -> u.laboratoryId != null && u.laboratoryId == laboratoryId)
                .orElseThrow(() -> new DomainException.NotFound("The user"));
        entityManager.lock(user, LockModeType.PESSIMISTIC_WRITE);
        return user;
    }

    private UserAccount lockedUser(long userId) {
        UserAccount user = users.findByIdOptional(userId).orElseThrow(() -> new DomainException.NotFound("The user"));
        entityManager.lock(user, LockModeType.PESSIMISTIC_WRITE);
        return user;
    }

    static String normaliseUsername(String username) {
        String name = username == null ? "" : username.strip().toLowerCase(Locale.ROOT);
        if (!USERNAME.matcher(name).matches()) {
            throw new DomainException.BadRequest(
                    "A username has 3 to 64 characters: letters, digits and . _ @ - (starting with a letter or digit).");
        }
        return name;
    }

    private static String requireText(String value, String what, int max) {
        String clean = value == null ? "" : value.strip();
        if (clean.isEmpty() || clean.length() > max) {
            throw new DomainException.BadRequest("The " + what + " needs 1 to " + max + " characters.");
        }
        return clean;
    }

    private static String hash(UserAccount u) {
        Map<String, Object> fields = new HashMap<>();
        fields.put("id", u.id);
        fields.put("username", u.username);
        fields.put("role", u.role);
        fields.put("laboratoryId", u.laboratoryId);
        fields.put("enabled", u.enabled);
        return ObjectHash.of(fields);
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
