package org.roundtable.submission.intake;

import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.math.BigDecimal;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.TreeMap;
import javax.xml.XMLConstants;
import javax.xml.parsers.ParserConfigurationException;
import javax.xml.parsers.SAXParser;
import javax.xml.parsers.SAXParserFactory;
import org.apache.poi.ooxml.POIXMLException;
import org.apache.poi.openxml4j.exceptions.NotOfficeXmlFileException;
import org.apache.poi.openxml4j.exceptions.OpenXML4JException;
import org.apache.poi.openxml4j.opc.OPCPackage;
import org.apache.poi.openxml4j.opc.PackageRelationshipTypes;
import org.apache.poi.openxml4j.util.ZipSecureFile;
import org.apache.poi.ss.usermodel.DataFormatter;
import org.apache.poi.ss.util.CellReference;
import org.apache.poi.xssf.eventusermodel.XSSFReader;
import org.apache.poi.xssf.model.StylesTable;
import org.apache.poi.xssf.usermodel.XSSFCellStyle;
import org.xml.sax.Attributes;
import org.xml.sax.SAXException;
import org.xml.sax.SAXParseException;
import org.xml.sax.helpers.DefaultHandler;

/**
 * Reads the first sheet of an XLSX upload into a {@link Table}, streaming (SAX), with the same header and row rules as
 * CSV.
 *
 * <p>Container checks, in order; each ends the reading:
 * <ol>
 *   <li>empty → {@code file.empty}; an OLE2 compound file ({@code D0 CF 11 E0 A1 B1 1A E1}): with an
 *       {@code EncryptionInfo} stream → {@code xlsx.encrypted}, else (legacy .xls) → {@code xlsx.legacy-format};
 *       anything that is not a zip (executable, PDF, text …) → {@code file.type-mismatch};</li>
 *   <li>{@link ZipInspection} (entry count, sizes, inflate ratio, names, macros, external links, DOCTYPE) before POI
 *       sees the bytes; a zip without {@code [Content_Types].xml} (a plain zip, an OpenDocument file) →
 *       {@code xlsx.not-a-workbook};</li>
 *   <li>POI's own guard ({@link ZipSecureFile}): the process-wide minimum inflate ratio, maximum entry size and
 *       maximum file count are tightened to {@link Limits} if they are looser (never loosened; the ratio is never
 *       −1); a zip that is no OOXML package → {@code xlsx.not-a-workbook}; other failures → {@code xlsx.corrupt}.</li>
 * </ol>
 * Sheet and shared strings are parsed with our own SAX handlers on a parser that refuses DOCTYPE declarations and
 * external entities; the workbook structure and styles are read by {@link XSSFReader} (POI's hardened XML settings).
 *
 * <p>Cell text: shared and inline strings as written; a formula cell becomes {@code "=" + formula}, so it is refused
 * as {@code value.formula-prefix} (paste values, not formulas); booleans {@code TRUE}/{@code FALSE} and error cells
 * ({@code #N/A}) as text; a number with the General format as the plain decimal of the stored double (0.12 → "0.12",
 * trailing zeros are not stored by a spreadsheet), with another number format as the sheet displays it
 * ({@link DataFormatter}, root locale). Keep trailing zeros by formatting the cells with the wanted decimals or by
 * entering text. A declared {@code <dimension>} beyond 1 048 576 rows or column XFD → {@code xlsx.invalid-dimension}.
 * The header is the first non-blank row; rows are the sheet's row numbers.
 */
final class XlsxUploadReader {

    private static final int EXCEL_MAX_ROWS = 1_048_576;
    private static final int EXCEL_MAX_COLUMNS = 16_384;

    private final Limits limits;
    private Detection detection = Detection.of(UploadFormat.XLSX);

    XlsxUploadReader(Limits limits) {
        this.limits = limits;
    }

    Detection detection() {
        return detection;
    }

