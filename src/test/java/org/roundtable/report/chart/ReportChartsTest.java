package org.roundtable.report.chart;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.ByteArrayInputStream;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import javax.xml.parsers.DocumentBuilderFactory;
import org.junit.jupiter.api.Test;
import org.roundtable.report.SampleRoundBuilder;
import org.roundtable.report.model.MeasurandSection;
import org.roundtable.report.model.RoundReport;
import org.roundtable.report.style.ReportColours;
import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.w3c.dom.NodeList;

/** The SVG charts: well-formed, one bar per scored result, the own bar alone highlighted, reproducible. */
class ReportChartsTest {

    private final RoundReport round = SampleRoundBuilder.lowAlloySteel().build();

    @Test
    void scoreBarsAreWellFormedSvgWithOneBarPerScoredResult() throws Exception {
        MeasurandSection manganese = round.measurand("Mn-A").orElseThrow();
        ReportChart chart = ReportCharts.scoreBars(manganese, null);
        Document svg = parse(SvgCharts.toSvgElement(chart));
        assertThat(svg.getDocumentElement().getLocalName()).isEqualTo("svg");
        assertThat(chart.markCount()).isEqualTo(12);
        assertThat(filledRectangles(svg, Set.of(ReportColours.GOOD, ReportColours.WARN, ReportColours.BAD))).hasSize(12);
        // one questionable bar: P05, z = -2.30
        assertThat(filledRectangles(svg, Set.of(ReportColours.WARN))).hasSize(1);
    }

    @Test
    void excludedAndCensoredResultsGetNoBar() throws Exception {
        MeasurandSection nickel = round.measurand("Ni").orElseThrow();
        Document svg = parse(SvgCharts.toSvgElement(ReportCharts.scoreBars(nickel, null)));
        assertThat(filledRectangles(svg, Set.of(ReportColours.GOOD, ReportColours.WARN, ReportColours.BAD))).hasSize(11);
        MeasurandSection nitrogen = round.measurand("N").orElseThrow();
        assertThat(ReportCharts.scoreBars(nitrogen, null).markCount()).isEqualTo(11);
    }

    @Test
    void scoreBarsDrawTheTwoAndThreeLinesOnBothSides() throws Exception {
        String svg = SvgCharts.toSvgElement(ReportCharts.scoreBars(round.measurand("Cr").orElseThrow(), null));
        assertThat(svg).contains(">+2<").contains(">\u22122<").contains(">+3<").contains(">\u22123<");
        assertThat(svg).contains("stroke:rgb(184,134,11)").contains("stroke:rgb(164,48,42)");
    }

    @Test
    void inALaboratoryReportOnlyTheOwnBarKeepsItsFullColourAndIsLabelled() throws Exception {
        String svg = SvgCharts.toSvgElement(ReportCharts.scoreBars(round.measurand("Mn-A").orElseThrow(), "P05"));
        Document document = parse(svg);
        // P05 is questionable and keeps the full warn colour; the eleven others are drawn pale
        assertThat(filledRectangles(document, Set.of(ReportColours.WARN))).hasSize(1);
        assertThat(filledRectangles(document, Set.of(ReportColours.GOOD))).isEmpty();
        assertThat(filledRectangles(document, Set.of(ReportColours.pale(ReportColours.GOOD)))).hasSize(11);
        assertThat(svg).contains(">P05 \u22122.30<");
        java.awt.Color band = ReportColours.mix(ReportColours.COPPER, java.awt.Color.WHITE, 0.6);
        assertThat(svg).contains("stroke:rgb(" + band.getRed() + "," + band.getGreen() + "," + band.getBlue() + ")");
    }

    @Test
    void densityChartMarksTheAssignedValueAndTwoSigmaLines() throws Exception {
        ReportChart chart = ReportCharts.density(round.measurand("Mn-A").orElseThrow(), null);
        String svg = SvgCharts.toSvgElement(chart);
        parse(svg);
        assertThat(svg).contains(">x\u209a\u209c<").contains(">+2\u03c3\u209a\u209c<").contains(">\u22122\u03c3\u209a\u209c<");
        assertThat(chart.markCount()).isEqualTo(12);
    }

