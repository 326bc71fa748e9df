package org.roundtable.submission.intake;

import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.StreamReadConstraints;
import com.fasterxml.jackson.core.json.JsonReadFeature;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.cfg.JsonNodeFeature;
import com.fasterxml.jackson.databind.json.JsonMapper;
import com.fasterxml.jackson.databind.node.JsonNodeFactory;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.EnumMap;
import java.util.Iterator;
import java.util.List;
import java.util.Map;

/**
 * Reads a JSON upload: {@code {"results":[{"measurand":"Mn","item":"A","value":"1.23","unit":"%",
 * "expandedUncertainty":"0.02","coverageFactor":"2","method":"spark-oes","replicates":3,
 * "replicateValues":["1.22","1.23","1.24"]}]}}.
 *
 * <p>Numbers should be JSON strings (they keep the reported decimals); JSON numbers are accepted and their
 * "as reported" text is the plain text of the {@link java.math.BigDecimal} Jackson reads (so {@code 1.230} stays
 * {@code 1.230}, {@code 1e-3} becomes {@code 0.001}). Row = index in {@code results} + 1, column = field name.
 *
 * <p>Structure rules: strict UTF-8 (a UTF-8 BOM is skipped) else {@code file.not-utf8}; not well-formed JSON (also
 * comments, trailing commas, duplicate keys, nesting deeper than 8, strings longer than the cell limit) →
 * {@code json.malformed}; no top-level object with a {@code results} array, or an element that is not an object →
 * {@code json.structure}; other top-level or result fields → {@code json.unknown-field}; an object, array or boolean
 * where a string or number belongs → {@code json.wrong-type}.
 */
final class JsonUploadReader {

    private final Limits limits;
    private final JsonMapper mapper;
    private Detection detection = Detection.of(UploadFormat.JSON);

    JsonUploadReader(Limits limits, JsonMapper mapper) {
        this.limits = limits;
        this.mapper = mapper;
    }