    Table read(byte[] bytes) throws UploadRejectedException {
        if (bytes.length == 0) {
            throw reject(IntakeKey.FILE_EMPTY, "The file is empty.");
        }
        if (FileSignatures.isOle2(bytes)) {
            if (FileSignatures.isEncryptedOoxml(bytes)) {
                throw reject(IntakeKey.XLSX_ENCRYPTED, "The workbook is encrypted or password-protected; remove the "
                        + "password and upload it again.");
            }
            throw reject(IntakeKey.XLSX_LEGACY_FORMAT, "This is an old-format .xls file (or another OLE2 file); save "
                    + "it as an .xlsx workbook.");
        }
        if (!FileSignatures.isZip(bytes)) {
            String binaryType = FileSignatures.binaryTypeName(bytes);
            throw reject(IntakeKey.FILE_TYPE_MISMATCH, "The file was sent as XLSX but is "
                    + (binaryType != null ? binaryType : "not a workbook (an XLSX file is a zip archive)") + ".");
        }
        if (!ZipInspection.inspect(bytes, limits).contains("[Content_Types].xml")) {
            throw reject(IntakeKey.XLSX_NOT_A_WORKBOOK, "The zip file is not an Excel workbook (it has no "
                    + "[Content_Types].xml part).");
        }
        detection = detection.withEncoding("OOXML", false);
        tightenPoiGuards(limits);
        OPCPackage workbook = null;
        try {
            workbook = OPCPackage.open(new ByteArrayInputStream(bytes));
            requireSpreadsheet(workbook);
            XSSFReader reader = new XSSFReader(workbook);
            List<String> sharedStrings = readSharedStrings(reader);
            StylesTable styles = reader.getStylesTable();
            XSSFReader.SheetIterator sheets = reader.getSheetIterator();
            if (!sheets.hasNext()) {
                throw reject(IntakeKey.FILE_EMPTY, "The workbook has no sheet.");
            }
            try (InputStream sheet = sheets.next()) {
                SheetHandler handler = new SheetHandler(sharedStrings, styles);
                parse(sheet, handler);
                if (handler.header == null) {
                    throw reject(IntakeKey.FILE_EMPTY, "The first sheet of the workbook is empty.");
                }
                return new Table(handler.headerRow, handler.header, handler.rows);
            }
        } catch (NotOfficeXmlFileException e) {
            throw reject(IntakeKey.XLSX_NOT_A_WORKBOOK, "The zip file is not an Excel workbook.");
        } catch (IOException e) {
            if (String.valueOf(e.getMessage()).toLowerCase(Locale.ROOT).contains("zip bomb")) {
                throw reject(IntakeKey.XLSX_ZIP_BOMB, "The workbook unpacks to far more data than its size suggests.");
            }
            throw reject(IntakeKey.XLSX_CORRUPT, "The workbook is damaged and cannot be read.");
        } catch (OpenXML4JException | POIXMLException | IllegalArgumentException | IllegalStateException
                 | ClassCastException | IndexOutOfBoundsException e) {
            throw reject(IntakeKey.XLSX_CORRUPT, "The workbook is damaged and cannot be read.");
        } finally {
            if (workbook != null) {
                workbook.revert();
            }
        }
    }

    /** A Word or PowerPoint file renamed to .xlsx is a valid OOXML package but no workbook. */
    private static void requireSpreadsheet(OPCPackage workbook) throws UploadRejectedException {
        var documents = workbook.getPartsByRelationshipType(PackageRelationshipTypes.CORE_DOCUMENT);
        if (documents.isEmpty() || !documents.get(0).getContentType().contains("spreadsheetml")) {
            throw reject(IntakeKey.XLSX_NOT_A_WORKBOOK, "The file is an Office document but not an Excel workbook.");
        }
    }

