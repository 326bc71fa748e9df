package org.roundtable.submission.intake;

import java.util.List;
import java.util.Objects;

/**
 * The outcome of reading one upload: all results accepted, or none.
 *
 * <p>There is no partial outcome. {@link Rejected} lists every problem found (file-level problems stop the reading
 * early, because nothing below them can be trusted; row problems are all collected).
 */
public sealed interface IntakeResult permits IntakeResult.Accepted, IntakeResult.Rejected {

    /** What was detected about the file (format, encoding, BOM, delimiter, decimal separator). */
    Detection detection();

    /**
     * Every row was valid.
     *
     * @param results       the results in file order
     * @param warnings      things the laboratory confirms (values outside the expected range, measurands not reported)
     * @param detection     what was detected about the file
     * @param canonicalJson the results as canonical JSON, see {@link CanonicalPayload}
     * @param sha256        lower-case hex SHA-256 of the UTF-8 bytes of {@code canonicalJson}
     */
    record Accepted(List<ReportedResult> results, List<IntakeWarning> warnings, Detection detection,
                    String canonicalJson, String sha256) implements IntakeResult {

        public Accepted {
            results = List.copyOf(results);
            warnings = List.copyOf(warnings);
            Objects.requireNonNull(detection, "detection");
            Objects.requireNonNull(canonicalJson, "canonicalJson");
            Objects.requireNonNull(sha256, "sha256");
        }
    }

    /**
     * The upload is refused; nothing of it may be stored.
     *
     * @param problems  every problem found, at least one
     * @param detection what was detected before the upload was refused
     */
    record Rejected(List<IntakeProblem> problems, Detection detection) implements IntakeResult {

        public Rejected {
            problems = List.copyOf(problems);
            if (problems.isEmpty()) {
                throw new IllegalArgumentException("a rejection needs at least one problem");
            }
            Objects.requireNonNull(detection, "detection");
        }
    }
}
