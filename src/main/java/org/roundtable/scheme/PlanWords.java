package org.roundtable.scheme;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.inject.Named;
import org.roundtable.statistics.robust.AlgorithmA;
import org.roundtable.statistics.robust.QuartileRule;

import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.List;
import java.util.Properties;

/**
 * The choices an evaluation plan offers, for the plan editor ({@code inject:planWords}): the constants of each
 * choice (pages show their labels from {@code platform/labels.properties}) and one line of help for each
 * choice and field, from {@code plan-help.properties} beside this class.
 */
@ApplicationScoped
@Named("planWords")
public class PlanWords {

    private static final Properties HELP = load();

    public List<String> assignedValueMethods() {
        return names(EvaluationPlan.AssignedValueMethod.values());
    }

    public List<String> sigmaPtMethods() {
        return names(EvaluationPlan.SigmaPtMethod.values());
    }

    public List<String> scores() {
        return names(EvaluationPlan.Score.values());
    }

    public List<String> boundaryRules() {
        return names(EvaluationPlan.BoundaryRule.values());
    }

    public List<String> belowMinimum() {
        return names(EvaluationPlan.BelowMinimum.values());
    }

    public List<String> quartileRules() {
        return names(QuartileRule.values());
    }

    public List<String> stoppingRules() {
        return names(AlgorithmA.StoppingRule.values());
    }

    /** One line of help for a choice ({@code help('SigmaPtMethod', 'FIXED')}) or a field ({@code help('field', 'sigmaPt')}). */
    public String help(String kind, String name) {
        return HELP.getProperty(kind + "." + name, "");
    }

    private static List<String> names(Enum<?>[] values) {
        return Arrays.stream(values).map(Enum::name).toList();
    }

    private static Properties load() {
        Properties p = new Properties();
        try (InputStream in = PlanWords.class.getResourceAsStream("plan-help.properties")) {
            if (in != null) {
                p.load(new InputStreamReader(in, StandardCharsets.UTF_8));
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return p;
    }
}
