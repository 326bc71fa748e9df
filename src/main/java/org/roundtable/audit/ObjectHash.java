package org.roundtable.audit;

import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.Map;
import java.util.TreeMap;

/**
 * SHA-256 of an object's state for the audit trail's before/after hashes: the fields, sorted by name, each
 * written as {@code name=<length>:<value>;}. Secrets (password hashes, tokens) are never part of it.
 */
public final class ObjectHash {

    private ObjectHash() {
    }

    public static String of(Map<String, ?> fields) {
        StringBuilder canonical = new StringBuilder();
        new TreeMap<>(fields).forEach((name, value) -> {
            String text = value == null ? null : value.toString();
            canonical.append(name).append('=');
            if (text == null) {
                canonical.append("-1:;");
            } else {
                canonical.append(text.length()).append(':').append(text).append(';');
            }
        });
        try {
            return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256")
                    .digest(canonical.toString().getBytes(StandardCharsets.UTF_8)));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }
}
