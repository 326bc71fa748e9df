package org.roundtable.report.render;

import com.openhtmltopdf.extend.FSObjectDrawer;
import com.openhtmltopdf.extend.OutputDevice;
import com.openhtmltopdf.outputdevice.helper.BaseRendererBuilder;
import com.openhtmltopdf.pdfboxout.PdfBoxRenderer;
import com.openhtmltopdf.pdfboxout.PdfRendererBuilder;
import com.openhtmltopdf.render.DefaultObjectDrawerFactory;
import com.openhtmltopdf.render.RenderingContext;
import com.openhtmltopdf.util.XRLog;
import java.awt.Shape;
import java.awt.geom.Rectangle2D;
import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.time.ZoneOffset;
import java.util.Calendar;
import java.util.GregorianCalendar;
import java.util.Map;
import java.util.TimeZone;
import java.util.logging.Level;
import org.apache.pdfbox.cos.COSArray;
import org.apache.pdfbox.cos.COSString;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.pdmodel.PDDocumentInformation;
import org.jfree.chart.JFreeChart;
import org.roundtable.report.chart.ChartDataCache;
import org.roundtable.report.chart.ReportChart;
import org.roundtable.report.model.LaboratoryReport;
import org.roundtable.report.model.RoundReport;
import org.roundtable.report.style.ReportFonts;
import org.w3c.dom.Element;

/**
 * Renders a report as an A4 PDF with openhtmltopdf (PDFBox 3) from the same XHTML as the HTML page.
 *
 * <p>Charts are vector graphics: each chart placeholder in the XHTML is drawn by JFreeChart
 * straight into the page through openhtmltopdf's Graphics2D bridge (PdfBoxGraphics2D), and chart
 * text is mapped to the embedded DejaVu Sans, so it stays selectable text. This path was chosen over
 * embedding the SVG through the Batik-based SVG module: it draws the identical JFreeChart without
 * an SVG parse, needs no Batik dependency, and keeps large rounds fast.
 *
 * <p>Fonts: DejaVu Sans regular and bold are embedded as subsets (the built-in PDF fonts lack
 * U+2212, σ and ζ); they are handed to PDFBox without their GSUB table, see
 * {@link ReportFonts#withoutGlyphSubstitution(String)}. Page layout: running header (scheme, round, report id, status), footer
 * "page x of y", a final "End of report" line.
 *
 * <p>Reproducible bytes: producer, title, creation and modification dates come from the model
 * (dates = issue date, 00:00 UTC), and the trailer's document id is a SHA-256 digest of the
 * XHTML, so the same model renders to the same bytes; the server can hash the result.
 *
 * <p>Chart data that is the same in every report of a round (scores in order, the density curve,
 * axis ranges) is computed once per measurand section and kept by this renderer
 * ({@link ChartDataCache}); use one renderer for the round report and all laboratory reports of a
 * run, as the issue job does.
 *
 * <p>Thread-safe: every call builds its own openhtmltopdf renderer; the chart data cache is synchronised.
 */
public final class PdfReportRenderer {

    /** Producer string written into the PDF. */
    public static final String PRODUCER = "Roundtable report renderer";

    static {
        // openhtmltopdf logs several INFO lines for every document; keep its warnings and errors only
        for (String logger : XRLog.listRegisteredLoggers()) {
            XRLog.setLevel(logger, Level.WARNING);
        }
    }

    private static final byte[] REGULAR_FONT = ReportFonts.withoutGlyphSubstitution(ReportFonts.REGULAR_RESOURCE);
    private static final byte[] BOLD_FONT = ReportFonts.withoutGlyphSubstitution(ReportFonts.BOLD_RESOURCE);

    private final ChartDataCache chartData = new ChartDataCache();

    /** Renders the round report. */
    public byte[] render(RoundReport report) {
        return render(report, RenderProgress.NONE);
    }

    /** Renders the round report, reporting progress. */
    public byte[] render(RoundReport report, RenderProgress progress) {
        ByteArrayOutputStream out = new ByteArrayOutputStream(256 * 1024);
        render(report, out, progress);
        return out.toByteArray();
    }

    /** Renders the round report to a stream (not closed), reporting progress. */
    public void render(RoundReport report, OutputStream out, RenderProgress progress) {
        progress.progress(0.0, "building the document");
        write(ReportDocument.build(report, ChartEmbedding.PDF_OBJECT, chartData), report, null, out, progress);
    }

    /** Renders a participant's report. */
    public byte[] render(LaboratoryReport report) {
        return render(report, RenderProgress.NONE);
    }

    /** Renders a participant's report, reporting progress. */
    public byte[] render(LaboratoryReport report, RenderProgress progress) {
        ByteArrayOutputStream out = new ByteArrayOutputStream(256 * 1024);
        render(report, out, progress);
        return out.toByteArray();
    }

    /** Renders a participant's report to a stream (not closed), reporting progress. */
    public void render(LaboratoryReport report, OutputStream out, RenderProgress progress) {
        progress.progress(0.0, "building the document");
        write(ReportDocument.build(report, ChartEmbedding.PDF_OBJECT, chartData), report.round(),
                report.ownParticipantCode(), out, progress);
    }

