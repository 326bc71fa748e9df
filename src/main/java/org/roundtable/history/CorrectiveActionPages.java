package org.roundtable.history;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.Consumes;
import jakarta.ws.rs.FormParam;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.POST;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.QueryParam;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.jboss.resteasy.reactive.RestForm;
import org.jboss.resteasy.reactive.multipart.FileUpload;
import org.roundtable.account.CurrentUser;
import org.roundtable.account.Role;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.FormActions;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.URI;
import java.nio.file.Files;
import java.util.List;
import java.util.Map;

/**
 * The laboratory's corrective-action record: the list with a form to open an entry for a questionable or
 * unsatisfactory result, and one entry's page (edit, attach, close with a confirmation, correct once closed).
 */
@Path("/my-laboratory/corrective-actions")
@Produces(MediaType.TEXT_HTML)
@RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
public class CorrectiveActionPages {

    @CheckedTemplate(basePath = "history")
    static class Templates {
        static native TemplateInstance correctiveActions(List<CorrectiveActions.Entry> entries,
                                                         List<HistoryService.Entry> candidates, Form form,
                                                         String error);

        static native TemplateInstance correctiveAction(CorrectiveActions.Entry entry,
                                                        List<HistoryService.Entry> rounds, Form form, boolean manager,
                                                        String error, String message);
    }

    /** What was typed, kept on every error. */
    public record Form(String result, String cause, String actionTaken, String evidence, String effectivenessRound,
                       String effectivenessNote) {
        static Form of(CorrectiveActions.Entry e) {
            return new Form(null, e.cause(), e.actionTaken(), e.evidence(),
                    e.effectivenessRoundId() == null ? "" : e.effectivenessRoundId().toString(), e.effectivenessNote());
        }
    }

    private final CorrectiveActions actions;
    private final HistoryService history;
    private final CurrentUser currentUser;

    public CorrectiveActionPages(CorrectiveActions actions, HistoryService history, CurrentUser currentUser) {
        this.actions = actions;
        this.history = history;
        this.currentUser = currentUser;
    }

    @GET
    public TemplateInstance list(@QueryParam("result") String result) {
        return Templates.correctiveActions(actions.own(), candidates(), new Form(result, "", "", "", "", ""), null);
    }

    @POST
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response create(@FormParam("result") String result, @FormParam("cause") String cause,
                           @FormParam("actionTaken") String actionTaken, @FormParam("evidence") String evidence) {
        Form form = new Form(result, cause, actionTaken, evidence, "", "");
        try {
            String[] key = result == null ? new String[0] : result.split(":", 3);
            if (key.length != 3) {
                throw new DomainException.BadRequest("Choose the result the action is for.");
            }
            long round;
            try {
                round = Long.parseLong(key[0]);
            } catch (NumberFormatException e) {
                throw new DomainException.BadRequest("Choose the result the action is for.");
            }
            CorrectiveActions.Entry created = actions.create(round, key[1], key[2],
                    new CorrectiveActions.Draft(cause, actionTaken, evidence, null, null));
            return Response.seeOther(URI.create("/my-laboratory/corrective-actions/" + created.id())).build();
        } catch (DomainException.NotFound | DomainException.Forbidden e) {
            throw e;
        } catch (DomainException e) {
            return Response.status(e.status())
                    .entity(Templates.correctiveActions(actions.own(), candidates(), form, e.detail())).build();
        }
    }

    @GET
    @Path("{actionId}")
    public TemplateInstance entry(@PathParam("actionId") long actionId) {
        CorrectiveActions.Entry e = actions.get(actionId);
        return Templates.correctiveAction(e, rounds(), Form.of(e), manager(), null, null);
    }

    @POST
    @Path("{actionId}")
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response edit(@PathParam("actionId") long actionId, @FormParam("version") String version,
                         @FormParam("cause") String cause, @FormParam("actionTaken") String actionTaken,
                         @FormParam("evidence") String evidence, @FormParam("effectivenessRound") String round,
                         @FormParam("effectivenessNote") String note) {
        Form form = new Form(null, cause, actionTaken, evidence, round, note);
        return FormActions.attempt(() -> {
            CorrectiveActions.Entry e = actions.edit(actionId, integer(version),
                    new CorrectiveActions.Draft(cause, actionTaken, evidence, round == null || round.isBlank() ? null
                            : (long) integer(round), note));
            return Templates.correctiveAction(e, rounds(), Form.of(e), manager(), null, "Saved.");
        }, error -> Templates.correctiveAction(actions.get(actionId), rounds(), form, manager(), error, null));
    }

