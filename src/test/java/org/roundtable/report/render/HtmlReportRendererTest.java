package org.roundtable.report.render;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.ByteArrayInputStream;
import java.nio.charset.StandardCharsets;
import javax.xml.parsers.DocumentBuilderFactory;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.roundtable.report.SampleRoundBuilder;
import org.roundtable.report.model.LaboratoryReport;
import org.roundtable.report.model.RoundReport;
import org.roundtable.report.model.RoundInfo;
import org.w3c.dom.Document;

/** The HTML page: well-formed, self-contained, every section, charts inline, text escaped. */
class HtmlReportRendererTest {

    private static RoundReport round;
    private static String html;
    private static String labHtml;

    @BeforeAll
    static void render() {
        round = SampleRoundBuilder.lowAlloySteel().build();
        html = new HtmlReportRenderer().render(round);
        labHtml = new HtmlReportRenderer().render(new LaboratoryReport(round, "P05"));
        ReportSamplesOutput.save("round-report.html", html);
        ReportSamplesOutput.save("laboratory-report-P05.html", labHtml);
    }

    @Test
    void thePageIsWellFormedXhtml() throws Exception {
        Document document = parse(html);
        assertThat(document.getDocumentElement().getLocalName()).isEqualTo("html");
        parse(labHtml);
    }

    @Test
    void everyMeasurandHasThreeInlineChartsAndThePairHasAYoudenPlot() throws Exception {
        Document document = parse(html);
        int svgs = document.getElementsByTagNameNS("http://www.w3.org/2000/svg", "svg").getLength();
        assertThat(svgs).isEqualTo(round.measurands().size() * 3 + 1);
        assertThat(html).contains("id='chart-youden-Mn-A-Mn-B'");
    }

    @Test
    void thePageNeedsNoOtherFiles() {
        assertThat(html).doesNotContain("<link").doesNotContain("src=\"").doesNotContain("http://www.w3.org/1999/xlink\" href");
    }

    @Test
    void thePageHasTheSectionsAndTheClassificationRules() {
        assertThat(html).contains("Status and confidentiality").contains("The test item")
                .contains("How the results were evaluated").contains("Measurands at a glance")
                .contains("Results by measurand").contains("Paired items").contains("Reading the scores")
                .contains("Coordinator\u2019s comments").contains("Sign-off").contains("End of report LAS-2026-2-R1")
                .contains("|score| \u2264 2").contains("Scores support, and do not replace");
    }

    @Test
    void textFromTheModelIsEscaped() throws Exception {
        RoundReport hostile = SampleRoundBuilder.lowAlloySteel().build();
        hostile = new RoundReport(hostile.identity(), hostile.scheme(),
                new RoundInfo("R<1>", "<script>alert('x')</script> & more", null, null, 12, 12),
                hostile.item(), hostile.measurands(), hostile.pairs(), hostile.evaluation(),
                "=cmd|' /C calc'!A0 <b>bold</b>", hostile.signatures(), hostile.confidentialityStatement(),
                hostile.advice());
        String page = new HtmlReportRenderer().render(hostile);
        parse(page);
        assertThat(page).doesNotContain("<script>").doesNotContain("<b>bold</b>")
                .contains("&lt;script&gt;alert(&#39;x&#39;)&lt;/script&gt; &amp; more");
        // the PDF survives it too
        assertThat(PdfReportRendererTest.text(new PdfReportRenderer().render(hostile)))
                .contains("<script>alert('x')</script> & more");
    }

    @Test
    void theLaboratoryPageMarksItsOwnRowsAndHighlightsItsBars() {
        assertThat(labHtml).contains("<tr class=\"own\"><th>Your result</th>")
                .contains("Your results at a glance").contains(">P05 \u22122.30<")
                .doesNotContain("Results and scores").doesNotContain("<tr class=\"own\"><td>");
        assertThat(html).doesNotContain("Your result").doesNotContain("<tr class=\"own\">");
    }

    @Test
    void renderingTwiceGivesTheSameText() {
        assertThat(new HtmlReportRenderer().render(round)).isEqualTo(html);
        assertThat(new HtmlReportRenderer().render(new LaboratoryReport(round, "P05"))).isEqualTo(labHtml);
    }

    private static Document parse(String xhtml) throws Exception {
        DocumentBuilderFactory factory = DocumentBuilderFactory.newInstance();
        factory.setNamespaceAware(true);
        return factory.newDocumentBuilder().parse(new ByteArrayInputStream(xhtml.getBytes(StandardCharsets.UTF_8)));
    }

    @Test
    void scoresPrintAtThePlansDecimalsAndInformationOnlyScoresCarryNoVerdict() {
        RoundReport sample = SampleRoundBuilder.lowAlloySteel().build();
        org.roundtable.report.model.MeasurandSection first = sample.measurands().get(0);
        java.util.List<org.roundtable.report.model.ParticipantResult> unjudged = first.results().stream()
                .map(r -> new org.roundtable.report.model.ParticipantResult(r.participantCode(), r.itemLabel(),
                        r.reportedValue(), r.value(), r.unit(), r.expandedUncertainty(), r.coverageFactor(),
                        r.methodGroup(), r.z() == null ? null : 1.23456, r.zPrime(), r.zeta(), r.en(), null,
                        r.lessThan(), r.lessThanCheck(), r.excluded(), r.exclusionReason(), r.late()))
                .toList();
        org.roundtable.report.model.MeasurandSection informationOnly = new org.roundtable.report.model.MeasurandSection(
                first.id(), first.name(), first.itemLabel(), first.unit(), first.reportingDigits(), first.n(),
                first.assignedValue(), first.assignedValueMethod(), first.assignedValueUncertainty(), first.sigmaPt(),
                first.sigmaPtMethod(), first.robust(), first.methodGroups(), first.warnings(), first.scoreKind(),
                first.scoreChoiceReason(), unjudged, 3);
        java.util.List<org.roundtable.report.model.MeasurandSection> sections = new java.util.ArrayList<>(sample.measurands());
        sections.set(0, informationOnly);
        RoundReport report = new RoundReport(sample.identity(), sample.scheme(), sample.round(), sample.item(), sections,
                sample.pairs(), sample.evaluation(), sample.coordinatorComments(), sample.signatures(),
                sample.confidentialityStatement(), sample.advice());
        String page = new HtmlReportRenderer().render(report);
        // three score decimals, half away from zero: 1.23456 prints 1.235 (hand arithmetic)
        assertThat(page).contains(">1.235<").contains("for information only");
    }
}