    @Test
    void densityIsLeftOutWhenAllValuesAreEqual() {
        MeasurandSection m = round.measurand("Mn-A").orElseThrow();
        var same = m.results().stream()
                .map(r -> new org.roundtable.report.model.ParticipantResult(r.participantCode(), r.itemLabel(), "0.748",
                        0.748, r.unit(), r.expandedUncertainty(), r.coverageFactor(), r.methodGroup(), 0.0, 0.0, 0.0,
                        0.0, r.classification(), false, "", false, "", false))
                .toList();
        MeasurandSection flat = new MeasurandSection(m.id(), m.name(), m.itemLabel(), m.unit(), m.reportingDigits(),
                m.n(), m.assignedValue(), m.assignedValueMethod(), m.assignedValueUncertainty(), m.sigmaPt(),
                m.sigmaPtMethod(), m.robust(), m.methodGroups(), m.warnings(), m.scoreKind(), m.scoreChoiceReason(),
                same);
        assertThat(ReportCharts.density(flat, null)).isNull();
    }

    @Test
    void uncertaintyChartHasOneErrorBarPerResultWithU() throws Exception {
        ReportChart chart = ReportCharts.uncertaintyBars(round.measurand("Cr").orElseThrow(), null);
        parse(SvgCharts.toSvgElement(chart));
        assertThat(chart.markCount()).isEqualTo(12);
        assertThat(chart.caption()).contains("11 of 12 reported U");
    }

    @Test
    void youdenPlotPairsTheParticipantsWithResultsOnBothItems() throws Exception {
        ReportChart chart = ReportCharts.youden(round, "Mn-A", "Mn-B", "P05");
        String svg = SvgCharts.toSvgElement(chart);
        parse(svg);
        assertThat(chart.markCount()).isEqualTo(12);
        assertThat(svg).contains("fill:rgb(181,101,29)");
    }

    @Test
    void theSameChartGivesTheSameSvg() {
        ReportChart chart = ReportCharts.scoreBars(round.measurand("C").orElseThrow(), null);
        assertThat(SvgCharts.toSvgElement(chart)).isEqualTo(SvgCharts.toSvgElement(chart));
    }

    @Test
    void aThousandParticipantsGiveAThousandBarsAsOnePathPerColourWithoutCodesOnTheAxis() throws Exception {
        RoundReport large = SampleRoundBuilder.synthetic(1000, 1).build();
        MeasurandSection m = large.measurands().get(0);
        String svg = SvgCharts.toSvgElement(ReportCharts.scoreBars(m, null));
        Document document = parse(svg);
        long scored = m.results().stream().filter(r -> r.z() != null).count();
        assertThat(scored).isGreaterThan(900);
        List<Element> paths = filledPaths(document, Set.of(ReportColours.GOOD, ReportColours.WARN, ReportColours.BAD));
        // every bar is drawn, as the top of an outline in the path of its classification's colour
        assertThat(paths).hasSizeBetween(1, 3);
        assertThat(paths.stream().mapToInt(ReportChartsTest::barsInOutlines).sum()).isEqualTo((int) scored);
        assertThat(filledRectangles(document, Set.of(ReportColours.GOOD, ReportColours.WARN, ReportColours.BAD))).isEmpty();
        assertThat(svg).doesNotContain(">P0001<");
    }

