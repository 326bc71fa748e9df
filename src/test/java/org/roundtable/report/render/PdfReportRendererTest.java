package org.roundtable.report.render;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.pdmodel.font.PDFont;
import org.apache.pdfbox.pdmodel.PDPage;
import org.apache.pdfbox.cos.COSName;
import org.apache.pdfbox.text.PDFTextStripper;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.roundtable.report.SampleRoundBuilder;
import org.roundtable.report.model.LaboratoryReport;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.report.model.RoundReport;

/**
 * The PDF parsed back with PDFBox: sections, identity, numbers, glyphs, page numbering, end line,
 * confidentiality of the per-laboratory report, reproducible bytes. Data: invented low-alloy steel
 * round ({@link SampleRoundBuilder#lowAlloySteel()}).
 */
class PdfReportRendererTest {

    /** Names a provider would hold in its separate code-to-identity table; never part of the model. */
    private static final List<String> LABORATORY_NAMES = List.of("Northfield Foundry Laboratory",
            "Kessler Stahl Prüflabor", "Baía Metals Testing", "Ostrava Steel QC");

    private static RoundReport round;
    private static byte[] roundPdf;
    private static String roundText;
    private static int roundPages;
    private static byte[] labPdf;
    private static String labText;

    @BeforeAll
    static void render() {
        round = SampleRoundBuilder.lowAlloySteel().build();
        PdfReportRenderer renderer = new PdfReportRenderer();
        roundPdf = renderer.render(round);
        labPdf = renderer.render(new LaboratoryReport(round, "P05"));
        ReportSamplesOutput.save("round-report.pdf", roundPdf);
        ReportSamplesOutput.save("laboratory-report-P05.pdf", labPdf);
        roundText = text(roundPdf);
        roundPages = pages(roundPdf);
        labText = text(labPdf);
    }

    @Test
    void roundReportContainsEverySectionInOrder() {
        List<String> titles = List.of("Proficiency test round report", "1 Status and confidentiality",
                "2 Scheme and round", "3 The test item", "Homogeneity and stability", "4 How the results were evaluated",
                "Results left out of the statistics", "5 Measurands at a glance", "6 Results by measurand",
                "Method groups", "Results and scores", "7 Paired items", "8 Reading the scores",
                "9 Coordinator\u2019s comments", "10 Sign-off", "End of report LAS-2026-2-R1");
        int at = -1;
        for (String title : titles) {
            int next = roundText.indexOf(title, at + 1);
            assertThat(next).as("section %s after position %d", title, at).isGreaterThan(at);
            at = next;
        }
    }

    @Test
    void everyPageCarriesTheReportIdentityAndItsNumberOutOfTheTotal() throws IOException {
        assertThat(roundPages).isGreaterThan(3);
        try (PDDocument document = Loader.loadPDF(roundPdf)) {
            PDFTextStripper stripper = new PDFTextStripper();
            stripper.setSortByPosition(true);
            for (int page = 1; page <= roundPages; page++) {
                stripper.setStartPage(page);
                stripper.setEndPage(page);
                String text = stripper.getText(document);
                assertThat(text).contains("page " + page + " of " + roundPages)
                        .contains("LAS \u00b7 round LAS-2026-2 \u00b7 report LAS-2026-2-R1 \u00b7 final");
            }
        }
    }

    @Test
    void theEndOfReportLineIsOnTheLastPage() throws IOException {
        try (PDDocument document = Loader.loadPDF(roundPdf)) {
            PDFTextStripper stripper = new PDFTextStripper();
            stripper.setStartPage(roundPages);
            stripper.setEndPage(roundPages);
            assertThat(stripper.getText(document)).contains("End of report LAS-2026-2-R1")
                    .contains("page " + roundPages + " of " + roundPages);
        }
    }

    @Test
    void identificationStatusDateAndSignatoriesArePrinted() {
        assertThat(roundText).contains("Report LAS-2026-2-R1").contains("Status final")
                .contains("Issue date 2026-11-20").contains("Dr. Irena Kova\u010d")
                .contains("Tom\u00e1s Ferreira").contains("Second reviewer (statistics)")
                .contains("This report is confidential to the participants");
    }

