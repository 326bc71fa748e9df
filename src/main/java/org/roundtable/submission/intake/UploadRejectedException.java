package org.roundtable.submission.intake;

import java.util.List;

/** Internal: stops reading when a problem makes the rest of the file untrustworthy. Never leaves the package. */
final class UploadRejectedException extends Exception {

    private static final long serialVersionUID = 1L;

    private final transient List<IntakeProblem> problems;

    UploadRejectedException(List<IntakeProblem> problems) {
        super(null, null, false, false);
        this.problems = List.copyOf(problems);
    }

    UploadRejectedException(IntakeProblem problem) {
        this(List.of(problem));
    }

    List<IntakeProblem> problems() {
        return problems;
    }
}
