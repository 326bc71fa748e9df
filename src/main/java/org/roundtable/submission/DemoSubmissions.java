package org.roundtable.submission;

import jakarta.enterprise.context.ApplicationScoped;
import org.roundtable.submission.intake.UploadFormat;

import java.nio.charset.StandardCharsets;
import java.util.List;

/**
 * The submission side of the demo scenario (demo.DemoData assembles it): laboratories' results sent through the
 * same validation path as everyone's, at the time the demo loader's clock gives (late results are late). Warnings
 * are confirmed as a laboratory that checked them would — which is how the demo's unit and decimal slips get in.
 */
@ApplicationScoped
public class DemoSubmissions {

    /** One reported result; {@code expandedUncertainty} and {@code coverageFactor} may be null. */
    public record Result(String element, String unit, String value, String method, String expandedUncertainty,
                         String coverageFactor) {
    }

    private final SubmissionService submissions;

    public DemoSubmissions(SubmissionService submissions) {
        this.submissions = submissions;
    }

    /** A laboratory's results for a round, warnings confirmed; returns the receipt's revision. */
    public int submit(long laboratoryId, long roundId, List<Result> results) {
        return submissions.submitFor(laboratoryId, roundId, new SubmissionService.Upload(SubmissionService.Channel.JSON,
                UploadFormat.JSON, json(results), null, "application/json"), true, null, null).revision();
    }

    static byte[] json(List<Result> results) {
        StringBuilder out = new StringBuilder("{\"results\":[");
        for (int i = 0; i < results.size(); i++) {
            Result r = results.get(i);
            if (i > 0) {
                out.append(',');
            }
            out.append("{\"measurand\":\"").append(r.element()).append("\",\"value\":\"").append(r.value())
                    .append("\",\"unit\":\"").append(r.unit()).append("\",\"method\":\"").append(r.method()).append('"');
            if (r.expandedUncertainty() != null) {
                out.append(",\"expandedUncertainty\":\"").append(r.expandedUncertainty())
                        .append("\",\"coverageFactor\":\"").append(r.coverageFactor() == null ? "2" : r.coverageFactor())
                        .append('"');
            }
            out.append(",\"replicates\":2}");
        }
        return out.append("]}").toString().getBytes(StandardCharsets.UTF_8);
    }
}
