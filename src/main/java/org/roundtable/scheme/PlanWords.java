package org.roundtable.scheme;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.inject.Named;

import java.util.Arrays;
import java.util.List;

/** The choices an evaluation plan offers, for the plan editor's help ({@code inject:planWords}). */
@ApplicationScoped
@Named("planWords")
public class PlanWords {

    public List<String> assignedValueMethods() {
        return names(EvaluationPlan.AssignedValueMethod.values());
    }

    public List<String> sigmaPtMethods() {
        return names(EvaluationPlan.SigmaPtMethod.values());
    }

    public List<String> scores() {
        return names(EvaluationPlan.Score.values());
    }

    private static List<String> names(Enum<?>[] values) {
        return Arrays.stream(values).map(Enum::name).toList();
    }
}
