package org.roundtable.submission;

import com.fasterxml.jackson.databind.ObjectMapper;
import io.vertx.core.http.HttpServerRequest;
import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.HeaderParam;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.QueryParam;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.roundtable.account.Role;
import org.roundtable.platform.Admission;
import org.roundtable.submission.intake.Limits;
import org.roundtable.submission.intake.UploadFormat;

import java.io.InputStream;
import java.util.List;

/**
 * JSON API for a laboratory's results: members, managers and their LIMS tokens submit and read back their own
 * results. The coordinators' side is {@link RoundSubmissionResource}.
 */
@Path("/api/v1/my-rounds")
@org.roundtable.account.ApiTokenScope.Required(org.roundtable.account.ApiTokenScope.SUBMIT)
@Produces(MediaType.APPLICATION_JSON)
public class SubmissionResource {

    static final String XLSX_TYPE = "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet";

    private final SubmissionService submissions;
    private final SubmissionQueries queries;
    private final SubmissionMessages messages;
    private final ObjectMapper mapper;
    private final HttpServerRequest request;
    private final Admission admission;

    public SubmissionResource(SubmissionService submissions, SubmissionQueries queries, SubmissionMessages messages,
                              ObjectMapper mapper, HttpServerRequest request, Admission admission) {
        this.admission = admission;
        this.submissions = submissions;
        this.queries = queries;
        this.messages = messages;
        this.mapper = mapper;
        this.request = request;
    }

    public record NewMessage(String body) {
    }

    // ---- laboratories -------------------------------------------------------------------------------------

    /**
     * Submits results as JSON: {@code {"results":[{"measurand":"Cr","item":"A","value":"18.12","unit":"%",...}]}}.
     * Send an {@code Idempotency-Key} header to make retries safe; add {@code ?confirmWarnings=true} once the
     * warnings of a first attempt were checked, and {@code ?replaceAll=true} to leave out measurands the current
     * revision reports (else 409 listing them). Values identical to the current revision answer 200 with its
     * receipt, {@code "unchanged": true}, and store nothing; a new revision answers 201.
     */
    @POST
    @Path("{roundId}/submission")
    @Consumes(MediaType.APPLICATION_JSON)
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public Response submitJson(@PathParam("roundId") long roundId, InputStream body,
                               @QueryParam("confirmWarnings") boolean confirmWarnings,
                               @QueryParam("replaceAll") boolean replaceAll,
                               @HeaderParam("Idempotency-Key") String idempotencyKey) {
        // the request holds a place in the submission queue (taken on the event loop by web.EdgeLimits; past its
        // bound: 503); the body is read and parsed only once an upload slot is free (a waiting upload holds no
        // memory); the database work is done outside the slot
        SubmissionService.Prepared prepared = admission.withUpload(body, Limits.defaults().maxFileBytes(), content ->
                submissions.prepare(roundId, new SubmissionService.Upload(SubmissionService.Channel.JSON,
                        UploadFormat.JSON, content, null, MediaType.APPLICATION_JSON)));
        SubmissionViews.Receipt receipt = submissions.submit(prepared,
                SubmissionService.Consent.flags(confirmWarnings, replaceAll), idempotencyKey, clientAddress());
        return Response.status(receipt.unchanged() ? 200 : 201).entity(receipt).build();
    }

    /** Submits a CSV ({@code text/csv}) or XLSX file as the request body; answers as {@link #submitJson}. */
    @POST
    @Path("{roundId}/submission/file")
    @Consumes({"text/csv", XLSX_TYPE})
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public Response submitFile(@PathParam("roundId") long roundId, InputStream body,
                               @HeaderParam("Content-Type") String contentType,
                               @QueryParam("confirmWarnings") boolean confirmWarnings,
                               @QueryParam("replaceAll") boolean replaceAll,
                               @HeaderParam("Idempotency-Key") String idempotencyKey) {
        boolean xlsx = contentType != null && contentType.startsWith(XLSX_TYPE);
        SubmissionService.Prepared prepared = admission.withUpload(body, Limits.defaults().maxFileBytes(), content ->
                submissions.prepare(roundId, new SubmissionService.Upload(
                        xlsx ? SubmissionService.Channel.XLSX : SubmissionService.Channel.CSV,
                        xlsx ? UploadFormat.XLSX : UploadFormat.CSV, content,
                        xlsx ? "api-upload.xlsx" : "api-upload.csv", contentType)));
        SubmissionViews.Receipt receipt = submissions.submit(prepared,
                SubmissionService.Consent.flags(confirmWarnings, replaceAll), idempotencyKey, clientAddress());
        return Response.status(receipt.unchanged() ? 200 : 201).entity(receipt).build();
    }

    @GET
    @Path("{roundId}/submission")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public SubmissionViews.MySubmission mySubmission(@PathParam("roundId") long roundId) {
        return queries.mine(roundId);
    }

    @GET
    @Path("{roundId}/submission/revisions/{revision}")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public SubmissionViews.Revision myRevision(@PathParam("roundId") long roundId, @PathParam("revision") int revision) {
        return queries.myRevision(roundId, revision);
    }

    @GET
    @Path("{roundId}/messages")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public List<SubmissionViews.Message> myMessages(@PathParam("roundId") long roundId) {
        return messages.ownThread(roundId);
    }

    @POST
    @Path("{roundId}/messages")
    @Consumes(MediaType.APPLICATION_JSON)
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public Response postMessage(@PathParam("roundId") long roundId, NewMessage message) {
        return Response.status(201).entity(messages.postAsLaboratory(roundId, message == null ? null : message.body())).build();
    }

    private String clientAddress() {
        return request.remoteAddress() == null ? null : request.remoteAddress().hostAddress();
    }
}
