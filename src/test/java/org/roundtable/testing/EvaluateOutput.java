package org.roundtable.testing;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.io.UncheckedIOException;

/** The {@code evaluate} command's JSON Lines output (one measurand a line) gathered as {@code {"measurands": [...]}}. */
public final class EvaluateOutput {

    private static final ObjectMapper MAPPER = new ObjectMapper();

    private EvaluateOutput() {
    }

    public static JsonNode read(String jsonLines) {
        ObjectNode root = MAPPER.createObjectNode();
        ArrayNode measurands = root.putArray("measurands");
        for (String line : jsonLines.split("\n")) {
            if (line.isBlank()) {
                continue;
            }
            try {
                JsonNode node = MAPPER.readTree(line);
                if (!node.isObject() || !node.has("measurand")) {
                    throw new AssertionError("not one measurand a line: " + line);
                }
                measurands.add(node);
            } catch (IOException e) {
                throw new UncheckedIOException("not JSON Lines: " + line, e);
            }
        }
        return root;
    }
}