    @POST
    @Path("{actionId}/attachments")
    @Consumes(MediaType.MULTIPART_FORM_DATA)
    public Response attach(@PathParam("actionId") long actionId, @RestForm("file") FileUpload file) {
        return FormActions.attempt(() -> {
            if (file == null || file.uploadedFile() == null || file.size() == 0) {
                throw new DomainException.BadRequest("Choose a file to attach.");
            }
            if (file.size() > CorrectiveActions.MAX_ATTACHMENT_BYTES) {
                throw new DomainException(413, "Too large", "An attachment may be at most 10 MiB.");
            }
            CorrectiveActions.Attachment a = actions.attach(actionId, file.fileName(), read(file));
            CorrectiveActions.Entry e = actions.get(actionId);
            return Templates.correctiveAction(e, rounds(), Form.of(e), manager(), null, "Attached " + a.fileName() + ".");
        }, error -> {
            CorrectiveActions.Entry e = actions.get(actionId);
            return Templates.correctiveAction(e, rounds(), Form.of(e), manager(), error, null);
        });
    }

    @GET
    @Path("{actionId}/attachments/{attachmentId}")
    @Produces({"application/pdf", "image/png", "image/jpeg", MediaType.TEXT_HTML, MediaType.APPLICATION_JSON})
    public Response attachment(@PathParam("actionId") long actionId, @PathParam("attachmentId") long attachmentId) {
        Map.Entry<CorrectiveActions.Attachment, byte[]> a = actions.attachment(actionId, attachmentId);
        return Response.ok(a.getValue(), a.getKey().contentType())
                .header("Content-Disposition", "attachment; filename=\"" + a.getKey().fileName().replace("\"", "") + "\"")
                .header("X-Content-Type-Options", "nosniff").build();
    }

    @POST
    @Path("{actionId}/close")
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    @RolesAllowed(Role.LAB_MANAGER_NAME)
    public Response close(@PathParam("actionId") long actionId, @FormParam("confirm") String confirm) {
        return FormActions.attempt(() -> {
            CorrectiveActions.Entry e = actions.close(actionId, "yes".equals(confirm));
            return Templates.correctiveAction(e, rounds(), Form.of(e), manager(), null, "Closed. The entry is now frozen.");
        }, error -> {
            CorrectiveActions.Entry e = actions.get(actionId);
            return Templates.correctiveAction(e, rounds(), Form.of(e), manager(), error, null);
        });
    }

    @POST
    @Path("{actionId}/corrections")
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    public Response correct(@PathParam("actionId") long actionId) {
        try {
            CorrectiveActions.Entry created = actions.correct(actionId);
            return Response.seeOther(URI.create("/my-laboratory/corrective-actions/" + created.id())).build();
        } catch (DomainException.NotFound | DomainException.Forbidden e) {
            throw e;
        } catch (DomainException e) {
            CorrectiveActions.Entry entry = actions.get(actionId);
            return Response.status(e.status()).entity(Templates.correctiveAction(entry, rounds(), Form.of(entry),
                    manager(), e.detail(), null)).build();
        }
    }

    private boolean manager() {
        return currentUser.is(Role.LAB_MANAGER);
    }

    /** Results an entry may be opened for: questionable or unsatisfactory, newest first. */
    private List<HistoryService.Entry> candidates() {
        List<HistoryService.Entry> list = new java.util.ArrayList<>(history.own(HistoryService.Filter.none()).entries()
                .stream().filter(e -> e.verdict() == Verdict.QUESTIONABLE || e.verdict() == Verdict.UNSATISFACTORY)
                .toList());
        java.util.Collections.reverse(list);
        return list;
    }

    /** The laboratory's published rounds (for "which later round showed the action worked"). */
    private List<HistoryService.Entry> rounds() {
        java.util.Map<Long, HistoryService.Entry> byRound = new java.util.LinkedHashMap<>();
        for (HistoryService.Entry e : history.own(HistoryService.Filter.none()).entries()) {
            byRound.putIfAbsent(e.roundId(), e);
        }
        return List.copyOf(byRound.values());
    }

    private static int integer(String s) {
        try {
            return Integer.parseInt(s == null ? "" : s.strip());
        } catch (NumberFormatException e) {
            throw new DomainException.BadRequest("The form is incomplete; reload the page and try again.");
        }
    }

    private static byte[] read(FileUpload file) {
        try {
            return Files.readAllBytes(file.uploadedFile());
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
