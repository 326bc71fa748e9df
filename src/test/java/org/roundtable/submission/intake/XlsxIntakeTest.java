package org.roundtable.submission.intake;

import static org.assertj.core.api.Assertions.assertThat;
import static org.roundtable.submission.intake.IntakeTestSupport.accepted;
import static org.roundtable.submission.intake.IntakeTestSupport.rejected;
import static org.roundtable.submission.intake.IntakeTestSupport.resource;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.math.BigDecimal;
import java.util.List;
import org.apache.poi.openxml4j.util.ZipSecureFile;
import org.apache.poi.ss.usermodel.CellStyle;
import org.apache.poi.xssf.usermodel.XSSFRow;
import org.apache.poi.xssf.usermodel.XSSFSheet;
import org.apache.poi.xssf.usermodel.XSSFWorkbook;
import org.junit.jupiter.api.Test;

/** Accepted XLSX uploads: text cells, number cells with and without a number format, sheets, and POI's zip guard. */
class XlsxIntakeTest {

    private final ResultIntake intake = new ResultIntake();

    private static final List<List<String>> ROWS = List.of(
            List.of("measurand", "value", "unit", "expanded_uncertainty", "coverage_factor", "method", "replicates",
                    "replicate_values"),
            List.of("C", "0.412", "%", "0.012", "2", "combustion", "2", "0.410|0.414"),
            List.of("Si", "0.245", "%", "0.010", "2", "spark-oes", "3", ""),
            List.of("Mn", "1.215", "%", "0.030", "2", "spark-oes", "3", ""),
            List.of("P", "0.012", "%", "0.002", "2", "spark-oes", "3", ""),
            List.of("S", "0.008", "%", "0.001", "2", "combustion", "2", ""),
            List.of("Cr", "1.050", "%", "0.025", "2", "spark-oes", "3", ""),
            List.of("Ni", "0.183", "%", "0.008", "2", "spark-oes", "3", ""),
            List.of("Mo", "0.214", "%", "0.008", "2", "xrf", "2", ""),
            List.of("Cu", "0.145", "%", "0.006", "2", "spark-oes", "3", ""),
            List.of("N", "85", "mg/kg", "6", "2", "inert-gas-fusion", "2", "84|86"));

    /** Writes the rows; numeric columns as number cells with {@code numberFormat}, or as text when it is null. */
    static byte[] workbook(List<List<String>> rows, String numberFormat, int firstRow) throws IOException {
        try (XSSFWorkbook workbook = new XSSFWorkbook()) {
            XSSFSheet sheet = workbook.createSheet("Results");
            CellStyle style = null;
            if (numberFormat != null) {
                style = workbook.createCellStyle();
                style.setDataFormat(workbook.createDataFormat().getFormat(numberFormat));
            }
            for (int r = 0; r < rows.size(); r++) {
                XSSFRow row = sheet.createRow(firstRow + r);
                for (int c = 0; c < rows.get(r).size(); c++) {
                    String text = rows.get(r).get(c);
                    if (text.isEmpty()) {
                        continue;
                    }
                    boolean numeric = r > 0 && (c == 1 || c == 3 || c == 4 || c == 6);
                    if (numeric && numberFormat != null) {
                        row.createCell(c).setCellValue(Double.parseDouble(text));
                        if (c != 4 && c != 6 && rows.get(r).get(2).equals("%")) {
                            row.getCell(c).setCellStyle(style);
                        }
                    } else {
                        row.createCell(c).setCellValue(text);
                    }
                }
            }
            ByteArrayOutputStream out = new ByteArrayOutputStream();
            workbook.write(out);
            return out.toByteArray();
        }
    }

    private IntakeResult.Accepted csvReference() {
        return accepted(intake.read(resource("accepted/comma.csv"), UploadFormat.CSV,
                LowAlloySteelRound.singleItem()));
    }

    @Test
    void workbookWithTextCellsGivesTheSameCanonicalPayloadAsTheCsv() throws IOException {
        IntakeResult.Accepted accepted = accepted(intake.read(workbook(ROWS, null, 0), UploadFormat.XLSX,
                LowAlloySteelRound.singleItem()));

        assertThat(accepted.detection()).isEqualTo(new Detection(UploadFormat.XLSX, "OOXML", false, null, '.'));
        assertThat(accepted.results()).hasSize(10);
        assertThat(accepted.canonicalJson()).isEqualTo(csvReference().canonicalJson());
        assertThat(accepted.sha256()).isEqualTo(csvReference().sha256());
    }

    @Test
    void theCommittedAcceptedWorkbookWithFormattedNumberCellsGivesTheSameHashAsTheCsv() {
        IntakeResult.Accepted accepted = accepted(intake.read(resource("accepted/results.xlsx"), UploadFormat.XLSX,
                LowAlloySteelRound.singleItem()));

        assertThat(accepted.results()).hasSize(10);
        assertThat(accepted.warnings()).isEmpty();
        assertThat(accepted.sha256()).isEqualTo(csvReference().sha256());
    }

