package org.roundtable.report.model;

import java.util.List;

/**
 * Advice on reading the scores, printed after the fixed classification rules and caution.
 *
 * @param paragraphs the scheme's own advice, one paragraph each; may be empty
 */
public record InterpretationAdvice(List<String> paragraphs) {

    public InterpretationAdvice {
        paragraphs = List.copyOf(paragraphs);
    }

    /** General advice for metals-analysis schemes. */
    public static InterpretationAdvice general() {
        return new InterpretationAdvice(List.of(
                "A single questionable score is a signal to look at the result, not proof of a fault. "
                        + "Two questionable scores in a row for the same measurand, or one unsatisfactory "
                        + "score, call for an investigation of cause and a corrective action.",
                "Look for patterns across measurands: a shared bias in several elements often points to "
                        + "calibration, drift correction or sample preparation rather than to one element.",
                "Compare your expanded uncertainty with your deviation from the assigned value: a result "
                        + "far from x_pt with a small U suggests the uncertainty is underestimated."));
    }
}