    private static synchronized void tightenPoiGuards(Limits limits) {
        if (ZipSecureFile.getMinInflateRatio() < limits.minInflateRatio()) {
            ZipSecureFile.setMinInflateRatio(limits.minInflateRatio());
        }
        if (ZipSecureFile.getMaxEntrySize() > limits.maxUncompressedBytes()) {
            ZipSecureFile.setMaxEntrySize(limits.maxUncompressedBytes());
        }
        if (ZipSecureFile.getMaxFileCount() > limits.maxZipEntries()) {
            ZipSecureFile.setMaxFileCount(limits.maxZipEntries());
        }
    }

    private List<String> readSharedStrings(XSSFReader reader) throws UploadRejectedException, IOException {
        InputStream data;
        try {
            data = reader.getSharedStringsData();
        } catch (IOException | OpenXML4JException | POIXMLException e) {
            return List.of();
        }
        if (data == null) {
            return List.of();
        }
        try (InputStream in = data) {
            SharedStringsHandler handler = new SharedStringsHandler(limits.maxCellChars() + 1);
            parse(in, handler);
            return handler.strings;
        }
    }

    private static void parse(InputStream in, DefaultHandler handler) throws UploadRejectedException, IOException {
        try {
            SAXParser parser = secureParserFactory().newSAXParser();
            parser.parse(in, handler);
        } catch (StopReading stop) {
            throw new UploadRejectedException(stop.problem);
        } catch (SAXParseException e) {
            if (String.valueOf(e.getMessage()).toUpperCase(Locale.ROOT).contains("DOCTYPE")) {
                throw reject(IntakeKey.XLSX_XML_DOCTYPE, "A part of the workbook contains a document type "
                        + "declaration, which workbooks never have.");
            }
            throw reject(IntakeKey.XLSX_CORRUPT, "A part of the workbook is not well-formed XML.");
        } catch (SAXException | ParserConfigurationException e) {
            throw reject(IntakeKey.XLSX_CORRUPT, "A part of the workbook cannot be read.");
        }
    }

    /** A SAX parser factory that refuses DOCTYPE declarations and never loads external entities or DTDs. */
    static SAXParserFactory secureParserFactory() throws ParserConfigurationException, SAXException {
        SAXParserFactory factory = SAXParserFactory.newInstance();
        factory.setNamespaceAware(true);
        factory.setXIncludeAware(false);
        factory.setFeature(XMLConstants.FEATURE_SECURE_PROCESSING, true);
        factory.setFeature("http://apache.org/xml/features/disallow-doctype-decl", true);
        factory.setFeature("http://xml.org/sax/features/external-general-entities", false);
        factory.setFeature("http://xml.org/sax/features/external-parameter-entities", false);
        factory.setFeature("http://apache.org/xml/features/nonvalidating/load-external-dtd", false);
        return factory;
    }

    /** Ends parsing early with a problem (too many rows, impossible dimension, bad string index). */
    private static final class StopReading extends SAXException {
        private static final long serialVersionUID = 1L;
        private final transient IntakeProblem problem;

        StopReading(IntakeProblem problem) {
            super(problem.message());
            this.problem = problem;
        }
    }

    /** Collects the shared strings ({@code <si>} with {@code <t>} directly or in rich-text runs; phonetic runs skipped). */
    private static final class SharedStringsHandler extends DefaultHandler {
        private final int maxChars;
        private final List<String> strings = new ArrayList<>();
        private final StringBuilder current = new StringBuilder();
        private boolean inText;
        private boolean inPhonetic;

        SharedStringsHandler(int maxChars) {
            this.maxChars = maxChars;
        }

        @Override
        public void startElement(String uri, String localName, String qName, Attributes attributes) {
            switch (localName) {
                case "si" -> current.setLength(0);
                case "t" -> inText = !inPhonetic;
                case "rPh" -> inPhonetic = true;
                default -> { }
            }
        }