    @Test
    void inALargeRoundOnlyTheOwnBarAndPointKeepTheirFullColourAndTheOwnBarIsLabelled() throws Exception {
        RoundReport large = SampleRoundBuilder.synthetic(1000, 1).build();
        MeasurandSection m = large.measurands().get(0);
        MeasurandChartData data = MeasurandChartData.of(m);
        String own = "P0421";
        Document bars = parse(SvgCharts.toSvgElement(ReportCharts.scoreBars(data, own)));
        Set<java.awt.Color> full = Set.of(ReportColours.GOOD, ReportColours.WARN, ReportColours.BAD);
        List<Element> fullColour = filledPaths(bars, full);
        fullColour.addAll(filledRectangles(bars, full));
        assertThat(fullColour).hasSize(1);
        Double z = m.results().stream().filter(r -> r.participantCode().equals(own)).findFirst().orElseThrow().z();
        assertThat(SvgCharts.toSvgElement(ReportCharts.scoreBars(data, own)))
                .contains(">" + own + " " + org.roundtable.report.style.ReportFormat.signedScore(z) + "<");
        long pale = filledPaths(bars, Set.of(ReportColours.pale(ReportColours.GOOD), ReportColours.pale(ReportColours.WARN),
                ReportColours.pale(ReportColours.BAD))).stream().mapToInt(ReportChartsTest::barsInOutlines).sum();
        assertThat(pale).isEqualTo(m.results().stream().filter(r -> r.z() != null && !r.participantCode().equals(own)).count());

        ReportChart points = ReportCharts.uncertaintyBars(data, own);
        Document u = parse(SvgCharts.toSvgElement(points));
        // all other points in one slate path, the own point alone in copper
        assertThat(filledPaths(u, Set.of(ReportColours.SLATE)).stream().mapToInt(ReportChartsTest::subpaths).sum())
                .isEqualTo(points.markCount() - 1);
        assertThat(filledPaths(u, Set.of(ReportColours.COPPER)).stream().mapToInt(ReportChartsTest::subpaths).sum())
                .isEqualTo(1);
    }

    @Test
    void chartDataIsComputedOncePerSectionAndGivesTheSameChartsAsComputedAfresh() {
        ChartDataCache cache = new ChartDataCache();
        MeasurandSection m = round.measurand("Mn-A").orElseThrow();
        assertThat(cache.get(m)).isSameAs(cache.get(m));
        assertThat(SvgCharts.toSvgElement(ReportCharts.scoreBars(cache.get(m), "P05")))
                .isEqualTo(SvgCharts.toSvgElement(ReportCharts.scoreBars(m, "P05")));
        assertThat(SvgCharts.toSvgElement(ReportCharts.density(cache.get(m), "P05")))
                .isEqualTo(SvgCharts.toSvgElement(ReportCharts.density(m, "P05")));
    }

    static Document parse(String svg) throws Exception {
        DocumentBuilderFactory factory = DocumentBuilderFactory.newInstance();
        factory.setNamespaceAware(true);
        return factory.newDocumentBuilder().parse(new ByteArrayInputStream(svg.getBytes(StandardCharsets.UTF_8)));
    }

    static List<Element> filledRectangles(Document svg, Set<java.awt.Color> colours) {
        List<String> fills = colours.stream()
                .map(c -> "fill:rgb(" + c.getRed() + "," + c.getGreen() + "," + c.getBlue() + ")").toList();
        List<Element> found = new ArrayList<>();
        NodeList rects = svg.getElementsByTagNameNS("*", "rect");
        for (int i = 0; i < rects.getLength(); i++) {
            Element rect = (Element) rects.item(i);
            String style = rect.getAttribute("style");
            if (fills.stream().anyMatch(style::startsWith)) {
                found.add(rect);
            }
        }
        return found;
    }

    static List<Element> filledPaths(Document svg, Set<java.awt.Color> colours) {
        List<String> fills = colours.stream()
                .map(c -> "fill:rgb(" + c.getRed() + "," + c.getGreen() + "," + c.getBlue() + ")").toList();
        List<Element> found = new ArrayList<>();
        NodeList paths = svg.getElementsByTagNameNS("*", "path");
        for (int i = 0; i < paths.getLength(); i++) {
            Element path = (Element) paths.item(i);
            // JFreeSVG puts the fill of a path either on the path or on the group around it
            String style = path.getAttribute("style").isEmpty() && path.getParentNode() instanceof Element parent
                    ? parent.getAttribute("style") : path.getAttribute("style");
            if (fills.stream().anyMatch(style::startsWith)) {
                found.add(path);
            }
        }
        return found;
    }

    /**
     * Bars in an SVG path of bar outlines: each outline is a move-to at zero, two line-tos per bar
     * (along its top) and one line-to back down to zero.
     */
    static int barsInOutlines(Element path) {
        String d = path.getAttribute("d");
        long lines = d.chars().filter(c -> c == 'L').count();
        return (int) (lines - subpaths(path)) / 2;
    }

    /** Number of subpaths (move-to commands) of an SVG path. */
    static int subpaths(Element path) {
        return (int) path.getAttribute("d").chars().filter(c -> c == 'M').count();
    }
}
