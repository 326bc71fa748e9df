package org.roundtable.history;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.QueryParam;
import jakarta.ws.rs.core.MediaType;
import org.roundtable.account.Role;
import org.roundtable.platform.NumberFormats;

import java.net.URLEncoder;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.function.Function;

/**
 * The history page of a laboratory: filters, early warnings, per measurand the charts over rounds with combined
 * scores, and every published result (paged). The laboratory's own at {@code /my-laboratory/history}; coordinators
 * and granted auditors at {@code /laboratories/{id}/history}.
 */
@Path("/")
@Produces(MediaType.TEXT_HTML)
public class HistoryPages {

    static final int ROWS_PER_PAGE = 50;

    @CheckedTemplate(basePath = "history")
    static class Templates {
        static native TemplateInstance history(PageView view);
    }

    /** A chart with its caption; {@code svg} is inserted as markup. */
    public record ChartView(String caption, String svg) {
    }

    /** A combined score, formatted. */
    public record CombinedView(String window, int count, String kind, String rsz, String rszVerdict, String ssz,
                               String sszVerdict, String chi95, String chi99, String caveat) {
    }

    /** One measurand's section. */
    public record SeriesView(String id, String title, String unit, int results, List<ChartView> charts,
                             ChartView valueChart, CombinedView combined, List<EarlyWarnings.Warning> warnings) {
    }

    /** One row of the results table, formatted. */
    public record RowView(String reportedOn, String round, String scheme, String measurand, String item,
                          String reported, String method, String assigned, String sigmaPt, String scoreKind,
                          String score, String zeta, String en, String verdict, String verdictClass, String report,
                          String reportLink, String note, String resultKey, boolean needsAction) {
    }

    /** A choice of a filter select. */
    public record Choice(String value, String label, boolean selected) {
    }

    /** Everything the page shows. */
    public record PageView(String laboratory, String organisation, boolean own, String action, String windowNote,
                           List<Choice> schemes, List<Choice> measurands, List<Choice> methods, String from,
                           String until, String rounds, String years, List<EarlyWarnings.Warning> warnings,
                           List<SeriesView> series, List<RowView> rows, int total, int page, int pages,
                           String previous, String next, List<CorrectiveActions.Entry> actions) {
    }

    private final HistoryService history;
    private final CorrectiveActions actions;

    public HistoryPages(HistoryService history, CorrectiveActions actions) {
        this.history = history;
        this.actions = actions;
    }

    @GET
    @org.roundtable.account.ApiTokenScope.Required(org.roundtable.account.ApiTokenScope.READ_SCORES)
    @Path("my-laboratory/history")
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public TemplateInstance own(@QueryParam("scheme") String scheme, @QueryParam("measurand") String measurand,
                                @QueryParam("method") String method, @QueryParam("from") String from,
                                @QueryParam("until") String until, @QueryParam("rounds") String rounds,
                                @QueryParam("years") String years, @QueryParam("page") String page) {
        HistoryService.History h = history.own(HistoryFilters.of(scheme, measurand, method, from, until, rounds, years));
        return Templates.history(view(h, true, "/my-laboratory/history", page,
                e -> "/api/v1/my-rounds/" + e.roundId() + "/documents/" + e.documentId(), actions.own()));
    }

    @GET
    @Path("laboratories/{laboratoryId}/history")
    @RolesAllowed({Role.COORDINATOR_NAME, Role.AUDITOR_NAME})
    public TemplateInstance ofLaboratory(@PathParam("laboratoryId") long laboratoryId,
                                         @QueryParam("scheme") String scheme, @QueryParam("measurand") String measurand,
                                         @QueryParam("method") String method, @QueryParam("from") String from,
                                         @QueryParam("until") String until, @QueryParam("rounds") String rounds,
                                         @QueryParam("years") String years, @QueryParam("page") String page) {
        HistoryService.History h = history.history(laboratoryId,
                HistoryFilters.of(scheme, measurand, method, from, until, rounds, years));
        return Templates.history(view(h, false, "/laboratories/" + laboratoryId + "/history", page,
                e -> "/api/v1/rounds/" + e.roundId() + "/documents/" + e.documentId(), actions.forReader(laboratoryId, h.visibleRounds())));
    }