    @Test
    void assignedValuesAreFormattedWithTheMeasurandsReportingDigits() {
        // Fixed in SampleRoundBuilder.lowAlloySteel(): Mn item A 0.748 %, Cr 1.052 %, N 86 mg/kg.
        assertThat(roundText).contains("0.748 %").contains("1.052 %").contains("86 mg/kg");
        // σ_pt with one more digit than the values: Mn 0.020 -> 0.0200
        assertThat(roundText).contains("0.0200 %");
    }

    @Test
    void scoresAreRoundedToTwoDecimalsWithATrueMinusSign() {
        // P05 Mn item A: z = (0.702 - 0.748)/0.020 = -2.30 (questionable); P11 Cr: (1.140 - 1.052)/0.025 = 3.52
        assertThat(roundText).contains("\u22122.30").contains("3.52");
        assertThat(roundText).doesNotContain("-2.30");
        Matcher p05 = Pattern.compile("P05 0\\.702 .*").matcher(roundText);
        assertThat(p05.find()).isTrue();
        assertThat(p05.group()).contains("\u22122.30").contains("questionable");
        Matcher p11 = Pattern.compile("P11 1\\.140 .*").matcher(roundText);
        assertThat(p11.find()).isTrue();
        assertThat(p11.group()).contains("3.52").contains("unsatisfactory");
    }

    @Test
    void sigmaZetaAndMinusGlyphsSurviveTextExtraction() {
        assertThat(roundText).contains("\u03c3pt").contains("\u03b6").contains("z\u2032").contains("\u2212")
                .contains("\u00b1").contains("\u2264");
    }

    @Test
    void interpretationRulesAndTheCautionArePrinted() {
        assertThat(roundText).contains("|score| \u2264 2").contains("2 < |score| < 3").contains("|score| \u2265 3")
                .contains("|En| \u2264 1").contains("unrounded score")
                .contains("Scores support, and do not replace, the judgement of the laboratory and of its");
    }

    @Test
    void exclusionsLateAndCensoredResultsAreExplained() {
        assertThat(roundText).contains("unit error (reported in mg/kg)").contains("late")
                .contains("<50").contains("censored");
    }

    @Test
    void theBundledFontIsEmbeddedForAllText() throws IOException {
        try (PDDocument document = Loader.loadPDF(roundPdf)) {
            List<String> fonts = new ArrayList<>();
            for (PDPage page : document.getPages()) {
                for (COSName name : page.getResources().getFontNames()) {
                    PDFont font = page.getResources().getFont(name);
                    fonts.add(font.getName());
                    assertThat(font.isEmbedded()).as(font.getName()).isTrue();
                }
            }
            assertThat(fonts).allMatch(name -> name.contains("DejaVuSans"));
        }
    }

    @Test
    void renderingTheSameModelTwiceGivesIdenticalBytes() {
        byte[] again = new PdfReportRenderer().render(round);
        assertThat(again).isEqualTo(roundPdf);
    }

    @Test
    void documentInformationComesFromTheModel() throws IOException {
        try (PDDocument document = Loader.loadPDF(roundPdf)) {
            var info = document.getDocumentInformation();
            assertThat(info.getProducer()).isEqualTo(PdfReportRenderer.PRODUCER);
            assertThat(info.getCreationDate().toInstant().toString()).isEqualTo("2026-11-20T00:00:00Z");
            assertThat(info.getTitle()).isEqualTo("Round report LAS-2026-2-R1");
        }
    }

    @Test
    void anAmendedReportNamesTheReportItReplacesAndWhy() {
        RoundReport amended = SampleRoundBuilder.lowAlloySteel().status(ReportStatus.AMENDED, "LAS-2026-2-R2").build();
        String text = text(new PdfReportRenderer().render(amended));
        assertThat(text).containsPattern("Status amended\\s+replaces report LAS-2026-2-R1")
                .containsPattern("This amended report replaces report LAS-2026-2-R1, which is withdrawn\\. "
                        + "Reason: Cr result of P11\\s+corrected for a transcription error")
                .contains("report LAS-2026-2-R2 \u00b7 amended");
    }

    @Test
    void progressRisesToCompletion() {
        List<Double> fractions = new ArrayList<>();
        new PdfReportRenderer().render(round, (fraction, step) -> fractions.add(fraction));
        assertThat(fractions).isSortedAccordingTo(Double::compare);
        assertThat(fractions.get(0)).isEqualTo(0.0);
        assertThat(fractions.get(fractions.size() - 1)).isEqualTo(1.0);
        assertThat(fractions.size()).isGreaterThan(10);
    }