    @Test
    void numberCellsFormattedWithThreeDecimalsKeepTheirTrailingZeros() throws IOException {
        IntakeResult.Accepted accepted = accepted(intake.read(workbook(ROWS, "0.000", 0), UploadFormat.XLSX,
                LowAlloySteelRound.singleItem()));

        ReportedResult chromium = accepted.results().get(5);
        assertThat(chromium.valueAsReported()).isEqualTo("1.050");
        assertThat(chromium.value().value()).isEqualTo(new BigDecimal("1.050"));
        assertThat(accepted.sha256()).isEqualTo(csvReference().sha256());
    }

    @Test
    void numberCellsWithTheGeneralFormatGiveThePlainDecimalOfTheStoredNumber() throws IOException {
        IntakeResult.Accepted accepted = accepted(intake.read(workbook(ROWS, "General", 0), UploadFormat.XLSX,
                LowAlloySteelRound.singleItem()));

        ReportedResult chromium = accepted.results().get(5);
        assertThat(chromium.valueAsReported()).isEqualTo("1.05");
        assertThat(accepted.results().get(0).valueAsReported()).isEqualTo("0.412");
        assertThat(accepted.results().get(9).valueAsReported()).isEqualTo("85");
        assertThat(accepted.warnings()).extracting(IntakeWarning::key).containsExactly("value.reporting-digits");
    }

    @Test
    void theHeaderMayStartBelowTheFirstRowAndRowsAreTheSheetRows() throws IOException {
        IntakeResult.Accepted accepted = accepted(intake.read(workbook(ROWS, null, 3), UploadFormat.XLSX,
                LowAlloySteelRound.singleItem()));

        assertThat(accepted.results().get(0).row()).isEqualTo(5);
    }

    @Test
    void decimalCommaInTextCellsIsAccepted() throws IOException {
        List<List<String>> rows = List.of(ROWS.get(0),
                List.of("Mn", "1,215", "%", "0,030", "2", "spark-oes", "3", "1,210|1,215|1,220"));

        IntakeResult.Accepted accepted = accepted(intake.read(workbook(rows, null, 0), UploadFormat.XLSX,
                LowAlloySteelRound.singleItem()));

        assertThat(accepted.results().get(0).value().value()).isEqualTo(new BigDecimal("1.215"));
        assertThat(accepted.detection().decimalSeparator()).isEqualTo(',');
    }

    @Test
    void rowProblemsOfAWorkbookNameTheSheetRowAndTheColumn() throws IOException {
        List<List<String>> rows = List.of(ROWS.get(0), ROWS.get(1),
                List.of("Mn", "-1.215", "%", "0.030", "2", "spark-oes", "3", ""),
                List.of("Zz", "0.100", "%", "0.030", "2", "spark-oes", "3", ""));

        IntakeResult.Rejected rejected = rejected(intake.read(workbook(rows, null, 0), UploadFormat.XLSX,
                LowAlloySteelRound.singleItem()));

        assertThat(rejected.problems()).extracting(IntakeProblem::row, IntakeProblem::column, IntakeProblem::key)
                .containsExactly(org.assertj.core.groups.Tuple.tuple(3, "value", "value.negative"),
                        org.assertj.core.groups.Tuple.tuple(4, "measurand", "measurand.unknown-element"));
    }

    @Test
    void readingAWorkbookLeavesPoisInflateRatioGuardOnAndAtLeastOurLimit() throws IOException {
        intake.read(workbook(ROWS, null, 0), UploadFormat.XLSX, LowAlloySteelRound.singleItem());

        assertThat(ZipSecureFile.getMinInflateRatio()).isGreaterThanOrEqualTo(Limits.defaults().minInflateRatio());
        assertThat(ZipSecureFile.getMaxFileCount()).isLessThanOrEqualTo(Limits.defaults().maxZipEntries());
        assertThat(ZipSecureFile.getMaxEntrySize()).isLessThanOrEqualTo(Limits.defaults().maxUncompressedBytes());
    }

    @Test
    void limitsRefuseToSwitchTheInflateRatioGuardOff() {
        Limits defaults = Limits.defaults();

        org.assertj.core.api.Assertions.assertThatIllegalArgumentException().isThrownBy(() -> new Limits(
                defaults.maxFileBytes(), defaults.maxDataRows(), defaults.maxLineChars(), defaults.maxCellChars(),
                defaults.maxColumns(), defaults.maxZipEntries(), defaults.maxUncompressedBytes(), -1.0,
                defaults.inflateGraceBytes()));
    }
}
