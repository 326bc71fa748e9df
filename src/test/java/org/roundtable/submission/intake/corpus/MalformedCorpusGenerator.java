package org.roundtable.submission.intake.corpus;

import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.Charset;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import java.util.zip.ZipEntry;
import java.util.zip.ZipInputStream;
import java.util.zip.ZipOutputStream;
import org.apache.poi.hssf.usermodel.HSSFWorkbook;
import org.apache.poi.poifs.crypt.EncryptionInfo;
import org.apache.poi.poifs.crypt.EncryptionMode;
import org.apache.poi.poifs.crypt.Encryptor;
import org.apache.poi.poifs.filesystem.POIFSFileSystem;
import org.apache.poi.ss.usermodel.CellStyle;
import org.apache.poi.ss.usermodel.FormulaError;
import org.apache.poi.xssf.usermodel.XSSFCell;
import org.apache.poi.xssf.usermodel.XSSFRow;
import org.apache.poi.xssf.usermodel.XSSFSheet;
import org.apache.poi.xssf.usermodel.XSSFWorkbook;

/**
 * Writes the malformed-upload corpus ({@code src/test/resources/uploads/malformed/}) and its {@code MANIFEST.csv}.
 *
 * <p>Run once after changing a case, from the project directory, with the test classpath:
 * {@code java -cp target/test-classes:target/classes:<dependencies> 
 * org.roundtable.submission.intake.corpus.MalformedCorpusGenerator src/test/resources/uploads/malformed}.
 * Commit the generator and its output together. The output is deterministic (fixed zip timestamps; the encrypted
 * workbook uses random salts, so only that file changes between runs).
 *
 * <p>Every case starts from the same valid low-alloy steel upload (header row 1; C on row 2, Si 3, Mn 4, P 5, S 6,
 * Cr 7, Ni 8, Mo 9, Cu 10, N 11) and breaks exactly one thing; the manifest names the expected error key and, where
 * it applies, the row and column. Test values are invented. Files stay below 1 MB; the larger cases (10⁶ rows, 1 MB
 * line, 10 MB file) are generated in the corpus test instead.
 */
public final class MalformedCorpusGenerator {

    /** One corpus file and what the intake must answer. */
    record Case(String file, byte[] content, String key, Integer row, String column) {
    }

    static final List<String> HEADER = List.of("measurand", "value", "unit", "expanded_uncertainty",
            "coverage_factor", "method", "replicates", "replicate_values");

