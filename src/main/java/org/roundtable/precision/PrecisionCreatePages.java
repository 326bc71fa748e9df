package org.roundtable.precision;

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
import jakarta.ws.rs.core.MultivaluedMap;
import jakarta.ws.rs.core.Response;
import java.math.BigDecimal;
import java.net.URI;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import org.roundtable.account.Role;
import org.roundtable.platform.DomainException;
import org.roundtable.scheme.PrecisionPlan;
import org.roundtable.scheme.RoundService;
import org.roundtable.scheme.SchemeService;

/**
 * The coordinator's page for creating a precision experiment (ISO 5725-2) without writing JSON: first the scheme,
 * then a plain form with the round details, the levels (materials), the measurands from the scheme's catalogue (with
 * their unit and reporting decimals), the replicates per laboratory and level, the straggler and outlier levels in
 * per cent and whether the precision–level relationship is fitted. Every refusal shows the form again with what was
 * typed and the problem beside its field; the service ({@link PrecisionExperimentService#create}) does the checking
 * the API does, the page only adds checks that let it name the field.
 */
@Path("/")
@Produces(MediaType.TEXT_HTML)
public class PrecisionCreatePages {

    /** Level rows offered when nothing is typed yet. */
    static final int EMPTY_LEVEL_ROWS = 5;

    @CheckedTemplate(basePath = "precision")
    static class Templates {
        static native TemplateInstance create(List<SchemeService.SchemeView> schemes, SchemeService.SchemeView scheme,
                                              Form form, Map<String, String> problems, String error);
    }

    /** One level row as typed. */
    public record LevelRow(int index, String label, String material, String problem) {
    }

    /** The form as typed (all text), shown again on every refusal. */
    public record Form(String code, String itemDescription, String dispatchDate, String resultDeadline, String timeZone,
                       String instructions, String latePolicy, String codeScope, List<LevelRow> levels,
                       Set<String> measurands, String replicates, String stragglerPercent, String outlierPercent,
                       boolean fitRelationship) {

        static Form empty() {
            List<LevelRow> rows = new ArrayList<>();
            for (int i = 1; i <= EMPTY_LEVEL_ROWS; i++) {
                rows.add(new LevelRow(i, "", "", null));
            }
            return new Form("", "", "", "", null, "", "REFUSE", "ROUND", rows, Set.of(), "2", "5", "1", true);
        }

        /** The late-result policies offered, by name (shown with their labels). */
        public List<String> latePolicies() {
            return List.of("REFUSE", "ACCEPT_FLAGGED_SCORED", "ACCEPT_FLAGGED_UNSCORED");
        }

        /** Most levels a study may have. */
        public int maxLevels() {
            return PrecisionPlan.MAX_LEVELS;
        }

        /** Whether the measurand {@code element} is ticked. */
        public boolean measures(String element) {
            return measurands.contains(element);
        }

        /** The zone chosen, or {@code fallback} before anything was posted. */
        public String zoneOr(String fallback) {
            return timeZone == null || timeZone.isBlank() ? fallback : timeZone;
        }
    }

    private final PrecisionExperimentService studies;
    private final SchemeService schemes;

    public PrecisionCreatePages(PrecisionExperimentService studies, SchemeService schemes) {
        this.studies = studies;
        this.schemes = schemes;
    }

    /** Step 1 (no scheme chosen): the schemes; step 2: the form for the chosen scheme. */
    @GET
    @Path("precision-experiments/new")
    @RolesAllowed(Role.COORDINATOR_NAME)
    public TemplateInstance form(@QueryParam("scheme") Long schemeId) {
        List<SchemeService.SchemeView> all = schemes.list();
        SchemeService.SchemeView scheme = schemeId == null ? null : schemes.get(schemeId);
        return Templates.create(all, scheme, Form.empty(), Map.of(), null);
    }