        @Override
        public void endElement(String uri, String localName, String qName) {
            switch (localName) {
                case "si" -> strings.add(current.toString());
                case "t" -> inText = false;
                case "rPh" -> inPhonetic = false;
                default -> { }
            }
        }

        @Override
        public void characters(char[] ch, int start, int length) {
            if (inText && current.length() < maxChars) {
                current.append(ch, start, Math.min(length, maxChars - current.length()));
            }
        }
    }

    /** Streams the sheet XML into rows of cell texts. */
    private final class SheetHandler extends DefaultHandler {
        private final List<String> sharedStrings;
        private final StylesTable styles;
        private final DataFormatter formatter = new DataFormatter(Locale.ROOT);

        private List<String> header;
        private int headerRow;
        private final List<Table.Row> rows = new ArrayList<>();

        private int rowNumber;
        private TreeMap<Integer, String> cells;
        private int columnIndex;
        private String cellType;
        private int styleIndex;
        private boolean hasFormula;
        private final StringBuilder formula = new StringBuilder();
        private final StringBuilder value = new StringBuilder();
        private final StringBuilder inlineText = new StringBuilder();
        private boolean inValue;
        private boolean inFormula;
        private boolean inInlineText;

        SheetHandler(List<String> sharedStrings, StylesTable styles) {
            this.sharedStrings = sharedStrings;
            this.styles = styles;
        }

        @Override
        public void startElement(String uri, String localName, String qName, Attributes attributes)
                throws SAXException {
            switch (localName) {
                case "dimension" -> checkDimension(attributes.getValue("ref"));
                case "row" -> {
                    String r = attributes.getValue("r");
                    rowNumber = r != null ? parsePositive(r, "row number") : rowNumber + 1;
                    cells = new TreeMap<>();
                    columnIndex = -1;
                }
                case "c" -> {
                    String reference = attributes.getValue("r");
                    columnIndex = reference != null ? new CellReference(reference).getCol() : columnIndex + 1;
                    if (columnIndex < 0) {
                        throw new StopReading(IntakeProblem.ofFile(IntakeKey.XLSX_CORRUPT,
                                "A cell reference of the sheet cannot be read."));
                    }
                    cellType = attributes.getValue("t");
                    String style = attributes.getValue("s");
                    styleIndex = style != null ? parsePositive(style, "style") : -1;
                    hasFormula = false;
                    formula.setLength(0);
                    value.setLength(0);
                    inlineText.setLength(0);
                }
                case "f" -> {
                    hasFormula = true;
                    inFormula = true;
                }
                case "v" -> inValue = true;
                case "t" -> inInlineText = "inlineStr".equals(cellType);
                default -> { }
            }
        }

        @Override
        public void endElement(String uri, String localName, String qName) throws SAXException {
            switch (localName) {
                case "f" -> inFormula = false;
                case "v" -> inValue = false;
                case "t" -> inInlineText = false;
                case "c" -> {
                    if (cells != null) {
                        String text = cellText();
                        if (!text.isEmpty()) {
                            cells.put(Math.min(columnIndex, limits.maxColumns()), text);
                        }
                    }
                }
                case "row" -> endRow();
                default -> { }
            }
        }

        @Override
        public void characters(char[] ch, int start, int length) {
            int room = limits.maxCellChars() + 1;
            if (inValue && value.length() < room) {
                value.append(ch, start, Math.min(length, room - value.length()));
            } else if (inFormula && formula.length() < room) {
                formula.append(ch, start, Math.min(length, room - formula.length()));
            } else if (inInlineText && inlineText.length() < room) {
                inlineText.append(ch, start, Math.min(length, room - inlineText.length()));
            }
        }

