package org.roundtable.web;

import io.quarkus.qute.EngineBuilder;
import io.quarkus.qute.Expression;
import io.quarkus.qute.HtmlEscaper;
import io.quarkus.qute.ResultMapper;
import io.quarkus.qute.TemplateNode;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.enterprise.event.Observes;
import org.roundtable.platform.TextInput;

import java.util.List;

/**
 * Shows text neutralised on every HTML page and document: values are escaped as before and the explicit
 * bidirectional formatting characters are left out ({@link TextInput#withoutBidiControls}), so a stored name with
 * a right-to-left override cannot reorder or disguise what is shown around it. The stored text is unchanged.
 */
@ApplicationScoped
public class BidiNeutraliser {

    void addToEngine(@Observes EngineBuilder builder) {
        builder.addResultMapper(new Mapper());
    }

    static final class Mapper implements ResultMapper {

        private final HtmlEscaper escaper = new HtmlEscaper(
                List.of("text/html", "text/xml", "application/xml", "application/xhtml+xml"));

        @Override
        public int getPriority() {
            return 100;
        }

        @Override
        public boolean appliesTo(TemplateNode.Origin origin, Object result) {
            return result instanceof String && escaper.appliesTo(origin, result);
        }

        @Override
        public String map(Object result, Expression expression) {
            return escaper.map(TextInput.withoutBidiControls((String) result), expression);
        }
    }
}