    @POST
    @Path("precision-experiments")
    @Consumes(MediaType.APPLICATION_FORM_URLENCODED)
    @RolesAllowed(Role.COORDINATOR_NAME)
    public Response create(MultivaluedMap<String, String> fields) {
        List<SchemeService.SchemeView> all = schemes.list();
        Long schemeId = number(fields.getFirst("schemeId"));
        if (schemeId == null) {
            return Response.status(400).entity(Templates.create(all, null, Form.empty(),
                    Map.of("schemeId", "Choose the scheme."), "The study is not created: choose its scheme first.")).build();
        }
        SchemeService.SchemeView scheme = schemes.get(schemeId);
        Map<String, String> problems = new LinkedHashMap<>();
        List<LevelRow> rows = new ArrayList<>();
        List<PrecisionPlan.Level> levels = new ArrayList<>();
        Set<String> labels = new HashSet<>();
        for (int i = 1; i <= PrecisionPlan.MAX_LEVELS; i++) {
            String label = text(fields.getFirst("level-" + i + "-label"));
            String material = text(fields.getFirst("level-" + i + "-material"));
            if (fields.getFirst("level-" + i + "-label") == null && fields.getFirst("level-" + i + "-material") == null) {
                continue;
            }
            String problem = null;
            if (label.isEmpty() && material.isEmpty()) {
                rows.add(new LevelRow(rows.size() + 1, "", "", null));
                continue;
            } else if (!label.matches("[A-Za-z0-9-]{1,8}")) {
                problem = "The label has 1 to 8 letters, digits or -.";
            } else if (!labels.add(label)) {
                problem = "Another level has the label " + label + ".";
            } else if (material.isEmpty() || material.length() > 200) {
                problem = "Describe the material (1 to 200 characters).";
            }
            rows.add(new LevelRow(rows.size() + 1, label, material, problem));
            if (problem != null) {
                problems.put("level-" + rows.size(), problem);
            } else {
                levels.add(new PrecisionPlan.Level(label, material));
            }
        }
        int blanks = 0;
        for (LevelRow r : rows) {
            blanks += r.label().isEmpty() && r.material().isEmpty() ? 1 : 0;
        }
        while (blanks < 2 && rows.size() < PrecisionPlan.MAX_LEVELS) {
            rows.add(new LevelRow(rows.size() + 1, "", "", null));
            blanks++;
        }
        if (levels.isEmpty() && problems.isEmpty()) {
            problems.put("levels", "Give at least one level: its label and material.");
        }
        Set<String> known = new HashSet<>();
        scheme.measurands().forEach(m -> known.add(m.element()));
        List<String> measurands = new ArrayList<>();
        for (String m : fields.getOrDefault("measurand", List.of())) {
            if (known.contains(m) && !measurands.contains(m)) {
                measurands.add(m);
            }
        }
        if (measurands.isEmpty()) {
            problems.put("measurands", "Tick at least one measurand of the scheme's catalogue.");
        }
        String replicatesText = text(fields.getFirst("replicates"));
        Integer replicates = null;
        try {
            replicates = Integer.valueOf(replicatesText);
            if (replicates < 2 || replicates > 10) {
                problems.put("replicates", "Each laboratory reports 2 to 10 replicates per level (usually 2).");
            }
        } catch (NumberFormatException e) {
            problems.put("replicates", "Write a whole number from 2 to 10 (usually 2).");
        }
        String stragglerText = text(fields.getFirst("stragglerPercent"));
        String outlierText = text(fields.getFirst("outlierPercent"));
        BigDecimal straggler = percent(stragglerText, "stragglerPercent", "5", problems);
        BigDecimal outlier = percent(outlierText, "outlierPercent", "1", problems);
        if (straggler != null && outlier != null && outlier.compareTo(straggler) >= 0) {
            problems.put("outlierPercent", "The outlier level must be smaller than the straggler level (usually 1 % and 5 %).");
        }
        boolean fit = "on".equals(fields.getFirst("fitRelationship")) || "true".equals(fields.getFirst("fitRelationship"));
        Form form = new Form(text(fields.getFirst("code")), text(fields.getFirst("itemDescription")),
                text(fields.getFirst("dispatchDate")), text(fields.getFirst("resultDeadline")),
                text(fields.getFirst("timeZone")), fields.getFirst("instructions") == null ? "" : fields.getFirst("instructions"),
                text(fields.getFirst("latePolicy")), text(fields.getFirst("codeScope")), rows, Set.copyOf(measurands),
                replicatesText, stragglerText, outlierText, fit);
        if (!problems.isEmpty()) {
            return Response.status(400).entity(Templates.create(all, scheme, form, problems,
                    "The study is not created: " + String.join(" ", new java.util.LinkedHashSet<>(problems.values())))).build();
        }
        PrecisionPlan plan = new PrecisionPlan(levels, measurands, replicates,
                fraction(straggler), fraction(outlier), fit);
        RoundService.RoundDetails details = new RoundService.RoundDetails(schemeId, form.code(), form.itemDescription(),
                null, null, form.dispatchDate(), form.resultDeadline(), form.timeZone(), form.instructions(),
                form.latePolicy(), form.codeScope());
        try {
            RoundService.RoundView created = studies.create(new PrecisionExperimentService.CreateRequest(details, plan));
            return Response.seeOther(URI.create("/precision-experiments/" + created.id())).build();
        } catch (DomainException.NotFound | DomainException.Forbidden e) {
            throw e;
        } catch (DomainException e) {
            Map<String, String> one = new LinkedHashMap<>();
            String field = fieldOf(e.detail());
            if (field != null) {
                one.put(field, e.detail());
            }
            return Response.status(e.status()).entity(Templates.create(all, scheme, form, one,
                    "The study is not created: " + e.detail())).build();
        }
    }