        private String cellText() throws SAXException {
            if (hasFormula) {
                return "=" + formula;
            }
            String raw = value.toString();
            if (cellType == null || cellType.equals("n")) {
                return raw.isEmpty() ? "" : number(raw);
            }
            return switch (cellType) {
                case "s" -> {
                    int index = parsePositive(raw.trim(), "shared string index");
                    if (index >= sharedStrings.size()) {
                        throw new StopReading(IntakeProblem.ofFile(IntakeKey.XLSX_CORRUPT,
                                "A cell refers to a text that the workbook does not contain."));
                    }
                    yield sharedStrings.get(index);
                }
                case "inlineStr" -> inlineText.toString();
                case "b" -> "1".equals(raw) ? "TRUE" : "FALSE";
                default -> raw; // "str" without formula, "e" (error such as #N/A), "d" (ISO date text)
            };
        }

        private String number(String raw) throws SAXException {
            double number;
            try {
                number = Double.parseDouble(raw);
            } catch (NumberFormatException e) {
                throw new StopReading(IntakeProblem.ofFile(IntakeKey.XLSX_CORRUPT,
                        "A number cell of the sheet cannot be read."));
            }
            if (!Double.isFinite(number)) {
                return raw;
            }
            int formatIndex = 0;
            String formatString = null;
            if (styles != null && styleIndex >= 0 && styleIndex < styles.getNumCellStyles()) {
                XSSFCellStyle style = styles.getStyleAt(styleIndex);
                formatIndex = style.getDataFormat();
                formatString = style.getDataFormatString();
            }
            if (formatIndex == 0 || formatString == null || formatString.equalsIgnoreCase("General")) {
                return BigDecimal.valueOf(number).stripTrailingZeros().toPlainString();
            }
            return formatter.formatRawCellContents(number, formatIndex, formatString);
        }

        private void endRow() throws SAXException {
            if (cells == null || cells.isEmpty()) {
                cells = null;
                return;
            }
            List<String> list = new ArrayList<>();
            for (var entry : cells.entrySet()) {
                while (list.size() < entry.getKey()) {
                    list.add("");
                }
                list.add(entry.getValue());
            }
            cells = null;
            if (Table.isBlank(list)) {
                return;
            }
            if (header == null) {
                header = list;
                headerRow = rowNumber;
                return;
            }
            if (rows.size() >= limits.maxDataRows()) {
                throw new StopReading(IntakeProblem.of(rowNumber, null, null, IntakeKey.FILE_TOO_MANY_ROWS,
                        "The sheet has more than " + limits.maxDataRows() + " data rows."));
            }
            rows.add(new Table.Row(rowNumber, list));
        }

        private void checkDimension(String reference) throws SAXException {
            if (reference == null) {
                return;
            }
            String last = reference.contains(":") ? reference.substring(reference.indexOf(':') + 1) : reference;
            String letters = last.replaceAll("[^A-Za-z]", "");
            String digits = last.replaceAll("[^0-9]", "");
            boolean tooManyRows = digits.length() > 9 || (!digits.isEmpty() && Long.parseLong(digits) > EXCEL_MAX_ROWS);
            boolean tooManyColumns = letters.length() > 3
                    || (!letters.isEmpty() && CellReference.convertColStringToIndex(letters) >= EXCEL_MAX_COLUMNS);
            if (tooManyRows || tooManyColumns) {
                throw new StopReading(IntakeProblem.ofFile(IntakeKey.XLSX_INVALID_DIMENSION,
                        "The sheet declares the size " + Texts.shown(reference) + ", larger than any workbook can "
                                + "hold."));
            }
        }

        private int parsePositive(String text, String what) throws SAXException {
            try {
                int number = Integer.parseInt(text);
                if (number < 0) {
                    throw new NumberFormatException();
                }
                return number;
            } catch (NumberFormatException e) {
                throw new StopReading(IntakeProblem.ofFile(IntakeKey.XLSX_CORRUPT,
                        "The sheet has an unreadable " + what + "."));
            }
        }
    }

    private static UploadRejectedException reject(IntakeKey key, String message) {
        return new UploadRejectedException(IntakeProblem.ofFile(key, message));
    }
}
