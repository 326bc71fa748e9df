package org.roundtable.report;

import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.PathParam;
import jakarta.ws.rs.core.Response;
import org.roundtable.account.Role;
import org.roundtable.platform.DomainException;
import org.roundtable.report.chart.ReportChart;
import org.roundtable.report.chart.ReportCharts;
import org.roundtable.report.chart.SvgCharts;
import org.roundtable.report.model.MeasurandSection;

/**
 * The charts of one measurand's section of the report, drawn from an evaluation run (previews included) as
 * separate SVG images, so that the coordinator sees on the measurand's review page exactly the charts the report
 * will carry before issuing it: the same section ({@link ReportAssembler#reviewSection}) and the same chart code
 * ({@link ReportCharts}, {@link SvgCharts}) as the round report. Coordinators only; a run never changes, so a
 * browser may keep an image.
 */
@Path("/")
@RolesAllowed(Role.COORDINATOR_NAME)
public class ReviewCharts {

    static final String SVG = "image/svg+xml";

    private final ReportAssembler assembler;

    public ReviewCharts(ReportAssembler assembler) {
        this.assembler = assembler;
    }

    /**
     * One chart: {@code score-bars} (ordered score bars), {@code density} (kernel density of the results) or
     * {@code uncertainty-bars} (results with their U). A chart the data do not allow (a density of fewer than two
     * distinct values) is an image that says so; an unknown kind is 404.
     */
    @GET
    @Path("rounds/{roundId}/evaluation/{version}/measurands/{measurandId}/charts/{kind}.svg")
    // no @Produces: an <img> (or any client) asking with any Accept gets the image; the type is set on the answer
    public Response chart(@PathParam("roundId") long roundId, @PathParam("version") int version,
                          @PathParam("measurandId") String measurandId, @PathParam("kind") String kind) {
        if (!kind.equals("score-bars") && !kind.equals("density") && !kind.equals("uncertainty-bars")) {
            throw new DomainException.NotFound("The chart");
        }
        MeasurandSection section = assembler.reviewSection(roundId, version, measurandId);
        ReportChart chart = switch (kind) {
            case "score-bars" -> section.results().stream().anyMatch(r -> ReportCharts.primaryScore(section, r) != null)
                    ? ReportCharts.scoreBars(section, null) : null;
            case "density" -> ReportCharts.density(section, null);
            default -> section.results().stream().anyMatch(r -> !r.lessThan() && Double.isFinite(r.value()))
                    ? ReportCharts.uncertaintyBars(section, null) : null;
        };
        String svg = chart == null ? noChart(kind) : SvgCharts.toSvgElement(chart);
        return Response.ok("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n" + svg, SVG + ";charset=UTF-8")
                .header("Cache-Control", "private, max-age=3600").build();
    }

    /** An image in the chart's place saying that the data give no such chart. */
    static String noChart(String kind) {
        String what = switch (kind) {
            case "score-bars" -> "No scores to chart.";
            case "density" -> "No density: fewer than two distinct results.";
            default -> "No results to chart.";
        };
        return "<svg xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 " + ReportCharts.WIDTH + " "
                + ReportCharts.HEIGHT + "\" role=\"img\"><rect width=\"100%\" height=\"100%\" fill=\"#ffffff\"/>"
                + "<text x=\"50%\" y=\"50%\" text-anchor=\"middle\" font-family=\"DejaVu Sans, sans-serif\""
                + " font-size=\"14\" fill=\"#5b6770\">" + what + "</text></svg>";
    }
}