    /**
     * Renders a document of another kind (a precision experiment's report): well-formed XHTML whose charts are
     * {@link #chartPlaceholder(ReportChart)} elements, drawn as vector graphics like the round report's.
     */
    public byte[] renderDocument(String xhtml, Map<String, ReportChart> charts) {
        ByteArrayOutputStream out = new ByteArrayOutputStream(256 * 1024);
        write(new ReportDocument.Built(xhtml, charts), null, null, out, RenderProgress.NONE);
        return out.toByteArray();
    }

    /** The element {@link #renderDocument} replaces by the chart. */
    public static String chartPlaceholder(ReportChart chart) {
        return "<object type=\"" + ReportDocument.CHART_OBJECT_TYPE + "\" data-chart=\"" + chart.key()
                + "\" style=\"width: " + chart.width() + "px; height: " + chart.height() + "px;\"></object>";
    }

    private void write(ReportDocument.Built built, RoundReport report, String ownCode, OutputStream out,
            RenderProgress progress) {
        ChartDrawer drawer = new ChartDrawer(built.charts(), progress);
        progress.progress(0.05, "laying out pages");

        DefaultObjectDrawerFactory drawers = new DefaultObjectDrawerFactory();
        drawers.registerDrawer(ReportDocument.CHART_OBJECT_TYPE, drawer);
        PdfRendererBuilder builder = new PdfRendererBuilder()
                .useFastMode()
                .withHtmlContent(built.xhtml(), null)
                .useObjectDrawerFactory(drawers)
                .withProducer(PRODUCER)
                .useFont(() -> new ByteArrayInputStream(REGULAR_FONT), ReportFonts.FAMILY, 400,
                        BaseRendererBuilder.FontStyle.NORMAL, true)
                .useFont(() -> new ByteArrayInputStream(BOLD_FONT), ReportFonts.FAMILY, 700,
                        BaseRendererBuilder.FontStyle.NORMAL, true);
        try (PdfBoxRenderer renderer = builder.buildPdfRenderer()) {
            renderer.layout();
            progress.progress(0.3, "drawing pages");
            renderer.createPDFWithoutClosing();
            PDDocument document = renderer.getPdfDocument();
            if (report != null) {
                fixMetadata(document, report, ownCode, built.xhtml());
            }
            progress.progress(0.97, "writing the file");
            document.save(out);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        progress.progress(1.0, "done");
    }

    /** Sets the document information from the model and a content-derived document id. */
    private static void fixMetadata(PDDocument document, RoundReport report, String ownCode, String xhtml) {
        PDDocumentInformation info = document.getDocumentInformation();
        Calendar issued = new GregorianCalendar(TimeZone.getTimeZone(ZoneOffset.UTC));
        issued.clear();
        issued.set(report.identity().issueDate().getYear(), report.identity().issueDate().getMonthValue() - 1,
                report.identity().issueDate().getDayOfMonth(), 0, 0, 0);
        info.setCreationDate(issued);
        info.setModificationDate(issued);
        info.setProducer(PRODUCER);
        info.setCreator(PRODUCER);
        info.setTitle((ownCode == null ? "Round report " : "Participant report " + ownCode + " ")
                + report.identity().reportId());
        info.setSubject(report.scheme().schemeCode() + " round " + report.round().roundId());
        byte[] id = sha256(xhtml);
        COSArray ids = new COSArray();
        ids.add(new COSString(java.util.Arrays.copyOf(id, 16)));
        ids.add(new COSString(java.util.Arrays.copyOf(id, 16)));
        document.getDocument().getTrailer().setItem(org.apache.pdfbox.cos.COSName.ID, ids);
    }

    private static byte[] sha256(String text) {
        try {
            return MessageDigest.getInstance("SHA-256").digest(text.getBytes(StandardCharsets.UTF_8));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Draws the chart whose key is in the placeholder's {@code data-chart} attribute. */
    private static final class ChartDrawer implements FSObjectDrawer {

        private final Map<String, ReportChart> charts;
        private final RenderProgress progress;
        private int drawn;

        ChartDrawer(Map<String, ReportChart> charts, RenderProgress progress) {
            this.charts = charts;
            this.progress = progress;
        }

        @Override
        public Map<Shape, String> drawObject(Element element, double x, double y, double width, double height,
                OutputDevice outputDevice, RenderingContext context, int dotsPerPixel) {
            ReportChart chart = charts.get(element.getAttribute("data-chart"));
            if (chart == null) {
                return null;
            }
            float w = (float) (width / dotsPerPixel);
            float h = (float) (height / dotsPerPixel);
            outputDevice.drawWithGraphics((float) x, (float) y, w, h, g2 -> {
                JFreeChart built = chart.build();
                built.draw(g2, new Rectangle2D.Double(0, 0, chart.width(), chart.height()));
            });
            drawn++;
            progress.progress(0.3 + 0.67 * Math.min(1.0, drawn / (double) Math.max(1, charts.size())),
                    "drawing charts " + drawn + " of " + charts.size());
            return null;
        }
    }
}