    /** The strict mapper for uploads; thread-safe, built once per {@link ResultIntake}. */
    static JsonMapper strictMapper(Limits limits) {
        JsonMapper mapper = JsonMapper.builder()
                .enable(JsonParser.Feature.STRICT_DUPLICATE_DETECTION)
                .disable(JsonReadFeature.ALLOW_JAVA_COMMENTS)
                .enable(DeserializationFeature.USE_BIG_DECIMAL_FOR_FLOATS)
                .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS)
                .disable(JsonNodeFeature.STRIP_TRAILING_BIGDECIMAL_ZEROES)
                .nodeFactory(JsonNodeFactory.withExactBigDecimals(true))
                .build();
        mapper.getFactory().setStreamReadConstraints(StreamReadConstraints.builder()
                .maxNestingDepth(8)
                .maxStringLength(Math.max(limits.maxCellChars() * 4, 1024))
                .maxNumberLength(limits.maxCellChars())
                .build());
        return mapper;
    }

    Detection detection() {
        return detection;
    }

    List<RawRow> read(byte[] bytes, List<IntakeProblem> problems) throws UploadRejectedException {
        if (bytes.length == 0) {
            throw reject(IntakeKey.FILE_EMPTY, "The upload is empty.");
        }
        String binaryType = FileSignatures.binaryTypeName(bytes);
        if (binaryType != null) {
            throw reject(IntakeKey.FILE_TYPE_MISMATCH, "The upload was sent as JSON but is " + binaryType + ".");
        }
        int start = 0;
        boolean bom = FileSignatures.startsWith(bytes, new byte[] {(byte) 0xEF, (byte) 0xBB, (byte) 0xBF});
        if (bom) {
            start = 3;
        }
        String text;
        try {
            text = StandardCharsets.UTF_8.newDecoder()
                    .onMalformedInput(CodingErrorAction.REPORT)
                    .onUnmappableCharacter(CodingErrorAction.REPORT)
                    .decode(ByteBuffer.wrap(bytes, start, bytes.length - start))
                    .toString();
        } catch (CharacterCodingException e) {
            throw reject(IntakeKey.FILE_NOT_UTF8, "JSON must be UTF-8 encoded.");
        }
        detection = detection.withEncoding("UTF-8", bom);
        if (text.isBlank()) {
            throw reject(IntakeKey.FILE_EMPTY, "The upload is empty.");
        }
        JsonNode root;
        try {
            root = mapper.readTree(text);
        } catch (JsonProcessingException e) {
            long line = e.getLocation() == null ? 0 : e.getLocation().getLineNr();
            throw reject(IntakeKey.JSON_MALFORMED, "The JSON text is not well-formed"
                    + (line > 0 ? " (near line " + line + ")" : "") + ".");
        } catch (IOException e) {
            throw reject(IntakeKey.JSON_MALFORMED, "The JSON text could not be read.");
        }
        if (root == null || !root.isObject() || !root.has("results") || !root.get("results").isArray()) {
            throw reject(IntakeKey.JSON_STRUCTURE, "Expected an object with a 'results' array.");
        }
        Iterator<String> topFields = root.fieldNames();
        while (topFields.hasNext()) {
            String field = topFields.next();
            if (!field.equals("results")) {
                problems.add(IntakeProblem.of(0, field, null, IntakeKey.JSON_UNKNOWN_FIELD,
                        "The field '" + Texts.shown(field) + "' is not part of the format."));
            }
        }
        JsonNode results = root.get("results");
        if (results.size() > limits.maxDataRows()) {
            throw reject(IntakeKey.FILE_TOO_MANY_ROWS, "The upload has more than " + limits.maxDataRows()
                    + " results.");
        }
        List<RawRow> rows = new ArrayList<>();
        for (int index = 0; index < results.size(); index++) {
            int row = index + 1;
            JsonNode element = results.get(index);
            if (!element.isObject()) {
                problems.add(IntakeProblem.of(row, null, null, IntakeKey.JSON_STRUCTURE,
                        "Result " + row + " is not a JSON object."));
                continue;
            }
            RawRow raw = rawRow(row, element, problems);
            if (raw != null) {
                rows.add(raw);
            }
        }
        return rows;
    }

    private RawRow rawRow(int row, JsonNode element, List<IntakeProblem> problems) {
        Map<UploadColumn, String> cells = new EnumMap<>(UploadColumn.class);
        List<String> replicateValues = null;
        boolean valid = true;
        Iterator<Map.Entry<String, JsonNode>> fields = element.fields();
        while (fields.hasNext()) {
            Map.Entry<String, JsonNode> field = fields.next();
            var column = UploadColumn.fromJsonField(field.getKey());
            if (column.isEmpty()) {
                problems.add(IntakeProblem.of(row, field.getKey(), null, IntakeKey.JSON_UNKNOWN_FIELD,
                        "The field '" + Texts.shown(field.getKey()) + "' is not part of the format."));
                valid = false;
                continue;
            }
            JsonNode node = field.getValue();
            if (node.isNull()) {
                continue;
            }
            if (column.get() == UploadColumn.REPLICATE_VALUES) {
                if (!node.isArray()) {
                    problems.add(wrongType(row, field.getKey(), "an array of strings"));
                    valid = false;
                    continue;
                }
                replicateValues = new ArrayList<>();
                for (JsonNode value : node) {
                    String text = scalarText(value);
                    if (text == null) {
                        problems.add(wrongType(row, field.getKey(), "an array of strings"));
                        valid = false;
                        break;
                    }
                    replicateValues.add(text);
                }
                continue;
            }
            String text = scalarText(node);
            if (text == null) {
                problems.add(wrongType(row, field.getKey(), "a string"));
                valid = false;
                continue;
            }
            if (!text.isEmpty()) {
                cells.put(column.get(), text);
            }
        }
        for (UploadColumn column : UploadColumn.values()) {
            if (column != UploadColumn.ITEM && column != UploadColumn.REPLICATE_VALUES && !cells.containsKey(column)
                    && !element.has(column.jsonName()) && isRequiredField(column)) {
                problems.add(IntakeProblem.of(row, column.jsonName(), null, IntakeKey.VALUE_MISSING,
                        "The field '" + column.jsonName() + "' is missing."));
                valid = false;
            }
        }
        return valid ? new RawRow(row, cells, replicateValues) : null;
    }

    private static boolean isRequiredField(UploadColumn column) {
        return column == UploadColumn.MEASURAND || column == UploadColumn.VALUE || column == UploadColumn.UNIT
                || column == UploadColumn.METHOD || column == UploadColumn.REPLICATES;
    }

    /** String text, or the plain text of a number; {@code null} for objects, arrays and booleans. */
    private static String scalarText(JsonNode node) {
        if (node.isTextual()) {
            return node.textValue();
        }
        if (node.isNumber()) {
            return node.decimalValue().toPlainString();
        }
        return null;
    }

    private static IntakeProblem wrongType(int row, String field, String expected) {
        return IntakeProblem.of(row, field, null, IntakeKey.JSON_WRONG_TYPE,
                "The field '" + field + "' must be " + expected + ".");
    }

    private static UploadRejectedException reject(IntakeKey key, String message) {
        return new UploadRejectedException(IntakeProblem.ofFile(key, message));
    }
}
