package org.roundtable.report.model;

import java.util.HashSet;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import java.util.Set;

/**
 * The round report: everything the full report of a proficiency test round shows (ISO/IEC 17043
 * report contents), evaluated and ready to render.
 *
 * @param identity report number, status, issue date, provider
 * @param scheme the scheme
 * @param round the round
 * @param item the test item with homogeneity and stability results
 * @param measurands one section per measurand (and item), in report order
 * @param pairs pairs of measurand sections shown as Youden plots; empty when the round has no paired items
 * @param evaluation how the evaluation was done
 * @param coordinatorComments the coordinator's comments; may be empty
 * @param signatures who signed the report off
 * @param confidentialityStatement the confidentiality statement
 * @param advice advice on interpreting the scores
 */
public record RoundReport(ReportIdentity identity, SchemeInfo scheme, RoundInfo round, ItemInfo item,
        List<MeasurandSection> measurands, List<PairedItems> pairs, EvaluationNotes evaluation,
        String coordinatorComments, Signatures signatures, String confidentialityStatement,
        InterpretationAdvice advice) {

    public RoundReport {
        Objects.requireNonNull(identity, "identity");
        Objects.requireNonNull(scheme, "scheme");
        Objects.requireNonNull(round, "round");
        Objects.requireNonNull(item, "item");
        Objects.requireNonNull(evaluation, "evaluation");
        Objects.requireNonNull(signatures, "signatures");
        Objects.requireNonNull(confidentialityStatement, "confidentialityStatement");
        Objects.requireNonNull(advice, "advice");
        measurands = List.copyOf(measurands);
        pairs = List.copyOf(pairs);
        coordinatorComments = coordinatorComments == null ? "" : coordinatorComments;
        Set<String> ids = new HashSet<>();
        for (MeasurandSection m : measurands) {
            if (!ids.add(m.id())) {
                throw new IllegalArgumentException("duplicate measurand id " + m.id());
            }
        }
        for (PairedItems p : pairs) {
            if (!ids.contains(p.firstMeasurandId()) || !ids.contains(p.secondMeasurandId())) {
                throw new IllegalArgumentException("pair refers to an unknown measurand: " + p);
            }
        }
        // a preliminary report is issued before sign-off; final and amended reports carry every signature
        if (scheme.secondReviewerRequired() && signatures.secondReviewer() == null
                && identity.status() != ReportStatus.PRELIMINARY) {
            throw new IllegalArgumentException("the scheme requires a second reviewer");
        }
    }

    /** The measurand section with this id. */
    public Optional<MeasurandSection> measurand(String id) {
        return measurands.stream().filter(m -> m.id().equals(id)).findFirst();
    }

    /** Total number of participant results over all measurands. */
    public int resultCount() {
        return measurands.stream().mapToInt(m -> m.results().size()).sum();
    }
}