    /** The field of the form a refusal of the service concerns (by its words), or null for none. */
    static String fieldOf(String message) {
        String m = message == null ? "" : message.toLowerCase(Locale.ROOT);
        if (m.contains("round code") || m.contains("with the code")) {
            return "code";
        } else if (m.contains("item description")) {
            return "itemDescription";
        } else if (m.contains("time zone")) {
            return "timeZone";
        } else if (m.contains("dispatch date")) {
            return "dispatchDate";
        } else if (m.contains("deadline")) {
            return "resultDeadline";
        } else if (m.contains("instructions")) {
            return "instructions";
        } else if (m.contains("late-result")) {
            return "latePolicy";
        } else if (m.contains("participant-code")) {
            return "codeScope";
        } else if (m.contains("measurand")) {
            return "measurands";
        } else if (m.contains("level") && m.contains("label")) {
            return "levels";
        } else if (m.contains("replicate")) {
            return "replicates";
        } else if (m.contains("outlier level")) {
            return "outlierPercent";
        } else if (m.contains("straggler level")) {
            return "stragglerPercent";
        }
        return null;
    }

    /** A percentage above 0 and at most 20, as typed ("5", "2.5", "1 %"); a problem under {@code field} otherwise. */
    private static BigDecimal percent(String text, String field, String usual, Map<String, String> problems) {
        String t = text.replace("%", "").replace(',', '.').strip();
        try {
            BigDecimal v = new BigDecimal(t);
            if (v.signum() > 0 && v.compareTo(BigDecimal.valueOf(20)) <= 0 && v.scale() <= 4) {
                return v;
            }
        } catch (NumberFormatException e) {
            // the problem below
        }
        problems.put(field, "Write a percentage above 0 and at most 20, such as " + usual + ".");
        return null;
    }

    private static String fraction(BigDecimal percent) {
        return percent.movePointLeft(2).stripTrailingZeros().toPlainString();
    }

    private static Long number(String text) {
        try {
            return text == null || text.isBlank() ? null : Long.valueOf(text.strip());
        } catch (NumberFormatException e) {
            return null;
        }
    }

    private static String text(String value) {
        return value == null ? "" : value.strip();
    }
}
