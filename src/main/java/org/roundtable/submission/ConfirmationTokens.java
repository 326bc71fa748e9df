package org.roundtable.submission;

import jakarta.enterprise.context.ApplicationScoped;
import org.roundtable.account.CurrentUser;
import org.roundtable.account.SessionKey;
import org.roundtable.platform.Secrets;

import javax.crypto.Mac;
import javax.crypto.spec.SecretKeySpec;
import java.nio.charset.StandardCharsets;
import java.security.GeneralSecurityException;
import java.time.Clock;
import java.time.Duration;
import java.util.HexFormat;
import java.util.Set;
import java.util.stream.Collectors;

/**
 * The results pages' proof that a laboratory saw what it confirms: a stateless signed token given with the warnings
 * and the measurands a submit would no longer report, bound to exactly those, the payload's hash, the person, the
 * laboratory and the round. A box ticked in advance, a token of other values or of other warnings confirms nothing;
 * a token lasts {@link #LIFETIME}. The API's {@code confirmWarnings=true} and {@code replaceAll=true} do not use it.
 *
 * <p>Form: {@code <expiry epoch seconds>.<HMAC-SHA256 hex>}, keyed by a key derived from the session key.
 */
@ApplicationScoped
public class ConfirmationTokens {

    /** How long a confirmation may wait for the laboratory's answer. */
    static final Duration LIFETIME = Duration.ofHours(2);

    private final CurrentUser currentUser;
    private final Clock clock;
    private final byte[] key;

    public ConfirmationTokens(CurrentUser currentUser, SessionKey sessionKey, Clock clock) {
        this.currentUser = currentUser;
        this.clock = clock;
        this.key = sessionKey.derive("results-confirmation");
    }

    /** A token for what the page shows now. */
    public String issue(long roundId, SubmissionService.Shown shown) {
        long expiry = clock.instant().plus(LIFETIME).getEpochSecond();
        return expiry + "." + mac(roundId, shown, expiry);
    }

    /**
     * The consent of a page's answer: warnings are confirmed when the token matches what would be shown and every
     * warning's box ({@code 0..n-1}) is ticked; dropped measurands when the token matches and "replace" is ticked.
     */
    public SubmissionService.Consent consent(long roundId, String token, Set<String> tickedWarnings, boolean replaceTicked) {
        return new SubmissionService.Consent() {
            @Override
            public boolean confirmsWarnings(SubmissionService.Shown shown) {
                return valid(roundId, token, shown) && tickedWarnings.size() >= shown.warnings().size()
                        && java.util.stream.IntStream.range(0, shown.warnings().size())
                        .allMatch(i -> tickedWarnings.contains(String.valueOf(i)));
            }

            @Override
            public boolean replacesAll(SubmissionService.Shown shown) {
                return replaceTicked && valid(roundId, token, shown);
            }
        };
    }

    boolean valid(long roundId, String token, SubmissionService.Shown shown) {
        if (token == null || token.length() > 200) {
            return false;
        }
        int dot = token.indexOf('.');
        if (dot <= 0) {
            return false;
        }
        long expiry;
        try {
            expiry = Long.parseLong(token.substring(0, dot));
        } catch (NumberFormatException e) {
            return false;
        }
        if (clock.instant().getEpochSecond() > expiry) {
            return false;
        }
        return Secrets.constantTimeEquals(token.substring(dot + 1), mac(roundId, shown, expiry));
    }

    private String mac(long roundId, SubmissionService.Shown shown, long expiry) {
        String warnings = shown.warnings().stream()
                .map(w -> w.key() + "|" + w.row() + "|" + w.column() + "|" + w.value() + "|" + w.message())
                .collect(Collectors.joining("\n"));
        String text = String.join("\u001f", "results-confirmation",
                String.valueOf(currentUser.laboratoryId().orElse(-1L)), currentUser.username(), String.valueOf(roundId),
                shown.payloadSha256(), Secrets.sha256Hex(warnings), String.join("\n", shown.dropped()),
                String.valueOf(shown.replacedCount()), String.valueOf(expiry));
        try {
            Mac hmac = Mac.getInstance("HmacSHA256");
            hmac.init(new SecretKeySpec(key, "HmacSHA256"));
            return HexFormat.of().formatHex(hmac.doFinal(text.getBytes(StandardCharsets.UTF_8)));
        } catch (GeneralSecurityException e) {
            throw new IllegalStateException(e);
        }
    }
}
