package org.roundtable.evaluation;

import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.roundtable.account.Role;

/**
 * Exports of a round's evaluation: results (CSV, JSON) and the {@code evaluate} command's input, of any run for
 * coordinators, and of the published run for the round's laboratories (from the preliminary report on), auditors
 * (from the final report on) and coordinators. See {@link EvaluationExports} and docs/reports.md, "Exports".
 */
@Path("/api/v1/rounds")
public class EvaluationExportResource {

    static final String CSV = "text/csv; charset=UTF-8";
    /** The response header carrying the {@code evaluate} command's arguments, separated by spaces. */
    static final String EVALUATE_ARGUMENTS = "Evaluate-Arguments";

    private final EvaluationExports exports;

    public EvaluationExportResource(EvaluationExports exports) {
        this.exports = exports;
    }

    // ---- any run: coordinators ---------------------------------------------------------------------------

    @GET
    @Path("{roundId}/evaluations/{version}/results.json")
    @Produces(MediaType.APPLICATION_JSON)
    @RolesAllowed(Role.COORDINATOR_NAME)
    public EvaluationExports.ResultsExport runResultsJson(@PathParam("roundId") long roundId,
                                                          @PathParam("version") int version) {
        return exports.runResults(roundId, version);
    }

    @GET
    @Path("{roundId}/evaluations/{version}/results.csv")
    @Produces("text/csv")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response runResultsCsv(@PathParam("roundId") long roundId, @PathParam("version") int version) {
        EvaluationExports.ResultsExport export = exports.runResults(roundId, version);
        return csv(EvaluationExports.resultsCsv(export), fileName(export.roundCode(), export.evaluationVersion(), "results"));
    }

    @GET
    @Path("{roundId}/evaluations/{version}/evaluate-input.csv")
    @Produces("text/csv")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response runEvaluateInput(@PathParam("roundId") long roundId, @PathParam("version") int version) {
        return evaluateInput(exports.runEvaluateInput(roundId, version));
    }

    // ---- the published run ---------------------------------------------------------------------------------

    @GET
    @org.roundtable.account.ApiTokenScope.Required(org.roundtable.account.ApiTokenScope.READ_SCORES)
    @Path("{roundId}/published/results.json")
    @Produces(MediaType.APPLICATION_JSON)
    @RolesAllowed({Role.COORDINATOR_NAME, Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME, Role.AUDITOR_NAME})
    public EvaluationExports.ResultsExport publishedResultsJson(@PathParam("roundId") long roundId) {
        return exports.publishedResults(roundId);
    }

    @GET
    @org.roundtable.account.ApiTokenScope.Required(org.roundtable.account.ApiTokenScope.READ_SCORES)
    @Path("{roundId}/published/results.csv")
    @Produces("text/csv")
    @RolesAllowed({Role.COORDINATOR_NAME, Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME, Role.AUDITOR_NAME})
    public Response publishedResultsCsv(@PathParam("roundId") long roundId) {
        EvaluationExports.ResultsExport export = exports.publishedResults(roundId);
        return csv(EvaluationExports.resultsCsv(export), fileName(export.roundCode(), export.evaluationVersion(), "results"));
    }

    @GET
    @org.roundtable.account.ApiTokenScope.Required(org.roundtable.account.ApiTokenScope.READ_SCORES)
    @Path("{roundId}/published/evaluate-input.csv")
    @Produces("text/csv")
    @RolesAllowed({Role.COORDINATOR_NAME, Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME, Role.AUDITOR_NAME})
    public Response publishedEvaluateInput(@PathParam("roundId") long roundId) {
        return evaluateInput(exports.publishedEvaluateInput(roundId));
    }

    private static Response evaluateInput(EvaluationExports.EvaluateInput input) {
        return Response.fromResponse(csv(input.csv(), fileName(input.roundCode(), input.evaluationVersion(),
                "evaluate-input"))).header(EVALUATE_ARGUMENTS, String.join(" ", input.arguments())).build();
    }

    static Response csv(String body, String fileName) {
        return Response.ok(body, CSV).header("Content-Disposition", "attachment; filename=\"" + fileName + "\"").build();
    }

    /** {@code <round code>-v<version>-<what>.csv}, with only letters, digits and hyphens from the round code. */
    static String fileName(String roundCode, int version, String what) {
        return roundCode.replaceAll("[^A-Za-z0-9-]", "_") + "-v" + version + "-" + what + ".csv";
    }
}
