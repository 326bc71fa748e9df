package org.roundtable.submission.intake;

import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HexFormat;
import java.util.List;

/**
 * The canonical JSON of accepted results and its SHA-256, for the submission receipt.
 *
 * <p>Format (version 1), without any whitespace:
 * <pre>{"formatVersion":1,"results":[{"coverageFactor":"2","expandedUncertainty":"0.02","item":"1",
 * "lessThan":false,"measurand":"Mn","method":"spark-oes","replicateValues":["1.22","1.23","1.24"],
 * "replicates":3,"unit":"%","value":"1.23"}, ...]}</pre>
 * <ul>
 *   <li>object keys in alphabetical (code point) order; all keys always present;</li>
 *   <li>numbers as decimal strings ({@link ReportedNumber#decimalText()}: decimal point, reported decimals kept);
 *       {@code expandedUncertainty} is {@code null} when not reported; {@code coverageFactor} is {@code "2"} when not
 *       reported; {@code value} is the limit of a "less than" result;</li>
 *   <li>results sorted by measurand symbol, then item label (code point order), so row order does not matter;</li>
 *   <li>strings escaped as in RFC 8259 with {@code \\uXXXX} for control characters; the hash is over the UTF-8
 *       bytes, lower-case hex.</li>
 * </ul>
 * The same results uploaded as CSV, XLSX or JSON give the same text and hash.
 */
public final class CanonicalPayload {

    /** Increase when the canonical form changes; old receipts keep their version. */
    public static final int FORMAT_VERSION = 1;

    private CanonicalPayload() {
    }

    /** The canonical JSON of {@code results}. */
    public static String toJson(List<ReportedResult> results) {
        List<ReportedResult> sorted = new ArrayList<>(results);
        sorted.sort(Comparator.comparing(ReportedResult::measurand).thenComparing(ReportedResult::item));
        StringBuilder json = new StringBuilder();
        json.append("{\"formatVersion\":").append(FORMAT_VERSION).append(",\"results\":[");
        for (int i = 0; i < sorted.size(); i++) {
            ReportedResult result = sorted.get(i);
            if (i > 0) {
                json.append(',');
            }
            json.append("{\"coverageFactor\":");
            string(json, result.coverageFactor().decimalText());
            json.append(",\"expandedUncertainty\":");
            if (result.expandedUncertainty().isPresent()) {
                string(json, result.expandedUncertainty().get().decimalText());
            } else {
                json.append("null");
            }
            json.append(",\"item\":");
            string(json, result.item());
            json.append(",\"lessThan\":").append(result.lessThan());
            json.append(",\"measurand\":");
            string(json, result.measurand());
            json.append(",\"method\":");
            string(json, result.method().code());
            json.append(",\"replicateValues\":[");
            for (int j = 0; j < result.replicateValues().size(); j++) {
                if (j > 0) {
                    json.append(',');
                }
                string(json, result.replicateValues().get(j).decimalText());
            }
            json.append("],\"replicates\":").append(result.replicateCount());
            json.append(",\"unit\":");
            string(json, result.unit().symbol());
            json.append(",\"value\":");
            string(json, result.value().decimalText());
            json.append('}');
        }
        json.append("]}");
        return json.toString();
    }

    /** Lower-case hex SHA-256 of the UTF-8 bytes of {@code text}. */
    public static String sha256Hex(String text) {
        try {
            MessageDigest digest = MessageDigest.getInstance("SHA-256");
            return HexFormat.of().formatHex(digest.digest(text.getBytes(StandardCharsets.UTF_8)));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("every Java platform provides SHA-256", e);
        }
    }

    private static void string(StringBuilder json, String text) {
        json.append('"');
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            switch (c) {
                case '"' -> json.append("\\\"");
                case '\\' -> json.append("\\\\");
                default -> {
                    if (c < 0x20) {
                        json.append(String.format("\\u%04x", (int) c));
                    } else {
                        json.append(c);
                    }
                }
            }
        }
        json.append('"');
    }
}
