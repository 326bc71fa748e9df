package org.roundtable.web;

import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.databind.DeserializationContext;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.deser.std.StdScalarDeserializer;
import com.fasterxml.jackson.databind.deser.std.StringDeserializer;
import com.fasterxml.jackson.databind.module.SimpleModule;
import io.quarkus.jackson.ObjectMapperCustomizer;
import jakarta.inject.Singleton;
import org.roundtable.platform.TextInput;

import java.io.IOException;

/**
 * Applies {@link TextInput}'s rule to every string of a JSON request body (records, lists and arrays of strings
 * alike): a control character is refused with 400 naming the field. {@link ProblemMapper#json} turns the
 * refusal, which Jackson wraps with the path, into the problem body.
 */
@Singleton
public class JsonText implements ObjectMapperCustomizer {

    @Override
    public void customize(ObjectMapper mapper) {
        mapper.registerModule(new SimpleModule("roundtable-text-input").addDeserializer(String.class, new Checked()));
    }

    static final class Checked extends StdScalarDeserializer<String> {

        Checked() {
            super(String.class);
        }

        @Override
        public String deserialize(JsonParser parser, DeserializationContext context) throws IOException {
            String text = StringDeserializer.instance.deserialize(parser, context);
            int at = TextInput.firstRefused(text);
            if (at >= 0) {
                throw new TextInput.Refused(parser.currentName(), at);
            }
            return text;
        }
    }
}