    static PageView view(HistoryService.History h, boolean own, String action, String pageParam,
                         Function<HistoryService.Entry, String> link, List<CorrectiveActions.Entry> actions) {
        HistoryService.Filter f = h.filter();
        List<Choice> schemes = new ArrayList<>();
        schemes.add(new Choice("", "All schemes", f.schemeId() == null));
        for (Map.Entry<Long, String> s : h.options().schemes().entrySet()) {
            schemes.add(new Choice(s.getKey().toString(), s.getValue(), s.getKey().equals(f.schemeId())));
        }
        List<Choice> measurands = choices("All measurands", h.options().elements(), f.element());
        List<Choice> methods = new ArrayList<>();
        methods.add(new Choice("", "All methods", f.methodGroup() == null));
        for (String m : h.options().methodGroups()) {
            methods.add(new Choice(m, methodLabel(m), m.equalsIgnoreCase(String.valueOf(f.methodGroup()))));
        }
        List<SeriesView> series = new ArrayList<>();
        int n = 0;
        for (HistoryService.Series s : h.series()) {
            List<ChartView> charts = new ArrayList<>();
            for (HistoryCharts.Kind k : HistoryCharts.kinds(s)) {
                charts.add(new ChartView(s.element() + ": " + k.label() + " over rounds"
                        + (k == HistoryCharts.Kind.EN ? " (lines at ±1)" : " (lines at ±2 and ±3)"),
                        HistoryCharts.scoreChart(s, k, link)));
            }
            ChartView values = new ChartView(s.element() + ": reported value against x_pt ± 2σpt (" + s.unit() + ")",
                    HistoryCharts.valueChart(s, link));
            series.add(new SeriesView("measurand-" + (++n), s.element() + " — " + s.schemeName(), s.unit(),
                    s.entries().size(), charts, values, combined(s.combined()), s.warnings()));
        }
        int total = h.entries().size();
        int pages = Math.max(1, (total + ROWS_PER_PAGE - 1) / ROWS_PER_PAGE);
        int page = 1;
        try {
            page = pageParam == null || pageParam.isBlank() ? 1 : Math.max(1, Math.min(pages, Integer.parseInt(pageParam.strip())));
        } catch (NumberFormatException e) {
            page = 1;
        }
        List<RowView> rows = new ArrayList<>();
        // newest first in the table
        List<HistoryService.Entry> entries = new ArrayList<>(h.entries());
        java.util.Collections.reverse(entries);
        for (HistoryService.Entry e : entries.subList((page - 1) * ROWS_PER_PAGE, Math.min(total, page * ROWS_PER_PAGE))) {
            rows.add(row(e, link.apply(e)));
        }
        String query = query(f);
        return new PageView(h.laboratoryName(), h.organisation(), own, action, h.windowNote(), schemes, measurands,
                methods, f.from() == null ? "" : f.from().toString(), f.until() == null ? "" : f.until().toString(),
                f.windowRounds() == null ? "" : f.windowRounds().toString(),
                f.windowYears() == null ? "" : f.windowYears().toString(), h.warnings(), series, rows, total, page,
                pages, page > 1 ? action + "?" + query + "page=" + (page - 1) : null,
                page < pages ? action + "?" + query + "page=" + (page + 1) : null, actions);
    }

    private static List<Choice> choices(String all, List<String> values, String selected) {
        List<Choice> out = new ArrayList<>();
        out.add(new Choice("", all, selected == null));
        for (String v : values) {
            out.add(new Choice(v, v, v.equalsIgnoreCase(String.valueOf(selected))));
        }
        return out;
    }

    private static CombinedView combined(HistoryService.Combined c) {
        if (c == null) {
            return null;
        }
        return new CombinedView(c.firstRound().equals(c.lastRound()) ? "round " + c.firstRound()
                : "rounds " + c.firstRound() + " to " + c.lastRound(), c.count(), c.kind(),
                NumberFormats.signedScore(c.rescaledSum(), 2), c.rescaledSumVerdict().word(),
                NumberFormats.score(c.sumOfSquares(), 2), c.sumOfSquaresVerdict().word(),
                NumberFormats.score(c.chiSquared95(), 2), NumberFormats.score(c.chiSquared99(), 2), c.caveat());
    }

    private static RowView row(HistoryService.Entry e, String link) {
        org.roundtable.statistics.score.ScoreKind kind = e.zLikeKind();
        return new RowView(e.reportedOn().toString(), e.roundCode(), e.schemeName(), e.element(), e.itemLabel(),
                e.reported() + " " + e.unit(), methodLabel(e.methodGroup()), NumberFormats.plain(e.assignedValue(), 4),
                NumberFormats.plain(e.sigmaPt(), 4),
                kind == null ? "" : kind == org.roundtable.statistics.score.ScoreKind.Z ? "z" : "z′",
                e.zLike() == null ? NumberFormats.NONE : NumberFormats.signedScore(e.zLike(), 2),
                e.zeta() == null ? NumberFormats.NONE : NumberFormats.signedScore(e.zeta(), 2),
                e.en() == null ? NumberFormats.NONE : NumberFormats.signedScore(e.en(), 2),
                e.verdict() == null ? "not scored" : e.verdict().word(),
                e.verdict() == null ? "" : "verdict-" + e.verdict().word(), e.reportId() + " ("
                + e.reportStatus().toLowerCase(java.util.Locale.ROOT) + ")", link,
                e.excludedReason() != null ? e.excludedReason() : e.informationOnly() ? "for information only" : "",
                URLEncoder.encode(e.resultKey(), StandardCharsets.UTF_8),
                e.verdict() == Verdict.QUESTIONABLE || e.verdict() == Verdict.UNSATISFACTORY);
    }

    /** A method group in words: {@code SPARK_OES} → "Spark OES". */
    static String methodLabel(String group) {
        if (group == null) {
            return "";
        }
        String g = group.toUpperCase(java.util.Locale.ROOT).replace('-', '_');
        return switch (g) {
            case "SPARK_OES" -> "Spark OES";
            case "XRF" -> "XRF";
            case "ICP_OES" -> "ICP-OES";
            case "COMBUSTION" -> "Combustion";
            case "FUSION", "INERT_GAS_FUSION" -> "Inert gas fusion";
            case "OTHER" -> "Other";
            case "WET_CHEMISTRY" -> "Wet chemistry";
            default -> group;
        };
    }

    private static String query(HistoryService.Filter f) {
        StringBuilder q = new StringBuilder();
        add(q, "scheme", f.schemeId() == null ? null : f.schemeId().toString());
        add(q, "measurand", f.element());
        add(q, "method", f.methodGroup());
        add(q, "from", f.from() == null ? null : f.from().toString());
        add(q, "until", f.until() == null ? null : f.until().toString());
        add(q, "rounds", f.windowRounds() == null ? null : f.windowRounds().toString());
        add(q, "years", f.windowYears() == null ? null : f.windowYears().toString());
        return q.toString();
    }

    private static void add(StringBuilder q, String name, String value) {
        if (value != null) {
            q.append(name).append('=').append(URLEncoder.encode(value, StandardCharsets.UTF_8)).append('&');
        }
    }
}