    static final List<List<String>> BASE_ROWS = List.of(
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

    private static final long FIXED_TIME = 1_767_225_600_000L; // 2026-01-01T00:00:00Z, for reproducible zips

    private final List<Case> cases = new ArrayList<>();

    private MalformedCorpusGenerator() {
    }

    public static void main(String[] args) throws Exception {
        Path directory = Path.of(args.length > 0 ? args[0] : "src/test/resources/uploads/malformed");
        Files.createDirectories(directory);
        try (Stream<Path> old = Files.list(directory)) {
            for (Path file : old.toList()) {
                Files.delete(file);
            }
        }
        MalformedCorpusGenerator generator = new MalformedCorpusGenerator();
        generator.csvFileCases();
        generator.csvStructureCases();
        generator.csvHeaderCases();
        generator.csvValueCases();
        generator.jsonCases();
        generator.xlsxContentCases();
        generator.xlsxContainerCases();
        StringBuilder manifest = new StringBuilder("file,expected_key,row,column\n");
        generator.cases.sort(Comparator.comparing(Case::file));
        for (Case c : generator.cases) {
            if (c.content().length >= 1_000_000) {
                throw new IllegalStateException(c.file() + " is not below 1 MB");
            }
            Files.write(directory.resolve(c.file()), c.content());
            manifest.append(c.file()).append(',').append(c.key()).append(',')
                    .append(c.row() == null ? "" : c.row()).append(',')
                    .append(c.column() == null ? "" : c.column()).append('\n');
        }
        Files.writeString(directory.resolve("MANIFEST.csv"), manifest.toString(), StandardCharsets.UTF_8);
        Path accepted = directory.resolveSibling("accepted");
        if (Files.isDirectory(accepted)) {
            Files.write(accepted.resolve("results.xlsx"), acceptedWorkbook());
        }
        System.out.println(generator.cases.size() + " cases written to " + directory);
    }

    // ---------------------------------------------------------------- CSV: file and encoding

    private void csvFileCases() throws IOException {
        String base = csv(table());
        add("csv-empty-file.csv", new byte[0], "file.empty", null, null);
        add("csv-only-blank-lines.csv", utf8("\n\n   \n\r\n"), "file.empty", null, null);
        add("csv-only-byte-order-mark.csv", bytes(0xEF, 0xBB, 0xBF), "file.empty", null, null);
        add("csv-utf16le-with-bom.csv", concat(bytes(0xFF, 0xFE), base.getBytes(StandardCharsets.UTF_16LE)),
                "file.not-utf8", null, null);
        add("csv-utf16be-with-bom.csv", concat(bytes(0xFE, 0xFF), base.getBytes(StandardCharsets.UTF_16BE)),
                "file.not-utf8", null, null);
        add("csv-utf16le-without-bom.csv", base.getBytes(StandardCharsets.UTF_16LE), "file.not-utf8", null, null);
        add("csv-utf32be-with-bom.csv", concat(bytes(0, 0, 0xFE, 0xFF), base.getBytes(Charset.forName("UTF-32BE"))),
                "file.not-utf8", null, null);
        add("csv-latin1-micro-sign-in-unit.csv",
                csv(set(table(), 3, "unit", "µg/g")).getBytes(StandardCharsets.ISO_8859_1), "file.not-utf8", 3, null);
        add("csv-latin1-header.csv", ("measurand,value,unit,méthode\nMn,1.215,%,spark-oes\n")
                .getBytes(StandardCharsets.ISO_8859_1), "file.not-utf8", 1, null);
        add("csv-windows1252-curly-quote.csv", concat(utf8(csvLines(table(), 1, 4)), bytes(0x93),
                utf8("Mn\u201d is Mn,1.215,%,0.030,2,spark-oes,3,\n")), "file.not-utf8", 5, null);
        add("csv-truncated-utf8-sequence.csv", concat(utf8(base), bytes(0xC3)), "file.not-utf8", 12, null);
        add("csv-overlong-utf8-slash.csv", concat(utf8(csvLines(table(), 1, 10)), utf8("N,85,mg"), bytes(0xC0, 0xAF),
                utf8("kg,6,2,inert-gas-fusion,2,84|86\n")), "file.not-utf8", 11, null);
        add("csv-utf8-encoded-surrogate.csv", concat(utf8(csvLines(table(), 1, 3)), utf8("P,0.012,%"),
                bytes(0xED, 0xA0, 0x80), utf8(",0.002,2,spark-oes,3,\n")), "file.not-utf8", 4, null);
        add("csv-invalid-utf8-continuation.csv", concat(utf8(csvLines(table(), 1, 5)), utf8("Cr,1.050,%,0.025,2,"),
                bytes(0xE2, 0x28, 0xA1), utf8(",3,\n")), "file.not-utf8", 6, null);
        add("csv-nul-byte-in-value.csv", utf8(csv(set(table(), 2, "value", "0.4\u000012"))), "csv.nul-byte", 2, null);
        add("csv-nul-byte-at-start.csv", concat(bytes(0), utf8(base)), "csv.nul-byte", 1, null);
        add("csv-nul-byte-after-last-line.csv", concat(utf8(base), bytes(0)), "csv.nul-byte", 12, null);
        add("csv-nul-bytes-padding.csv", concat(utf8(base), new byte[2000]), "csv.nul-byte", 12, null);
        add("csv-pdf-renamed.csv", concat(utf8("%PDF-1.7\n%âãÏÓ\n1 0 obj\n<< /Type /Catalog >>\nendobj\n"),
                utf8(base)), "file.type-mismatch", null, null);
        add("csv-windows-executable-renamed.csv", concat(bytes('M', 'Z', 0x90, 0, 3, 0, 0, 0, 4, 0),
                new byte[200]), "file.type-mismatch", null, null);
        add("csv-elf-executable-renamed.csv", concat(bytes(0x7F, 'E', 'L', 'F', 2, 1, 1, 0), new byte[120]),
                "file.type-mismatch", null, null);
        add("csv-workbook-renamed.csv", xlsx(cellsOf(table())), "file.type-mismatch", null, null);
        add("csv-ole2-renamed.csv", legacyXls(), "file.type-mismatch", null, null);
        add("csv-png-renamed.csv", concat(bytes(0x89, 'P', 'N', 'G', 0x0D, 0x0A, 0x1A, 0x0A), new byte[64]),
                "file.type-mismatch", null, null);
        add("csv-gzip-renamed.csv", concat(bytes(0x1F, 0x8B, 8, 0), new byte[64]), "file.type-mismatch", null, null);
        add("csv-java-class-renamed.csv", concat(bytes(0xCA, 0xFE, 0xBA, 0xBE, 0, 0, 0, 61), new byte[64]),
                "file.type-mismatch", null, null);
    }

    // ---------------------------------------------------------------- CSV: structure

    private void csvStructureCases() {
        add("csv-unbalanced-quote-in-value.csv", utf8(csv(set(table(), 4, "value", "\"1.215"))),
                "csv.unbalanced-quote", 4, null);
        add("csv-unbalanced-quote-in-header.csv", utf8("\"" + csv(table())), "csv.unbalanced-quote", 1, null);
        add("csv-unbalanced-quote-in-last-row.csv", utf8(csv(set(table(), 11, "method", "\"inert-gas-fusion"))),
                "csv.unbalanced-quote", 11, null);
        add("csv-unbalanced-quote-in-method.csv", utf8(csv(set(table(), 7, "method", "\"spark-oes,3,"))),
                "csv.unbalanced-quote", 7, null);
        add("csv-text-after-closing-quote.csv", utf8(csv(set(table(), 4, "measurand", "\"Mn\"x"))),
                "csv.text-after-closing-quote", 4, null);
        add("csv-space-after-closing-quote.csv", utf8(csv(set(table(), 2, "value", "\"0.412\" "))),
                "csv.text-after-closing-quote", 2, null);
        add("csv-mixed-delimiters-in-header.csv", utf8(csv(table()).replaceFirst(",value,", ";value;")),
                "csv.mixed-delimiters", 1, null);
        add("csv-mixed-delimiters-in-row.csv", utf8(csvWithRow(table(), 5,
                "P;0.012;%;0.002;2;spark-oes;3;")), "csv.mixed-delimiters", 5, null);
        add("csv-comma-row-in-semicolon-file.csv", utf8(csvWithRow(semicolonTable(), 3,
                "Si,0.245,%,0.010,2,spark-oes,3,", ';')), "csv.mixed-delimiters", 3, null);
        add("csv-tab-separated.csv", utf8(csv(table(), '\t')), "csv.unsupported-delimiter", 1, null);
        add("csv-pipe-separated.csv", utf8(csv(table()).replace("|", "/").replace(',', '|')),
                "csv.unsupported-delimiter", 1, null);
        add("csv-line-too-long-in-row.csv", utf8(csv(set(table(), 6, "method", "x".repeat(5000)))),
                "csv.line-too-long", 6, null);
        add("csv-line-too-long-header.csv", utf8(csv(table()).replaceFirst("replicate_values",
                "replicate_values" + " ".repeat(4100))), "csv.line-too-long", 1, null);
        add("csv-line-of-4097-characters.csv", utf8(csvWithRow(table(), 3, "Si,0.245,%,0.010,2,spark-oes,3,"
                + "0".repeat(4097 - "Si,0.245,%,0.010,2,spark-oes,3,".length()))), "csv.line-too-long", 3, null);
        StringBuilder manyRows = new StringBuilder(String.join(",", HEADER)).append('\n');
        for (int i = 0; i < 5001; i++) {
            manyRows.append("Mn,1.215,%,,,spark-oes,3,\n");
        }
        add("csv-5001-data-rows.csv", utf8(manyRows.toString()), "file.too-many-rows", 5002, null);
        add("csv-header-only.csv", utf8(String.join(",", HEADER) + "\n"), "file.no-results", null, null);
        add("csv-header-and-blank-rows-only.csv", utf8(String.join(",", HEADER) + "\n,,,,,,,\n\n  \n"),
                "file.no-results", null, null);
        add("csv-row-with-extra-cell.csv", utf8(csvWithRow(table(), 3, "Si,0.245,%,0.010,2,spark-oes,3,,extra")),
                "row.column-count", 3, null);
        add("csv-row-with-missing-cells.csv", utf8(csvWithRow(table(), 7, "Cr,1.050,%,0.025,2,spark-oes")),
                "row.column-count", 7, null);
        add("csv-row-with-single-cell.csv", utf8(csvWithRow(table(), 4, "Mn")), "row.column-count", 4, null);
        add("csv-last-row-with-extra-cell.csv", utf8(csvWithRow(table(), 11,
                "N,85,mg/kg,6,2,inert-gas-fusion,2,84|86,note")), "row.column-count", 11, null);
        add("csv-replicate-values-separated-by-comma.csv", utf8(csv(set(table(), 2, "replicate_values",
                "0.410,0.414"))), "row.column-count", 2, null);
        add("csv-embedded-line-feed-in-method.csv", utf8(csv(set(table(), 4, "method", "\"spark-\noes\""))),
                "value.control-character", 4, "method");
        add("csv-embedded-crlf-in-measurand.csv", utf8(csv(set(table(), 4, "measurand", "\"M\r\nn\""))),
                "value.control-character", 4, "measurand");
        add("csv-cr-line-endings-with-bad-row.csv", utf8(csv(set(table(), 5, "measurand", "Px")).replace('\n', '\r')),
                "measurand.unknown-element", 5, "measurand");
        add("csv-crlf-with-blank-lines-and-bad-row.csv", utf8(csv(set(table(), 3, "unit", "ppm"))
                .replaceFirst("\n", "\n\r\n\n").replace("\n", "\r\n").replace("\r\r\n", "\r\n")),
                "unit.unknown", 5, "unit");
    }

    // ---------------------------------------------------------------- CSV: header

    private void csvHeaderCases() {
        for (String required : List.of("measurand", "value", "unit", "method", "replicates")) {
            add("csv-header-missing-" + required + ".csv", utf8(csv(dropColumn(table(), required))),
                    "header.missing-column", 1, required);
        }
        add("csv-header-duplicate-value.csv", utf8(csv(duplicateColumn(table(), "value", "value"))),
                "header.duplicate-column", 1, "value");
        add("csv-header-duplicate-in-other-case.csv", utf8(csv(duplicateColumn(table(), "unit", "UNIT"))),
                "header.duplicate-column", 1, "unit");
        add("csv-header-duplicate-by-spelling.csv", utf8(csv(duplicateColumn(table(), "expanded_uncertainty",
                "Expanded Uncertainty"))), "header.duplicate-column", 1, "expanded_uncertainty");
        add("csv-header-unknown-comment.csv", utf8(csv(addColumn(table(), "comment", "fresh grind"))),
                "header.unknown-column", 1, "comment");
        add("csv-header-unknown-lab-code.csv", utf8(csv(addColumn(table(), "lab_code", "L07"))),
                "header.unknown-column", 1, "lab_code");
        add("csv-header-misspelt-uncertainty.csv", utf8(csv(table()).replaceFirst("expanded_uncertainty",
                "expanded_uncertanity")), "header.unknown-column", 1, "expanded_uncertanity");
        add("csv-header-missing-first-line-is-data.csv", utf8(csv(table()).substring(csv(table()).indexOf('\n') + 1)),
                "header.unknown-column", 1, "C");
        add("csv-header-empty-column-name-with-data.csv", utf8(csv(addColumn(table(), "", "x"))),
                "header.empty-column-name", 1, "column 9");
        add("csv-header-formula-name.csv", utf8(csv(table()).replaceFirst("measurand", "=measurand")),
                "header.unknown-column", 1, "=measurand");
        add("csv-header-second-byte-order-mark.csv", concat(bytes(0xEF, 0xBB, 0xBF, 0xEF, 0xBB, 0xBF),
                utf8(csv(table()))), "header.unknown-column", 1, null);
        add("csv-header-units-in-names.csv", utf8(csv(table()).replaceFirst("value,", "value (%),")),
                "header.unknown-column", 1, "value (%)");
        add("csv-header-item-column-in-other-language.csv", utf8(csv(addColumn(table(), "probe", "1"))),
                "header.unknown-column", 1, "probe");
    }

    // ---------------------------------------------------------------- CSV: cells and values

    private void csvValueCases() {
        cell("value-empty", 4, "value", "", "value.missing");
        cell("value-text", 4, "value", "abc", "value.not-a-number");
        cell("value-with-percent-sign", 4, "value", "1.215%", "value.not-a-number");
        cell("value-with-unit-after-space", 2, "value", "0.412 %", "value.not-a-number");
        cell("value-thousands-separator", 11, "value", "1 234", "value.not-a-number");
        cell("value-two-decimal-points", 4, "value", "1.2.15", "value.not-a-number");
        cell("value-trailing-point", 4, "value", "1.", "value.not-a-number");
        cell("value-space-inside", 2, "value", "0. 412", "value.not-a-number");
        cell("value-hexadecimal", 2, "value", "0x1A", "value.not-a-number");
        cell("value-fraction", 2, "value", "1/2", "value.not-a-number");
        cell("value-unicode-minus", 2, "value", "\u22120.412", "value.not-a-number");
        cell("value-fullwidth-digit", 2, "value", "\uff10.412", "value.not-a-number");
        cell("value-arabic-indic-digits", 4, "value", "\u0661.\u0662\u0661\u0665", "value.not-a-number");
        cell("value-leading-no-break-space", 2, "value", "\u00a00.412", "value.not-a-number");
        cell("value-greater-than", 4, "value", ">2", "value.not-a-number");
        cell("value-less-than-without-number", 5, "value", "<", "value.not-a-number");
        cell("value-plus-minus", 4, "value", "1.215±0.030", "value.not-a-number");
        cell("value-nan", 3, "value", "NaN", "value.not-finite");
        cell("value-inf", 3, "value", "Inf", "value.not-finite");
        cell("value-infinity", 3, "value", "Infinity", "value.not-finite");
        cell("value-negative-infinity", 3, "value", "-Infinity", "value.not-finite");
        cell("value-infinity-sign", 3, "value", "\u221e", "value.not-finite");
        cell("value-spreadsheet-infinity", 3, "value", "1.#INF", "value.not-finite");
        cell("value-exponent", 5, "value", "1e-3", "value.exponent-not-allowed");
        cell("value-exponent-upper-case", 2, "value", "4.12E-1", "value.exponent-not-allowed");
        cell("value-negative", 2, "value", "-0.412", "value.negative");
        cell("value-negative-zero", 2, "value", "-0", "value.negative");
        cell("value-less-than-negative", 5, "value", "<-0.001", "value.negative");
        cell("value-above-100-percent", 7, "value", "100.5", "value.above-100-percent");
        cell("value-above-one-million-mg-per-kg", 11, "value", "1000001", "value.above-100-percent");
        cell("value-decimal-comma-in-comma-file", 2, "value", "\"0,412\"", "value.decimal-comma-not-allowed");
        cell("value-less-than-not-allowed-for-carbon", 2, "value", "<0.005", "value.less-than-not-allowed");
        cell("value-less-than-not-allowed-for-nitrogen", 11, "value", "<10", "value.less-than-not-allowed");
        cell("value-plus-sign", 2, "value", "+0.412", "value.formula-prefix");
        cell("value-formula", 2, "value", "=0.4+0.012", "value.formula-prefix");
        cell("value-at-function", 2, "value", "@SUM(A1:A2)", "value.formula-prefix");
        cell("value-tab-prefix", 2, "value", "\t0.412", "value.formula-prefix");
        cell("value-carriage-return-prefix", 2, "value", "\"\r0.412\"", "value.formula-prefix");
        cell("value-dde-payload", 2, "value", "-2+3+cmd|' /C calc'!A0", "value.formula-prefix");
        cell("measurand-hyperlink-formula", 4, "measurand", "\"=HYPERLINK(\"\"http://example.invalid\"\",\"\"Mn\"\")\"",
                "value.formula-prefix");
        cell("measurand-plus-prefix", 4, "measurand", "+Mn", "value.formula-prefix");
        cell("measurand-minus-prefix", 4, "measurand", "-Mn", "value.formula-prefix");
        cell("measurand-tab-prefix", 4, "measurand", "\tMn", "value.formula-prefix");
        cell("method-at-prefix", 4, "method", "@cmd", "value.formula-prefix");
        cell("unit-formula", 4, "unit", "=\"%\"", "value.formula-prefix");
        cell("item-formula", 2, "item", "=1", "value.formula-prefix");
        cell("measurand-bell-character", 4, "measurand", "Mn\u0007", "value.control-character");
        cell("unit-escape-sequence", 4, "unit", "%\u001b[31m", "value.control-character");
        cell("method-delete-character", 4, "method", "spark-oes\u007f", "value.control-character");
        cell("method-too-long", 4, "method", "spark-oes-" + "a".repeat(300), "value.too-long");
        cell("measurand-too-long", 4, "measurand", "M".repeat(257), "value.too-long");
        cell("measurand-unknown-symbol", 4, "measurand", "Xx", "measurand.unknown-element");
        cell("measurand-lower-case", 4, "measurand", "mn", "measurand.unknown-element");
        cell("measurand-upper-case", 4, "measurand", "MN", "measurand.unknown-element");
        cell("measurand-element-name", 4, "measurand", "Manganese", "measurand.unknown-element");
        cell("measurand-beyond-uranium", 4, "measurand", "Pu", "measurand.unknown-element");
        cell("measurand-atomic-number", 4, "measurand", "25", "measurand.unknown-element");
        cell("measurand-with-unit", 4, "measurand", "Mn%", "measurand.unknown-element");
        cell("measurand-zero-width-space", 4, "measurand", "Mn\u200b", "measurand.unknown-element");
        cell("measurand-bidi-override", 4, "measurand", "M\u202en", "measurand.unknown-element");
        cell("measurand-oxide", 3, "measurand", "SiO2", "measurand.unknown-element");
        cell("measurand-vanadium-not-in-round", 4, "measurand", "V", "measurand.not-in-round");
        cell("measurand-iron-not-in-round", 4, "measurand", "Fe", "measurand.not-in-round");
        cell("measurand-oxygen-not-in-round", 11, "measurand", "O", "measurand.not-in-round");
        cell("measurand-empty", 4, "measurand", "", "value.missing");
        cell("unit-ppm", 11, "unit", "ppm", "unit.unknown");
        cell("unit-micrograms-per-gram", 11, "unit", "µg/g", "unit.unknown");
        cell("unit-percent-mass-per-mass", 4, "unit", "% m/m", "unit.unknown");
        cell("unit-upper-case-mg-per-kg", 11, "unit", "MG/KG", "unit.unknown");
        cell("unit-gram-per-kilogram", 4, "unit", "g/kg", "unit.unknown");
        cell("unit-empty", 4, "unit", "", "value.missing");
        cell("unit-mg-per-kg-not-allowed-for-manganese", 4, "unit", "mg/kg", "unit.not-allowed");
        cell("unit-mg-per-kg-not-allowed-for-carbon", 2, "unit", "mg/kg", "unit.not-allowed");
        cell("method-unknown-oes", 4, "method", "oes", "method.unknown");
        cell("method-unknown-gravimetry", 4, "method", "gravimetry", "method.unknown");
        cell("method-unknown-spelling", 4, "method", "spark_oes", "method.unknown");
        cell("method-empty", 4, "method", "", "value.missing");
        cell("method-combustion-not-allowed-for-manganese", 4, "method", "combustion", "method.not-allowed");
        cell("method-xrf-not-allowed-for-nitrogen", 11, "method", "xrf", "method.not-allowed");
        cell("uncertainty-negative", 4, "expanded_uncertainty", "-0.030", "value.negative");
        cell("uncertainty-zero", 4, "expanded_uncertainty", "0", "uncertainty.not-positive");
        cell("uncertainty-text", 4, "expanded_uncertainty", "n/a", "value.not-a-number");
        cell("uncertainty-nan", 4, "expanded_uncertainty", "nan", "value.not-finite");
        cell("uncertainty-above-100-percent", 4, "expanded_uncertainty", "120", "value.above-100-percent");
        cell("coverage-factor-zero", 4, "coverage_factor", "0", "coverage-factor.out-of-range");
        cell("coverage-factor-five", 4, "coverage_factor", "5", "coverage-factor.out-of-range");
        cell("coverage-factor-half", 4, "coverage_factor", "0.5", "coverage-factor.out-of-range");
        cell("coverage-factor-negative", 4, "coverage_factor", "-2", "value.negative");
        cell("coverage-factor-text", 4, "coverage_factor", "two", "value.not-a-number");
        cell("replicates-zero", 4, "replicates", "0", "replicates.out-of-range");
        cell("replicates-five", 4, "replicates", "5", "replicates.out-of-range");
        cell("replicates-huge", 4, "replicates", "99999999999", "value.not-an-integer");
        cell("replicates-fraction", 4, "replicates", "2.5", "value.not-an-integer");
        cell("replicates-negative", 4, "replicates", "-3", "value.negative");
        cell("replicates-empty", 4, "replicates", "", "value.missing");
        cell("replicate-values-count-mismatch", 2, "replicate_values", "0.410|0.412|0.414",
                "replicates.count-mismatch");
        cell("replicate-values-not-a-number", 2, "replicate_values", "0.410|abc", "value.not-a-number");
        cell("replicate-values-empty-piece", 2, "replicate_values", "0.410||0.414", "value.missing");
        cell("replicate-values-negative", 2, "replicate_values", "0.410|-0.414", "value.negative");
        cell("replicate-values-formula", 2, "replicate_values", "=A1|0.414", "value.formula-prefix");
        cell("replicate-values-infinite", 11, "replicate_values", "84|Inf", "value.not-finite");
        add("csv-duplicate-measurand.csv", utf8(csvWithExtraRow(table(), "Mn,1.220,%,0.030,2,spark-oes,3,")),
                "row.duplicate-measurand", 12, "measurand");
        add("csv-duplicate-measurand-same-value.csv", utf8(csvWithExtraRow(table(), "C,0.412,%,0.012,2,combustion,2,"
                + "0.410|0.414")), "row.duplicate-measurand", 12, "measurand");
        add("csv-duplicate-measurand-with-item-column.csv", utf8(csvWithExtraRow(addColumn(table(), "item", "1"),
                "Cu,0.146,%,0.006,2,spark-oes,3,,1")), "row.duplicate-measurand", 12, "measurand");
        add("csv-item-unknown.csv", utf8(csv(set(addColumn(table(), "item", "1"), 6, "item", "2"))),
                "item.unknown", 6, "item");
        add("csv-mixed-decimal-separators.csv", utf8(csv(set(semicolonTable(), 3, "value", "0.245"), ';')),
                "value.mixed-decimal-separators", 3, "value");
        add("csv-every-measurand-unknown.csv", utf8(csv(renameAll(table()))), "measurand.unknown-element", 2,
                "measurand");
    }

    private void cell(String name, int row, String column, String value, String key) {
        List<List<String>> table = column.equals("item") ? addColumn(table(), "item", "1") : table();
        add("csv-" + name + ".csv", utf8(csv(set(table, row, column, value))), key, row, column);
    }

    // ---------------------------------------------------------------- JSON

    private void jsonCases() {
        String valid = "{\"results\":[{\"measurand\":\"Mn\",\"value\":\"1.215\",\"unit\":\"%\",\"method\":\"spark-oes\","
                + "\"replicates\":3}]}";
        add("json-empty.json", new byte[0], "file.empty", null, null);
        add("json-not-json.json", utf8("measurand,value\nMn,1.215\n"), "json.malformed", null, null);
        add("json-trailing-comma.json", utf8(valid.replace("3}]}", "3,}]}")), "json.malformed", null, null);
        add("json-comment.json", utf8("// results\n" + valid), "json.malformed", null, null);
        add("json-nan-literal.json", utf8(valid.replace("\"1.215\"", "NaN")), "json.malformed", null, null);
        add("json-duplicate-key.json", utf8(valid.replace("\"unit\":\"%\"", "\"unit\":\"%\",\"unit\":\"mg/kg\"")),
                "json.malformed", null, null);
        add("json-two-documents.json", utf8(valid + valid), "json.malformed", null, null);
        add("json-deep-nesting.json", utf8("{\"results\":" + "[".repeat(50) + "]".repeat(50) + "}"),
                "json.malformed", null, null);
        add("json-top-level-array.json", utf8("[" + valid + "]"), "json.structure", null, null);
        add("json-results-not-array.json", utf8("{\"results\":{}}"), "json.structure", null, null);
        add("json-result-not-object.json", utf8("{\"results\":[\"Mn 1.215 %\"]}"), "json.structure", 1, null);
        add("json-unknown-field.json", utf8(valid.replace("\"unit\"", "\"comment\":\"ok\",\"unit\"")),
                "json.unknown-field", 1, "comment");
        add("json-unknown-top-level-field.json", utf8(valid.replace("{\"results\"", "{\"lab\":\"L07\",\"results\"")),
                "json.unknown-field", 0, "lab");
        add("json-value-is-object.json", utf8(valid.replace("\"1.215\"", "{\"v\":1.215}")), "json.wrong-type", 1,
                "value");
        add("json-value-is-boolean.json", utf8(valid.replace("\"1.215\"", "true")), "json.wrong-type", 1, "value");
        add("json-negative-number.json", utf8(valid.replace("\"1.215\"", "-1.215")), "value.negative", 1, "value");
        add("json-missing-unit.json", utf8(valid.replace("\"unit\":\"%\",", "")), "value.missing", 1, "unit");
        add("json-latin1-bytes.json", valid.replace("Mn", "Mñ").getBytes(StandardCharsets.ISO_8859_1),
                "file.not-utf8", null, null);
        add("json-pdf-renamed.json", utf8("%PDF-1.4\n" + valid), "file.type-mismatch", null, null);
        add("json-formula-in-method.json", utf8(valid.replace("\"spark-oes\"", "\"=cmd|' /C calc'!A0\"")),
                "value.formula-prefix", 1, "method");
        add("json-replicate-values-not-array.json", utf8(valid.replace("\"replicates\":3",
                "\"replicates\":3,\"replicateValues\":\"1.21|1.22|1.23\"")), "json.wrong-type", 1, "replicateValues");
    }

    // ---------------------------------------------------------------- XLSX: content

    private void xlsxContentCases() throws IOException {
        xlsxCell("unknown-element", 4, "measurand", "Xx", "measurand.unknown-element");
        xlsxCell("not-in-round", 4, "measurand", "V", "measurand.not-in-round");
        xlsxCell("negative-number-cell", 2, "value", -0.412, "value.negative");
        xlsxCell("formula-text-cell", 2, "value", "=0.4+0.012", "value.formula-prefix");
        xlsxCell("formula-cell-in-value", 2, "value", new Formula("0.4+0.012"), "value.formula-prefix");
        xlsxCell("formula-cell-in-measurand", 4, "measurand", new Formula("\"M\"&\"n\""), "value.formula-prefix");
        xlsxCell("hyperlink-formula-cell", 4, "method", new Formula("HYPERLINK(\"http://example.invalid\",\"x\")"),
                "value.formula-prefix");
        xlsxCell("at-prefix-text", 4, "method", "@SUM(A1)", "value.formula-prefix");
        xlsxCell("tab-prefix-text", 4, "measurand", "\tMn", "value.formula-prefix");
        xlsxCell("plus-prefix-text", 2, "value", "+0.412", "value.formula-prefix");
        xlsxCell("nan-text", 3, "value", "NaN", "value.not-finite");
        xlsxCell("infinity-text", 3, "value", "Infinity", "value.not-finite");
        xlsxCell("error-cell", 4, "value", FormulaError.DIV0, "value.not-a-number");
        xlsxCell("boolean-cell", 4, "value", Boolean.TRUE, "value.not-a-number");
        xlsxCell("date-cell", 4, "value", new Formatted(45292.0, "yyyy-mm-dd"), "value.not-a-number");
        xlsxCell("percent-formatted-cell", 2, "value", new Formatted(0.00412, "0.00%"), "value.not-a-number");
        xlsxCell("text-value", 4, "value", "about 1.2", "value.not-a-number");
        xlsxCell("exponent-text", 5, "value", "1e-3", "value.exponent-not-allowed");
        xlsxCell("above-100-percent", 7, "value", 150.0, "value.above-100-percent");
        xlsxCell("unit-not-allowed", 4, "unit", "mg/kg", "unit.not-allowed");
        xlsxCell("unit-unknown", 11, "unit", "ppm", "unit.unknown");
        xlsxCell("method-unknown", 4, "method", "oes", "method.unknown");
        xlsxCell("method-not-allowed", 4, "method", "combustion", "method.not-allowed");
        xlsxCell("value-empty", 4, "value", "", "value.missing");
        xlsxCell("line-feed-in-method", 4, "method", "spark-\noes", "value.control-character");
        xlsxCell("too-long-method", 4, "method", "x".repeat(300), "value.too-long");
        xlsxCell("replicates-zero", 4, "replicates", 0.0, "replicates.out-of-range");
        xlsxCell("replicates-fraction", 4, "replicates", 2.5, "value.not-an-integer");
        xlsxCell("replicate-count-mismatch", 2, "replicate_values", "0.410|0.412|0.414", "replicates.count-mismatch");
        xlsxCell("coverage-factor-seven", 4, "coverage_factor", 7.0, "coverage-factor.out-of-range");
        xlsxCell("uncertainty-zero", 4, "expanded_uncertainty", 0.0, "uncertainty.not-positive");
        xlsxCell("less-than-not-allowed", 2, "value", "<0.005", "value.less-than-not-allowed");

        List<List<Object>> duplicate = cellsOf(table());
        duplicate.add(new ArrayList<>(List.of("Mn", "1.220", "%", "0.030", "2", "spark-oes", "3", "")));
        add("xlsx-duplicate-measurand.xlsx", xlsx(duplicate), "row.duplicate-measurand", 12, "measurand");
        add("xlsx-header-missing-unit.xlsx", xlsx(cellsOf(dropColumn(table(), "unit"))), "header.missing-column", 1,
                "unit");
        add("xlsx-header-duplicate-value.xlsx", xlsx(cellsOf(duplicateColumn(table(), "value", "Value"))),
                "header.duplicate-column", 1, "value");
        add("xlsx-header-unknown-column.xlsx", xlsx(cellsOf(addColumn(table(), "remarks", "ok"))),
                "header.unknown-column", 1, "remarks");
        add("xlsx-header-only.xlsx", xlsx(cellsOf(List.of(HEADER))), "file.no-results", null, null);
        add("xlsx-empty-sheet.xlsx", xlsx(new ArrayList<>()), "file.empty", null, null);
        add("xlsx-data-on-second-sheet-only.xlsx", xlsxWithSecondSheet(cellsOf(table())), "file.empty", null, null);
        List<List<Object>> extraCell = cellsOf(table());
        extraCell.get(3).add("beyond the header");
        add("xlsx-cell-beyond-header.xlsx", xlsx(extraCell), "row.column-count", 4, null);
        List<List<Object>> manyRows = new ArrayList<>();
        manyRows.add(new ArrayList<>(HEADER));
        for (int i = 0; i < 5001; i++) {
            manyRows.add(new ArrayList<>(List.of("Mn", "1.215", "%", "", "", "spark-oes", "3", "")));
        }
        add("xlsx-5001-data-rows.xlsx", xlsx(manyRows), "file.too-many-rows", 5002, null);
    }

    private void xlsxCell(String name, int row, String column, Object value, String key) throws IOException {
        List<List<Object>> cells = cellsOf(table());
        cells.get(row - 1).set(HEADER.indexOf(column), value);
        add("xlsx-" + name + ".xlsx", xlsx(cells), key, row, column);
    }

    // ---------------------------------------------------------------- XLSX: container

    private void xlsxContainerCases() throws Exception {
        byte[] workbook = xlsx(cellsOf(table()));
        add("xlsx-empty-file.xlsx", new byte[0], "file.empty", null, null);
        add("xlsx-windows-executable-renamed.xlsx", concat(bytes('M', 'Z', 0x90, 0, 3, 0, 0, 0, 4, 0), new byte[200]),
                "file.type-mismatch", null, null);
        add("xlsx-pdf-renamed.xlsx", utf8("%PDF-1.7\n1 0 obj\n<< /Type /Catalog >>\nendobj\n"), "file.type-mismatch",
                null, null);
        add("xlsx-csv-renamed.xlsx", utf8(csv(table())), "file.type-mismatch", null, null);
        add("xlsx-legacy-xls-renamed.xlsx", legacyXls(), "xlsx.legacy-format", null, null);
        add("xlsx-encrypted-with-password.xlsx", encrypted(workbook), "xlsx.encrypted", null, null);
        add("xlsx-encrypted-ole2-header-only.xlsx", fakeEncryptedOle2(), "xlsx.encrypted", null, null);
        add("xlsx-zip-entry-encrypted-flag.xlsx", setCentralDirectoryFlag(workbook, "xl/worksheets/sheet1.xml", 1),
                "xlsx.encrypted", null, null);

        add("xlsx-zip-bomb-padding-entry.xlsx", rezip(workbook, Map.of(), Map.of("xl/media/padding.bin",
                new byte[15 * 1024 * 1024])), "xlsx.zip-bomb", null, null);
        add("xlsx-zip-bomb-total-size.xlsx", rezip(workbook, Map.of(), Map.of("xl/media/a.bin",
                new byte[12 * 1024 * 1024], "xl/media/b.bin", new byte[12 * 1024 * 1024])), "xlsx.zip-bomb", null, null);
        add("xlsx-zip-bomb-in-sheet-xml.xlsx", rezip(workbook, Map.of("xl/worksheets/sheet1.xml",
                paddedSheet(entry(workbook, "xl/worksheets/sheet1.xml"), 8 * 1024 * 1024)), Map.of()),
                "xlsx.zip-bomb", null, null);
        add("xlsx-zip-bomb-shared-strings.xlsx", rezip(workbook, Map.of("xl/sharedStrings.xml",
                paddedSharedStrings(entry(workbook, "xl/sharedStrings.xml"), 4 * 1024 * 1024)), Map.of()),
                "xlsx.zip-bomb", null, null);
        byte[] lying = rezip(workbook, Map.of(), Map.of("xl/media/lying.bin", new byte[3 * 1024 * 1024]));
        add("xlsx-zip-bomb-lying-sizes.xlsx", setCentralDirectoryUncompressedSize(lying, "xl/media/lying.bin", 60_000),
                "xlsx.zip-bomb", null, null);
        add("xlsx-zip-inside-embeddings.xlsx", rezip(workbook, Map.of(), Map.of("xl/embeddings/oleObject1.bin",
                new byte[4096])), "xlsx.active-content", null, null);

        Map<String, byte[]> many = new LinkedHashMap<>();
        for (int i = 0; i < 201; i++) {
            many.put("xl/media/image" + i + ".png", bytes(i));
        }
        add("xlsx-201-zip-entries.xlsx", rezip(workbook, Map.of(), many), "xlsx.too-many-entries", null, null);
        Map<String, byte[]> tooMany = new LinkedHashMap<>();
        for (int i = 0; i < 1500; i++) {
            tooMany.put("customXml/item" + i + ".xml", utf8("<a/>"));
        }
        add("xlsx-1500-zip-entries.xlsx", rezip(workbook, Map.of(), tooMany), "xlsx.too-many-entries", null, null);

        add("xlsx-zip-slip-parent-path.xlsx", rezip(workbook, Map.of(), Map.of("../../evil.xml", utf8("<a/>"))),
                "xlsx.unsafe-entry-name", null, null);
        add("xlsx-zip-slip-absolute-path.xlsx", rezip(workbook, Map.of(), Map.of("/tmp/evil.xml", utf8("<a/>"))),
                "xlsx.unsafe-entry-name", null, null);
        add("xlsx-zip-slip-backslash.xlsx", rezip(workbook, Map.of(), Map.of("xl\\..\\..\\evil.xml", utf8("<a/>"))),
                "xlsx.unsafe-entry-name", null, null);
        add("xlsx-zip-slip-drive-letter.xlsx", rezip(workbook, Map.of(), Map.of("C:/evil.xml", utf8("<a/>"))),
                "xlsx.unsafe-entry-name", null, null);

        String contentTypes = new String(entry(workbook, "[Content_Types].xml"), StandardCharsets.UTF_8);
        String macroTypes = contentTypes.replace("application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"
                + ".main+xml", "application/vnd.ms-excel.sheet.macroEnabled.main+xml")
                .replace("</Types>", "<Default Extension=\"bin\" ContentType=\"application/vnd.ms-office.vbaProject\"/>"
                        + "</Types>");
        add("xlsx-macro-enabled-renamed-xlsm.xlsx", rezip(workbook, Map.of("[Content_Types].xml", utf8(macroTypes)),
                Map.of("xl/vbaProject.bin", vbaProjectStub())), "xlsx.macro-enabled", null, null);
        add("xlsx-macro-content-type-only.xlsx", rezip(workbook, Map.of("[Content_Types].xml", utf8(macroTypes)),
                Map.of()), "xlsx.macro-enabled", null, null);
        add("xlsx-vba-project-part-only.xlsx", rezip(workbook, Map.of(), Map.of("xl/vbaProject.bin",
                vbaProjectStub())), "xlsx.macro-enabled", null, null);
        add("xlsx-activex-control.xlsx", rezip(workbook, Map.of(), Map.of("xl/activeX/activeX1.xml",
                utf8("<ax:ocx xmlns:ax=\"http://schemas.microsoft.com/office/2006/activeX\"/>"))),
                "xlsx.active-content", null, null);
        add("xlsx-external-link-part.xlsx", rezip(workbook, Map.of(), Map.of("xl/externalLinks/externalLink1.xml",
                utf8("<externalLink xmlns=\"http://schemas.openxmlformats.org/spreadsheetml/2006/main\">"
                        + "<externalBook/></externalLink>"))), "xlsx.external-link", null, null);
        add("xlsx-external-link-content-type.xlsx", rezip(workbook, Map.of("[Content_Types].xml", utf8(contentTypes
                .replace("</Types>", "<Override PartName=\"/xl/links/link1.xml\" ContentType=\"application/vnd"
                        + ".openxmlformats-officedocument.spreadsheetml.externalLink+xml\"/></Types>"))), Map.of()),
                "xlsx.external-link", null, null);

        String xxe = "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<!DOCTYPE sst [<!ENTITY xxe SYSTEM "
                + "\"file:///etc/passwd\">]>\n";
        byte[] sharedStrings = entry(workbook, "xl/sharedStrings.xml");
        add("xlsx-xxe-in-shared-strings.xlsx", rezip(workbook, Map.of("xl/sharedStrings.xml",
                withDoctype(sharedStrings, xxe, "<t>Mn</t>", "<t>&xxe;</t>")), Map.of()), "xlsx.xml-doctype", null,
                null);
        String laughs = "<?xml version=\"1.0\"?>\n<!DOCTYPE worksheet [<!ENTITY a \"lol\"><!ENTITY b \"&a;&a;&a;&a;"
                + "&a;&a;&a;&a;&a;&a;\"><!ENTITY c \"&b;&b;&b;&b;&b;&b;&b;&b;&b;&b;\">]>\n";
        add("xlsx-entity-expansion-in-sheet.xlsx", rezip(workbook, Map.of("xl/worksheets/sheet1.xml",
                withDoctype(entry(workbook, "xl/worksheets/sheet1.xml"), laughs, null, null)), Map.of()),
                "xlsx.xml-doctype", null, null);
        add("xlsx-xxe-in-workbook-part.xlsx", rezip(workbook, Map.of("xl/workbook.xml",
                withDoctype(entry(workbook, "xl/workbook.xml"), xxe.replace("sst", "workbook"), null, null)),
                Map.of()), "xlsx.xml-doctype", null, null);
        add("xlsx-xxe-in-content-types.xlsx", rezip(workbook, Map.of("[Content_Types].xml",
                withDoctype(utf8(contentTypes), xxe.replace("sst", "Types"), null, null)), Map.of()),
                "xlsx.xml-doctype", null, null);
        add("xlsx-parameter-entity-in-styles.xlsx", rezip(workbook, Map.of("xl/styles.xml",
                withDoctype(entry(workbook, "xl/styles.xml"), "<?xml version=\"1.0\"?>\n<!DOCTYPE styleSheet [<!ENTITY "
                        + "% remote SYSTEM \"http://example.invalid/x.dtd\"> %remote;]>\n", null, null)), Map.of()),
                "xlsx.xml-doctype", null, null);
        add("xlsx-lower-case-doctype-in-relationships.xlsx", rezip(workbook, Map.of("_rels/.rels",
                withDoctype(entry(workbook, "_rels/.rels"), "<?xml version=\"1.0\"?>\n<!doctype Relationships>\n",
                        null, null)), Map.of()), "xlsx.xml-doctype", null, null);

        add("xlsx-truncated.xlsx", Arrays.copyOf(workbook, workbook.length / 2), "xlsx.corrupt", null, null);
        add("xlsx-zip-header-then-garbage.xlsx", concat(bytes('P', 'K', 3, 4), utf8("this is not a zip".repeat(20))),
                "xlsx.corrupt", null, null);
        add("xlsx-damaged-compressed-data.xlsx", damageEntryData(workbook, "xl/worksheets/sheet1.xml"),
                "xlsx.corrupt", null, null);
        add("xlsx-wrong-directory-offset.xlsx", setEndRecordDirectoryOffset(workbook, 7), "xlsx.corrupt", null, null);
        add("xlsx-zip64-marker.xlsx", setEndRecordEntryCount(workbook, 0xFFFF), "xlsx.corrupt", null, null);
        add("xlsx-sheet-not-well-formed.xlsx", rezip(workbook, Map.of("xl/worksheets/sheet1.xml",
                utf8("<worksheet xmlns=\"http://schemas.openxmlformats.org/spreadsheetml/2006/main\"><sheetData><row>"
                        + "</sheetData>")), Map.of()), "xlsx.corrupt", null, null);
        add("xlsx-shared-string-index-out-of-range.xlsx", rezip(workbook, Map.of("xl/worksheets/sheet1.xml",
                utf8(new String(entry(workbook, "xl/worksheets/sheet1.xml"), StandardCharsets.UTF_8)
                        .replaceFirst("<v>0</v>", "<v>9999</v>"))), Map.of()), "xlsx.corrupt", null, null);
        add("xlsx-number-cell-with-text.xlsx", rezip(workbook, Map.of("xl/worksheets/sheet1.xml",
                utf8(new String(entry(workbook, "xl/worksheets/sheet1.xml"), StandardCharsets.UTF_8)
                        .replaceFirst("t=\"s\" s=\"0\"><v>0</v>", "t=\"n\" s=\"0\"><v>zero</v>"))), Map.of()), "xlsx.corrupt",
                null, null);
        add("xlsx-duplicate-zip-entry.xlsx", duplicateEntry(workbook, "xl/styles.xml"), "xlsx.corrupt", null, null);
        add("xlsx-plain-zip-without-workbook.xlsx", zip(Map.of("results.csv", utf8(csv(table())))),
                "xlsx.not-a-workbook", null, null);
        add("xlsx-word-document-renamed.xlsx", wordDocument(), "xlsx.not-a-workbook", null, null);
        add("xlsx-opendocument-spreadsheet-renamed.xlsx", zip(Map.of("mimetype",
                utf8("application/vnd.oasis.opendocument.spreadsheet"), "content.xml", utf8("<office:document-content "
                        + "xmlns:office=\"urn:oasis:names:tc:opendocument:xmlns:office:1.0\"/>"))),
                "xlsx.not-a-workbook", null, null);
        add("xlsx-empty-zip.xlsx", bytes('P', 'K', 5, 6, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0),
                "xlsx.not-a-workbook", null, null);
        String sheetXml = new String(entry(workbook, "xl/worksheets/sheet1.xml"), StandardCharsets.UTF_8);
        add("xlsx-dimension-beyond-last-row.xlsx", rezip(workbook, Map.of("xl/worksheets/sheet1.xml",
                utf8(withDimension(sheetXml, "A1:H2000000"))), Map.of()), "xlsx.invalid-dimension", null, null);
        add("xlsx-dimension-beyond-last-column.xlsx", rezip(workbook, Map.of("xl/worksheets/sheet1.xml",
                utf8(withDimension(sheetXml, "A1:ZZZZ11"))), Map.of()), "xlsx.invalid-dimension", null, null);
    }

    // ---------------------------------------------------------------- CSV helpers

    static List<List<String>> table() {
        List<List<String>> table = new ArrayList<>();
        table.add(new ArrayList<>(HEADER));
        for (List<String> row : BASE_ROWS) {
            table.add(new ArrayList<>(row));
        }
        return table;
    }

    private static List<List<String>> semicolonTable() {
        List<List<String>> table = table();
        for (List<String> row : table.subList(1, table.size())) {
            row.replaceAll(cell -> cell.matches("[0-9.|]+") ? cell.replace('.', ',') : cell);
        }
        return table;
    }

    /** Sets a cell; {@code row} counts as a spreadsheet does (1 = header). */
    private static List<List<String>> set(List<List<String>> table, int row, String column, String value) {
        table.get(row - 1).set(table.get(0).indexOf(column), value);
        return table;
    }

    private static List<List<String>> dropColumn(List<List<String>> table, String column) {
        int index = table.get(0).indexOf(column);
        for (List<String> row : table) {
            row.remove(index);
        }
        return table;
    }

    private static List<List<String>> duplicateColumn(List<List<String>> table, String column, String name) {
        int index = table.get(0).indexOf(column);
        table.get(0).add(name);
        for (List<String> row : table.subList(1, table.size())) {
            row.add(row.get(index));
        }
        return table;
    }

    private static List<List<String>> addColumn(List<List<String>> table, String name, String value) {
        table.get(0).add(name);
        for (List<String> row : table.subList(1, table.size())) {
            row.add(value);
        }
        return table;
    }

    private static List<List<String>> renameAll(List<List<String>> table) {
        for (List<String> row : table.subList(1, table.size())) {
            row.set(0, row.get(0) + "x");
        }
        return table;
    }

    static String csv(List<List<String>> table) {
        return csv(table, ',');
    }

    private static String csv(List<List<String>> table, char delimiter) {
        StringBuilder text = new StringBuilder();
        for (List<String> row : table) {
            text.append(String.join(String.valueOf(delimiter), row)).append('\n');
        }
        return text.toString();
    }

    /** Lines {@code from} … {@code to} (spreadsheet rows, inclusive) of the valid table. */
    private static String csvLines(List<List<String>> table, int from, int to) {
        return csv(table.subList(from - 1, to));
    }

    private static String csvWithRow(List<List<String>> table, int row, String line) {
        return csvWithRow(table, row, line, ',');
    }

    private static String csvWithRow(List<List<String>> table, int row, String line, char delimiter) {
        String[] lines = csv(table, delimiter).split("\n");
        lines[row - 1] = line;
        return String.join("\n", lines) + "\n";
    }

    private static String csvWithExtraRow(List<List<String>> table, String line) {
        return csv(table) + line + "\n";
    }

    // ---------------------------------------------------------------- XLSX helpers

    /** A formula cell. */
    record Formula(String formula) {
    }

    /** A number cell with a number format. */
    record Formatted(double number, String format) {
    }

    /** The table as workbook cells: text everywhere (numbers as text keep their decimals). */
    static List<List<Object>> cellsOf(List<List<String>> table) {
        List<List<Object>> cells = new ArrayList<>();
        for (List<String> row : table) {
            cells.add(new ArrayList<>(row));
        }
        return cells;
    }

    static byte[] xlsx(List<List<Object>> cells) throws IOException {
        try (XSSFWorkbook workbook = new XSSFWorkbook()) {
            fill(workbook, workbook.createSheet("Results"), cells);
            return fixedTimes(write(workbook));
        }
    }

    /**
     * The valid upload as a lab would type it: numbers as number cells, % values formatted with three decimals,
     * N in mg/kg with none; written to {@code uploads/accepted/results.xlsx}.
     */
    static byte[] acceptedWorkbook() throws IOException {
        List<List<Object>> cells = cellsOf(table());
        for (List<Object> row : cells.subList(1, cells.size())) {
            String format = row.get(2).equals("%") ? "0.000" : "0";
            row.set(1, new Formatted(Double.parseDouble((String) row.get(1)), format));
            row.set(3, new Formatted(Double.parseDouble((String) row.get(3)), format));
            row.set(4, Double.valueOf((String) row.get(4)));
            row.set(6, Double.valueOf((String) row.get(6)));
        }
        return xlsx(cells);
    }

    private static byte[] xlsxWithSecondSheet(List<List<Object>> cells) throws IOException {
        try (XSSFWorkbook workbook = new XSSFWorkbook()) {
            workbook.createSheet("Notes");
            fill(workbook, workbook.createSheet("Results"), cells);
            return fixedTimes(write(workbook));
        }
    }

    private static void fill(XSSFWorkbook workbook, XSSFSheet sheet, List<List<Object>> cells) {
        for (int r = 0; r < cells.size(); r++) {
            XSSFRow row = sheet.createRow(r);
            for (int c = 0; c < cells.get(r).size(); c++) {
                Object value = cells.get(r).get(c);
                if (value instanceof String text && text.isEmpty()) {
                    continue;
                }
                XSSFCell cell = row.createCell(c);
                if (value instanceof String text) {
                    cell.setCellValue(text);
                } else if (value instanceof Double number) {
                    cell.setCellValue(number);
                } else if (value instanceof Boolean bool) {
                    cell.setCellValue(bool);
                } else if (value instanceof FormulaError error) {
                    cell.setCellErrorValue(error);
                } else if (value instanceof Formula formula) {
                    cell.setCellFormula(formula.formula());
                } else if (value instanceof Formatted formatted) {
                    CellStyle style = workbook.createCellStyle();
                    style.setDataFormat(workbook.createDataFormat().getFormat(formatted.format()));
                    cell.setCellStyle(style);
                    cell.setCellValue(formatted.number());
                }
            }
        }
    }

    private static byte[] write(XSSFWorkbook workbook) throws IOException {
        workbook.getProperties().getCoreProperties().setCreated(java.util.Optional.of(new java.util.Date(FIXED_TIME)));
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        workbook.write(out);
        return out.toByteArray();
    }

    private static byte[] legacyXls() throws IOException {
        try (HSSFWorkbook workbook = new HSSFWorkbook()) {
            workbook.createSheet("Results").createRow(0).createCell(0).setCellValue("measurand");
            ByteArrayOutputStream out = new ByteArrayOutputStream();
            workbook.write(out);
            return out.toByteArray();
        }
    }

    private static byte[] encrypted(byte[] workbook) throws Exception {
        try (POIFSFileSystem fileSystem = new POIFSFileSystem()) {
            EncryptionInfo info = new EncryptionInfo(EncryptionMode.agile);
            Encryptor encryptor = info.getEncryptor();
            encryptor.confirmPassword("invented-password");
            try (OutputStream out = encryptor.getDataStream(fileSystem)) {
                out.write(workbook);
            }
            ByteArrayOutputStream bytes = new ByteArrayOutputStream();
            fileSystem.writeFilesystem(bytes);
            return bytes.toByteArray();
        }
    }

    /** An OLE2 header followed by a directory entry named EncryptionInfo: what an encrypted OOXML file starts with. */
    private static byte[] fakeEncryptedOle2() {
        byte[] content = new byte[1536];
        byte[] magic = bytes(0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1);
        System.arraycopy(magic, 0, content, 0, magic.length);
        byte[] name = "EncryptionInfo".getBytes(StandardCharsets.UTF_16LE);
        System.arraycopy(name, 0, content, 1024, name.length);
        return content;
    }

    private static byte[] vbaProjectStub() {
        return concat(bytes(0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1), utf8("VBA stub, no real macro"));
    }

    private static byte[] wordDocument() throws IOException {
        return zip(Map.of(
                "[Content_Types].xml", utf8("<?xml version=\"1.0\" encoding=\"UTF-8\"?><Types xmlns=\"http://schemas"
                        + ".openxmlformats.org/package/2006/content-types\"><Default Extension=\"rels\" ContentType="
                        + "\"application/vnd.openxmlformats-package.relationships+xml\"/><Default Extension=\"xml\" "
                        + "ContentType=\"application/xml\"/><Override PartName=\"/word/document.xml\" ContentType="
                        + "\"application/vnd.openxmlformats-officedocument.wordprocessingml.document.main+xml\"/>"
                        + "</Types>"),
                "_rels/.rels", utf8("<?xml version=\"1.0\" encoding=\"UTF-8\"?><Relationships xmlns=\"http://schemas"
                        + ".openxmlformats.org/package/2006/relationships\"><Relationship Id=\"rId1\" Type=\"http://"
                        + "schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument\" Target="
                        + "\"word/document.xml\"/></Relationships>"),
                "word/document.xml", utf8("<?xml version=\"1.0\" encoding=\"UTF-8\"?><w:document xmlns:w=\"http://"
                        + "schemas.openxmlformats.org/wordprocessingml/2006/main\"><w:body><w:p><w:r><w:t>Mn 1.215 %"
                        + "</w:t></w:r></w:p></w:body></w:document>")));
    }

    private static byte[] paddedSheet(byte[] sheet, int padding) {
        String xml = new String(sheet, StandardCharsets.UTF_8);
        return utf8(xml.replace("</sheetData>", "</sheetData>" + " ".repeat(padding)));
    }

    private static byte[] paddedSharedStrings(byte[] sharedStrings, int padding) {
        String xml = new String(sharedStrings, StandardCharsets.UTF_8);
        return utf8(xml.replaceFirst("<t>measurand</t>", "<t>measurand" + "A".repeat(padding) + "</t>"));
    }

    private static byte[] withDoctype(byte[] xml, String prolog, String find, String replace) {
        String text = new String(xml, StandardCharsets.UTF_8);
        if (text.startsWith("<?xml")) {
            text = text.substring(text.indexOf("?>") + 2).stripLeading();
        }
        if (find != null) {
            text = text.replaceFirst(java.util.regex.Pattern.quote(find), replace);
        }
        return utf8(prolog + text);
    }

    private static String withDimension(String sheetXml, String reference) {
        if (sheetXml.contains("<dimension ")) {
            return sheetXml.replaceFirst("<dimension ref=\"[^\"]*\"/>", "<dimension ref=\"" + reference + "\"/>");
        }
        return sheetXml.replaceFirst("<sheetViews>|<sheetFormatPr|<sheetData", "<dimension ref=\"" + reference
                + "\"/>$0");
    }

    // ---------------------------------------------------------------- zip helpers

    static byte[] entry(byte[] zip, String name) throws IOException {
        try (ZipInputStream in = new ZipInputStream(new ByteArrayInputStream(zip))) {
            ZipEntry entry;
            while ((entry = in.getNextEntry()) != null) {
                if (entry.getName().equals(name)) {
                    return in.readAllBytes();
                }
            }
        }
        throw new IllegalArgumentException("no entry " + name);
    }

    /** Rewrites a zip with some entries replaced and others added, with fixed timestamps. */
    static byte[] rezip(byte[] zip, Map<String, byte[]> replacements, Map<String, byte[]> additions)
            throws IOException {
        Map<String, byte[]> entries = new LinkedHashMap<>();
        try (ZipInputStream in = new ZipInputStream(new ByteArrayInputStream(zip))) {
            ZipEntry entry;
            while ((entry = in.getNextEntry()) != null) {
                entries.put(entry.getName(), in.readAllBytes());
            }
        }
        for (var replacement : replacements.entrySet()) {
            if (!entries.containsKey(replacement.getKey())) {
                throw new IllegalArgumentException("no entry " + replacement.getKey());
            }
            entries.put(replacement.getKey(), replacement.getValue());
        }
        entries.putAll(new java.util.TreeMap<>(additions));
        return zip(entries);
    }

    static byte[] zip(Map<String, byte[]> entries) throws IOException {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        try (ZipOutputStream out = new ZipOutputStream(bytes)) {
            out.setLevel(9);
            for (var entry : new java.util.TreeMap<>(entries).entrySet()) {
                ZipEntry zipEntry = new ZipEntry(entry.getKey());
                zipEntry.setTime(FIXED_TIME);
                out.putNextEntry(zipEntry);
                out.write(entry.getValue());
                out.closeEntry();
            }
        }
        return bytes.toByteArray();
    }

    private static byte[] fixedTimes(byte[] zip) throws IOException {
        Map<String, byte[]> entries = new LinkedHashMap<>();
        try (ZipInputStream in = new ZipInputStream(new ByteArrayInputStream(zip))) {
            ZipEntry entry;
            while ((entry = in.getNextEntry()) != null) {
                entries.put(entry.getName(), in.readAllBytes());
            }
        }
        return zip(entries);
    }

    /** Writes the same entry twice (ZipOutputStream refuses, so the second copy is renamed and patched back). */
    private static byte[] duplicateEntry(byte[] zip, String name) throws IOException {
        String twin = name.substring(0, name.length() - 1) + "X";
        byte[] withTwin = rezip(zip, Map.of(), Map.of(twin, entry(zip, name)));
        byte[] from = twin.getBytes(StandardCharsets.UTF_8);
        byte[] to = name.getBytes(StandardCharsets.UTF_8);
        for (int i = 0; i <= withTwin.length - from.length; i++) {
            if (Arrays.equals(withTwin, i, i + from.length, from, 0, from.length)) {
                System.arraycopy(to, 0, withTwin, i, to.length);
            }
        }
        return withTwin;
    }

    private static int endRecord(byte[] zip) {
        for (int i = zip.length - 22; i >= 0; i--) {
            if (zip[i] == 'P' && zip[i + 1] == 'K' && zip[i + 2] == 5 && zip[i + 3] == 6) {
                return i;
            }
        }
        throw new IllegalArgumentException("no end record");
    }

    private static int centralDirectoryEntry(byte[] zip, String name) {
        int end = endRecord(zip);
        int position = int32(zip, end + 16);
        int count = int16(zip, end + 10);
        for (int i = 0; i < count; i++) {
            int nameLength = int16(zip, position + 28);
            String entryName = new String(zip, position + 46, nameLength, StandardCharsets.UTF_8);
            if (entryName.equals(name)) {
                return position;
            }
            position += 46 + nameLength + int16(zip, position + 30) + int16(zip, position + 32);
        }
        throw new IllegalArgumentException("no central directory entry " + name);
    }

    private static byte[] setCentralDirectoryFlag(byte[] zip, String name, int flag) {
        byte[] copy = zip.clone();
        int position = centralDirectoryEntry(copy, name);
        putInt16(copy, position + 8, int16(copy, position + 8) | flag);
        return copy;
    }

    private static byte[] setCentralDirectoryUncompressedSize(byte[] zip, String name, int size) {
        byte[] copy = zip.clone();
        putInt32(copy, centralDirectoryEntry(copy, name) + 24, size);
        return copy;
    }

    private static byte[] setEndRecordDirectoryOffset(byte[] zip, int offset) {
        byte[] copy = zip.clone();
        putInt32(copy, endRecord(copy) + 16, offset);
        return copy;
    }

    private static byte[] setEndRecordEntryCount(byte[] zip, int count) {
        byte[] copy = zip.clone();
        int end = endRecord(copy);
        putInt16(copy, end + 8, count);
        putInt16(copy, end + 10, count);
        return copy;
    }

    /** Flips bytes in the middle of an entry's compressed data, so inflating fails or the CRC does not match. */
    private static byte[] damageEntryData(byte[] zip, String name) {
        byte[] copy = zip.clone();
        int central = centralDirectoryEntry(copy, name);
        int local = int32(copy, central + 42);
        int compressed = int32(copy, central + 20);
        int dataStart = local + 30 + int16(copy, local + 26) + int16(copy, local + 28);
        for (int i = dataStart + compressed / 3; i < dataStart + compressed / 3 + 16; i++) {
            copy[i] = (byte) ~copy[i];
        }
        return copy;
    }

    private static int int16(byte[] bytes, int offset) {
        return (bytes[offset] & 0xff) | (bytes[offset + 1] & 0xff) << 8;
    }

    private static int int32(byte[] bytes, int offset) {
        return int16(bytes, offset) | int16(bytes, offset + 2) << 16;
    }

    private static void putInt16(byte[] bytes, int offset, int value) {
        bytes[offset] = (byte) value;
        bytes[offset + 1] = (byte) (value >>> 8);
    }

    private static void putInt32(byte[] bytes, int offset, int value) {
        putInt16(bytes, offset, value);
        putInt16(bytes, offset + 2, value >>> 16);
    }

    // ---------------------------------------------------------------- bytes

    private void add(String file, byte[] content, String key, Integer row, String column) {
        if (cases.stream().anyMatch(c -> c.file().equals(file))) {
            throw new IllegalStateException("duplicate case " + file);
        }
        cases.add(new Case(file, content, key, row, column));
    }

    static byte[] utf8(String text) {
        return text.getBytes(StandardCharsets.UTF_8);
    }

    static byte[] bytes(int... values) {
        byte[] bytes = new byte[values.length];
        for (int i = 0; i < values.length; i++) {
            bytes[i] = (byte) values[i];
        }
        return bytes;
    }

    static byte[] concat(byte[]... parts) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        for (byte[] part : parts) {
            out.writeBytes(part);
        }
        return out.toByteArray();
    }
}