    @Test
    void laboratoryReportMarksItsOwnResultsAndShowsOthersOnlyByCode() {
        assertThat(labText).contains("Participant report").contains("Participant code P05")
                .contains("Your results at a glance").contains("participant P05");
        Matcher value = Pattern.compile("Manganese \\(item A\\) 0\\.702 % .*").matcher(labText);
        assertThat(value.find()).isTrue();
        Matcher score = Pattern.compile("Manganese \\(item A\\) z .*").matcher(labText);
        assertThat(score.find()).isTrue();
        assertThat(score.group()).contains("\u22122.30").contains("questionable");
        assertThat(labText).containsPattern("Your result 0\\.702 %.*z = \u22122\\.30, questionable");
        for (String name : LABORATORY_NAMES) {
            assertThat(labText).doesNotContain(name);
            assertThat(roundText).doesNotContain(name);
        }
    }

    @Test
    void laboratoryReportHasItsOwnShapeAndPointsToTheRoundReportForEveryonesResults() {
        List<String> titles = List.of("Participant report", "Round report LAS-2026-2-R1", "1 Status and confidentiality",
                "2 Scheme and round", "3 Your results at a glance", "Your results", "Your scores", "4 The test item",
                "5 How the results were evaluated", "Your results left out of the statistics",
                "6 Your results by measurand", "Results used (n)", "Robust mean x* / SD s*", "Your result", "7 Paired items",
                "8 Reading the scores", "Scores support, and do not replace", "9 Coordinator\u2019s comments",
                "10 Sign-off", "End of report LAS-2026-2-R1");
        int at = -1;
        for (String title : titles) {
            int next = labText.indexOf(title, at + 1);
            assertThat(next).as("section %s after position %d", title, at).isGreaterThan(at);
            at = next;
        }
        // no table of every participant's results, no other participant's exclusion, no method groups
        assertThat(labText).doesNotContain("Results and scores").doesNotContain("(you)")
                .doesNotContain("unit error (reported in mg/kg)").doesNotContain("Method groups")
                .doesNotContain("Measurands at a glance");
        assertThat(labText).contains("are in the round report LAS-2026-2-R1");
    }

    @Test
    void aLaboratoryReportIssuedUnderItsOwnNumberNamesTheRoundReport() {
        RoundReport issued = SampleRoundBuilder.lowAlloySteel().status(ReportStatus.FINAL, "LAS-2026-2-P05-F").build();
        String text = text(new PdfReportRenderer().render(new LaboratoryReport(issued, "P05", "LAS-2026-2-R-F")));
        assertThat(text).contains("Round report LAS-2026-2-R-F").contains("End of report LAS-2026-2-P05-F")
                .contains("participant P05");
    }

    @Test
    void renderingTheSameLaboratoryReportTwiceGivesIdenticalBytes() {
        byte[] again = new PdfReportRenderer().render(new LaboratoryReport(round, "P05"));
        assertThat(again).isEqualTo(labPdf);
    }

    @Test
    void theExcludedParticipantSeesItsOwnExclusionWithItsReason() {
        String text = text(new PdfReportRenderer().render(new LaboratoryReport(round, "P12")));
        assertThat(text).containsPattern("Your results left out of the statistics\\s+Measurand Reason\\s+Nickel")
                .contains("unit error (reported in mg/kg)");
    }

    @Test
    void laboratoryReportNamesNoLaboratoryAtAll() {
        assertThat(labText.toLowerCase()).doesNotContain("laboratory name").doesNotContain("lab name");
        // every participant is referred to by a code of the form P + digits
        Matcher codes = Pattern.compile("\\bP\\d{2}\\b").matcher(labText);
        int count = 0;
        while (codes.find()) {
            count++;
        }
        assertThat(count).isGreaterThan(12);
    }

    static String text(byte[] pdf) {
        try (PDDocument document = Loader.loadPDF(pdf)) {
            PDFTextStripper stripper = new PDFTextStripper();
            stripper.setSortByPosition(true);
            return stripper.getText(document);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static int pages(byte[] pdf) {
        try (PDDocument document = Loader.loadPDF(pdf)) {
            return document.getNumberOfPages();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
