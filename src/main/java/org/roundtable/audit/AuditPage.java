package org.roundtable.audit;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.QueryParam;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.roundtable.account.CurrentUser;
import org.roundtable.job.Job;
import org.roundtable.job.JobService;

import java.net.URI;
import java.util.List;

/**
 * The audit trail page for coordinators and admins: entries newest first, filtered by actor, kind of action and
 * object, paged by sequence number; "verified up to entry N at T" from the latest checkpoint, which a bounded
 * incremental check advances in the background ({@link AuditCheckpointSchedule}; a view only reads it and writes
 * nothing); the whole chain checked on demand as a background job.
 */
@Path("/audit")
@Produces(MediaType.TEXT_HTML)
@RolesAllowed({"coordinator", "admin"})
public class AuditPage {

    static final int PAGE_SIZE = 50;

    /** Everything the page shows. */
    public record View(List<Row> entries, AuditSearch.Slice slice, AuditSearch.Filter filter,
                       AuditCheckpoints.Status status, List<AuditSearch.Choice> actions,
                       List<AuditSearch.Choice> objectTypes, Job check) {
    }

    /** An entry with its action in words and its detail cut to {@value #DETAIL_SHOWN} characters. */
    public record Row(AuditEntry entry, String action, String object, String detail, boolean detailCut) {
    }

    static final int DETAIL_SHOWN = 240;

    @CheckedTemplate(basePath = "audit")
    static class Templates {
        static native TemplateInstance trail(View page);
    }

    private final AuditSearch search;
    private final AuditCheckpoints checkpoints;
    private final JobService jobs;
    private final CurrentUser currentUser;

    public AuditPage(AuditSearch search, AuditCheckpoints checkpoints, JobService jobs, CurrentUser currentUser) {
        this.search = search;
        this.checkpoints = checkpoints;
        this.jobs = jobs;
        this.currentUser = currentUser;
    }

    @GET
    public TemplateInstance trail(@QueryParam("before") Long before, @QueryParam("after") Long after,
                                  @QueryParam("actor") String actor, @QueryParam("action") String action,
                                  @QueryParam("type") String objectType, @QueryParam("object") String objectId,
                                  @QueryParam("check") Long checkJob) {
        AuditSearch.Filter filter = new AuditSearch.Filter(clip(actor, 128), clip(action, 64), clip(objectType, 64),
                clip(objectId, 128));
        AuditSearch.Slice slice = search.page(filter, before, after, PAGE_SIZE);
        // reads the latest checkpoint only: a view writes nothing (AuditCheckpointSchedule advances it)
        AuditCheckpoints.Status status = checkpoints.latest();
        Job check = checkJob == null ? null : jobs.find(checkJob)
                .filter(j -> AuditVerificationJob.KIND.equals(j.kind)).orElse(null);
        List<Row> rows = slice.entries().stream().map(e -> new Row(e, AuditSearch.label(e.action()),
                AuditSearch.objectWords(e.objectType()),
                e.detail() == null ? "" : e.detail().length() <= DETAIL_SHOWN ? e.detail()
                        : e.detail().substring(0, DETAIL_SHOWN), e.detail() != null && e.detail().length() > DETAIL_SHOWN)).toList();
        return Templates.trail(new View(rows, slice, filter, status, search.actions(), search.objectTypes(), check));
    }

    /** Queues the check of the whole chain and shows the page with its progress. */
    @POST
    @Path("/verification")
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response verifyAll() {
        Job job = checkpoints.requestFullCheck(currentUser.actor());
        return Response.seeOther(URI.create("/audit?check=" + job.id)).build();
    }

    private static String clip(String text, int max) {
        return text == null ? null : text.length() > max ? text.substring(0, max) : text;
    }
}
