package org.roundtable.submission;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import org.roundtable.submission.intake.UploadFormat;

import java.nio.charset.StandardCharsets;
import java.util.List;

/**
 * Demo results (invented): three of the five demo laboratories have already reported in the open round
 * {@code NLS-2026-2}; Kestrel Alloys and one other have not, so a visitor can report as {@code kestrel.analyst}.
 * Each demo laboratory reports through the same validation path as everyone.
 */
@ApplicationScoped
public class DemoSubmissions {

    /** Per laboratory (by enrolment order): C, N, Si, P, S, Cr, Mn, Ni, Cu, Mo as each would report them. */
    static final List<String[]> RESULTS = List.of(
            new String[]{"0.412", "86", "0.254", "0.0121", "0.0084", "1.052", "0.748", "0.201", "0.162", "0.215"},
            new String[]{"0.405", "91", "0.249", "0.0118", "0.0081", "1.061", "0.741", "0.198", "0.158", "0.219"},
            new String[]{"0.418", "84", "0.258", "0.0125", "0.0087", "1.047", "0.755", "0.204", "0.165", "0.212"});
    static final List<String> ELEMENTS = List.of("C", "N", "Si", "P", "S", "Cr", "Mn", "Ni", "Cu", "Mo");
    static final List<String> METHODS = List.of("combustion", "inert-gas-fusion", "spark-oes", "spark-oes", "combustion",
            "spark-oes", "spark-oes", "spark-oes", "spark-oes", "spark-oes");

    private final SubmissionService submissions;
    private final EntityManager entityManager;

    public DemoSubmissions(SubmissionService submissions, EntityManager entityManager) {
        this.submissions = submissions;
        this.entityManager = entityManager;
    }

    /** Runs after the demo accounts and schemes are committed (each submission commits on its own). */
    public void load() {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT r.id, p.laboratory_id FROM round r JOIN round_participant p ON p.round_id = r.id
                 WHERE r.code = 'NLS-2026-2' ORDER BY p.laboratory_id
                """).getResultList();
        // skip the first laboratory (Kestrel Alloys), so that the demo's own laboratory still has to report
        for (int i = 1; i < rows.size() && i <= RESULTS.size(); i++) {
            long roundId = ((Number) rows.get(i)[0]).longValue();
            long laboratoryId = ((Number) rows.get(i)[1]).longValue();
            submissions.submitFor(laboratoryId, roundId, new SubmissionService.Upload(SubmissionService.Channel.JSON,
                    UploadFormat.JSON, json(RESULTS.get(i - 1)), null, "application/json"), true, null, null);
        }
    }

    /** Invented results of the five demo laboratories in the earlier round NLS-2026-1 (demo only). */
    static final List<String[]> PAST_RESULTS = List.of(
            new String[]{"0.384", "78", "0.231", "0.0142", "0.0092", "0.982", "0.812", "0.151", "0.184", "0.241"},
            new String[]{"0.379", "83", "0.236", "0.0139", "0.0089", "0.991", "0.805", "0.149", "0.181", "0.238"},
            new String[]{"0.391", "75", "0.228", "0.0145", "0.0095", "0.975", "0.819", "0.154", "0.187", "0.244"},
            new String[]{"0.386", "80", "0.233", "0.0141", "0.0090", "0.987", "0.809", "0.152", "0.183", "0.240"},
            new String[]{"0.402", "92", "0.239", "0.0151", "0.0099", "1.012", "0.838", "0.158", "0.190", "0.249"});

    /**
     * Invented expanded uncertainties (k = 2) that three of the five laboratories report with their results in the
     * earlier round, so that its reports show ζ and En beside z (demo only).
     */
    static final String[] PAST_UNCERTAINTIES = {"0.012", "7", "0.010", "0.0015", "0.0012", "0.025", "0.018", "0.008",
        "0.008", "0.010"};
    static final java.util.Set<Integer> PAST_WITH_UNCERTAINTY = java.util.Set.of(0, 1, 3);

    /** Every demo laboratory reports in the earlier round NLS-2026-1 (still open for results at this point). */
    public void loadPastRound() {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT r.id, p.laboratory_id FROM round r JOIN round_participant p ON p.round_id = r.id
                 WHERE r.code = 'NLS-2026-1' ORDER BY p.laboratory_id
                """).getResultList();
        for (int i = 0; i < rows.size() && i < PAST_RESULTS.size(); i++) {
            submissions.submitFor(((Number) rows.get(i)[1]).longValue(), ((Number) rows.get(i)[0]).longValue(),
                    new SubmissionService.Upload(SubmissionService.Channel.JSON, UploadFormat.JSON,
                            json(PAST_RESULTS.get(i), PAST_WITH_UNCERTAINTY.contains(i) ? PAST_UNCERTAINTIES : null),
                            null, "application/json"), true, null, null);
        }
    }

    private static byte[] json(String[] values) {
        return json(values, null);
    }

    private static byte[] json(String[] values, String[] uncertainties) {
        StringBuilder out = new StringBuilder("{\"results\":[");
        for (int e = 0; e < ELEMENTS.size(); e++) {
            if (e > 0) {
                out.append(',');
            }
            String unit = ELEMENTS.get(e).equals("N") ? "mg/kg" : "%";
            out.append("{\"measurand\":\"").append(ELEMENTS.get(e)).append("\",\"value\":\"").append(values[e])
                    .append("\",\"unit\":\"").append(unit).append("\",\"method\":\"").append(METHODS.get(e));
            if (uncertainties != null) {
                out.append("\",\"expandedUncertainty\":\"").append(uncertainties[e]).append("\",\"coverageFactor\":\"2");
            }
            out.append("\",\"replicates\":2}");
        }
        return out.append("]}").toString().getBytes(StandardCharsets.UTF_8);
    }
}
