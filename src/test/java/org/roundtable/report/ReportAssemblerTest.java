package org.roundtable.report;

import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.roundtable.audit.Actor;
import org.roundtable.evaluation.EvaluationService;
import org.roundtable.evaluation.EvaluationViews;
import org.roundtable.report.model.ReportIdentity;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.report.model.RoundReport;
import org.roundtable.report.model.Signatory;
import org.roundtable.report.model.Signatures;
import org.roundtable.report.render.PdfReportRenderer;
import org.roundtable.report.style.ReportFormat;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;
import org.junit.jupiter.api.Test;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.text.PDFTextStripper;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;

import static org.assertj.core.api.Assertions.assertThat;

/** A real round on PostgreSQL, evaluated, assembled into the report model, rendered and read back from the PDF. */
@QuarkusTest
class ReportAssemblerTest {

    /** Invented Cr results in % for ten laboratories; the last one is far off. */
    static final String[] CR = {"18.02", "18.05", "17.98", "18.01", "18.04", "17.99", "18.03", "18.00", "18.06", "18.45"};

    @Inject
    World world;

    @Inject
    EvaluationService evaluations;

    @Inject
    ReportAssembler assembler;

    /** A closed round with ten laboratories' Cr results and one evaluation run; returns round id and lab ids. */
    static long[] evaluatedRound(World world, EvaluationService evaluations) {
        long[] labs = new long[CR.length];
        for (int i = 0; i < labs.length; i++) {
            labs[i] = world.laboratory();
        }
        long round = world.round(RoundState.CLOSED, labs);
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Cr", CR[i], "0.08", "spark-oes", false);
        }
        evaluations.run(round, false, new Actor("assembler-test", "coordinator", null));
        long[] out = new long[labs.length + 1];
        out[0] = round;
        System.arraycopy(labs, 0, out, 1, labs.length);
        return out;
    }

    @Test
    void anEvaluatedRoundBecomesAReportWithItsSectionsAndNumbers() {
        long[] ids = evaluatedRound(world, evaluations);
        long round = ids[0];
        EvaluationViews.MeasurandOutcome cr = evaluations.run(round, 1).measurands().get(0);
        String code = world.text("SELECT code FROM round WHERE id = ?", round);

        ReportAssembler.Assembled assembled = assembler.assemble(round, 1,
                new ReportIdentity(code + "-R-F", ReportStatus.FINAL, null, null, LocalDate.of(2026, 12, 1), ""),
                new Signatures(new Signatory("Dr. Test Coordinator", "Round coordinator", LocalDate.of(2026, 12, 1)), null),
                "The round went well.");
        RoundReport report = assembled.report();
        assertThat(report.measurands()).hasSize(1);
        assertThat(report.measurands().get(0).assignedValue()).isEqualTo(cr.assignedValue());
        assertThat(report.measurands().get(0).results()).hasSize(CR.length);
        assertThat(report.measurands().get(0).results()).as("U and k as each laboratory reported them")
                .allSatisfy(r -> {
                    assertThat(r.expandedUncertainty()).isEqualTo(0.08);
                    assertThat(r.coverageFactor()).isEqualTo(2.0);
                });
        assertThat(assembled.laboratories()).hasSize(CR.length);

        String text = text(new PdfReportRenderer().render(report));
        for (String section : List.of("1 Status and confidentiality", "2 Scheme and round", "3 The test item",
                "4 How the results were evaluated", "Results and scores", "Reading the scores",
                "Coordinator\u2019s comments", "Sign-off", "End of report " + code + "-R-F")) {
            assertThat(text).contains(section);
        }
        assertThat(text).contains("Dr. Test Coordinator").contains("The round went well.")
                .contains("page 1 of").contains("confidential").contains("do not replace");
        assertThat(text).contains(ReportFormat.decimal(cr.assignedValue(), 2));
        assertThat(text).contains(ReportFormat.decimal(cr.sigmaPt(), 3));
        EvaluationViews.Score far = cr.scores().stream().filter(s -> "18.45".equals(s.reported())).findFirst().orElseThrow();
        assertThat(far.z()).isGreaterThan(3);
        assertThat(text).contains(far.participantCode()).containsAnyOf(ReportFormat.signedScore(far.z()),
                ReportFormat.score(far.z()));
        for (String name : laboratoryNames(ids)) {
            assertThat(text).doesNotContain(name);
        }
    }

    List<String> laboratoryNames(long[] ids) {
        List<String> names = new ArrayList<>();
        for (int i = 1; i < ids.length; i++) {
            names.add(world.text("SELECT name FROM laboratory WHERE id = ?", ids[i]));
        }
        return names;
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
}
