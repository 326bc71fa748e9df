package org.roundtable.submission.intake;

import java.io.IOException;
import java.io.StringReader;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.CharBuffer;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CoderResult;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;

/**
 * Reads a CSV upload into a {@link Table}.
 *
 * <p>Checks, in this order; each of the file-level ones ends the reading:
 * <ol>
 *   <li>empty file → {@code file.empty}; binary content (executable, PDF, zip, OLE2, image …) →
 *       {@code file.type-mismatch};</li>
 *   <li>encoding: a UTF-8 byte order mark is skipped and reported; a UTF-16/UTF-32 byte order mark, or UTF-16 text
 *       without one (NUL in every other byte) → {@code file.not-utf8}; any other NUL byte → {@code csv.nul-byte};
 *       bytes that are not strict UTF-8 ({@link CodingErrorAction#REPORT}, e.g. Latin-1 text) →
 *       {@code file.not-utf8} with the row of the first bad byte;</li>
 *   <li>a physical line longer than {@link Limits#maxLineChars()} → {@code csv.line-too-long};</li>
 *   <li>delimiter detection on the header line (the first non-blank line), outside quotes: {@code ,} or {@code ;};
 *       both → {@code csv.mixed-delimiters}; neither but tab or {@code |} → {@code csv.unsupported-delimiter};</li>
 *   <li>quotes (RFC 4180, {@code ""} escapes a quote): a quoted field never closed → {@code csv.unbalanced-quote}
 *       at the row where it opens; text between a closing quote and the next delimiter →
 *       {@code csv.text-after-closing-quote};</li>
 *   <li>more than {@link Limits#maxDataRows()} data rows → {@code file.too-many-rows}.</li>
 * </ol>
 * A data row whose cell count differs from the header's and that contains the other delimiter is
 * {@code csv.mixed-delimiters}; the row checks of {@link Table} and {@link ResultValidator} follow. Line endings LF,
 * CRLF and CR are accepted; blank lines (also {@code ,,,}) are skipped. Rows are physical line numbers of the start
 * of each record, so they match a text editor and a spreadsheet.
 */
final class CsvUploadReader {

    private final Limits limits;
    private Detection detection = Detection.of(UploadFormat.CSV);

    CsvUploadReader(Limits limits) {
        this.limits = limits;
    }

    Detection detection() {
        return detection;
    }

    /** Reads the table; {@code problems} receives row-level problems found while reading. */
    Table read(byte[] bytes, List<IntakeProblem> problems) throws UploadRejectedException {
        if (bytes.length == 0) {
            throw reject(IntakeKey.FILE_EMPTY, "The file is empty.");
        }
        String binaryType = FileSignatures.binaryTypeName(bytes);
        if (binaryType != null) {
            throw reject(IntakeKey.FILE_TYPE_MISMATCH, "The file was sent as CSV but is " + binaryType + ".");
        }
        int start = 0;
        boolean bom = false;
        if (FileSignatures.startsWith(bytes, new byte[] {(byte) 0xEF, (byte) 0xBB, (byte) 0xBF})) {
            start = 3;
            bom = true;
        } else if (FileSignatures.startsWith(bytes, new byte[] {(byte) 0xFE, (byte) 0xFF})
                || FileSignatures.startsWith(bytes, new byte[] {(byte) 0xFF, (byte) 0xFE})
                || FileSignatures.startsWith(bytes, new byte[] {0, 0, (byte) 0xFE, (byte) 0xFF})) {
            throw reject(IntakeKey.FILE_NOT_UTF8, "The file is UTF-16 or UTF-32 encoded (it starts with a byte order "
                    + "mark for that encoding). Save it as 'CSV UTF-8' and upload it again.");
        }
        detection = detection.withEncoding(null, bom);
        if (looksLikeUtf16(bytes, start)) {
            throw reject(IntakeKey.FILE_NOT_UTF8, "The file looks like UTF-16 text without a byte order mark. "
                    + "Save it as 'CSV UTF-8' and upload it again.");
        }
        for (int i = start; i < bytes.length; i++) {
            if (bytes[i] == 0) {
                throw new UploadRejectedException(IntakeProblem.of(lineAtByte(bytes, i), null, null,
                        IntakeKey.CSV_NUL_BYTE, "The file contains a NUL byte, which never occurs in a text file."));
            }
        }
        String text = decodeStrictUtf8(bytes, start);
        detection = detection.withEncoding("UTF-8", bom);
        if (text.isBlank()) {
            throw reject(IntakeKey.FILE_EMPTY, "The file contains no rows.");
        }
        checkLineLengths(text);
        int[] lineStarts = lineStarts(text);
        int headerStart = firstNonBlankLineStart(text);
        char delimiter = detectDelimiter(text, headerStart, lineOf(lineStarts, headerStart));
        detection = detection.withDelimiter(delimiter);
        checkQuotes(text, headerStart, lineOf(lineStarts, headerStart), delimiter);
        return parse(text, lineStarts, delimiter, problems);
    }

    private Table parse(String text, int[] lineStarts, char delimiter, List<IntakeProblem> problems)
            throws UploadRejectedException {
        CSVFormat format = CSVFormat.RFC4180.builder()
                .setDelimiter(delimiter)
                .setIgnoreEmptyLines(true)
                .get();
        List<String> header = null;
        int headerRow = 0;
        List<Table.Row> rows = new ArrayList<>();
        try (CSVParser parser = CSVParser.builder().setReader(new StringReader(text)).setFormat(format).get()) {
            for (CSVRecord record : parser) {
                List<String> cells = record.toList();
                if (Table.isBlank(cells)) {
                    continue;
                }
                int row = lineOf(lineStarts, skipLineBreaks(text, (int) record.getCharacterPosition()));
                if (header == null) {
                    header = cells;
                    headerRow = row;
                    continue;
                }
                if (rows.size() >= limits.maxDataRows()) {
                    throw new UploadRejectedException(IntakeProblem.of(row, null, null, IntakeKey.FILE_TOO_MANY_ROWS,
                            "The file has more than " + limits.maxDataRows() + " data rows."));
                }
                if (cells.size() != header.size() && containsOtherDelimiter(cells, delimiter)) {
                    problems.add(IntakeProblem.of(row, null, String.join(String.valueOf(delimiter), cells),
                            IntakeKey.CSV_MIXED_DELIMITERS, "This row is separated by '" + otherDelimiter(delimiter)
                                    + "' but the header by '" + delimiter + "'."));
                    continue;
                }
                rows.add(new Table.Row(row, cells));
            }
        } catch (IOException | UncheckedIOException | IllegalStateException e) {
            // the quote scan above catches the known cases; anything else is still a malformed CSV, never a crash
            throw reject(IntakeKey.CSV_UNBALANCED_QUOTE, "The CSV structure could not be read: quotes or line breaks "
                    + "are not balanced.");
        }
        return new Table(headerRow, header, rows);
    }

    private String decodeStrictUtf8(byte[] bytes, int start) throws UploadRejectedException {
        CharsetDecoder decoder = StandardCharsets.UTF_8.newDecoder()
                .onMalformedInput(CodingErrorAction.REPORT)
                .onUnmappableCharacter(CodingErrorAction.REPORT);
        ByteBuffer in = ByteBuffer.wrap(bytes, start, bytes.length - start);
        CharBuffer out = CharBuffer.allocate(bytes.length - start + 1);
        CoderResult result = decoder.decode(in, out, true);
        if (result.isError()) {
            int position = in.position();
            throw new UploadRejectedException(IntakeProblem.of(lineAtByte(bytes, position), null,
                    String.format("byte 0x%02X at offset %d", bytes[position] & 0xff, position),
                    IntakeKey.FILE_NOT_UTF8, "The file is not valid UTF-8 (perhaps Latin-1 or Windows-1252). "
                            + "Save it as 'CSV UTF-8' and upload it again."));
        }
        result = decoder.flush(out);
        if (result.isError()) {
            throw reject(IntakeKey.FILE_NOT_UTF8, "The file ends inside a UTF-8 character.");
        }
        out.flip();
        return out.toString();
    }

    private void checkLineLengths(String text) throws UploadRejectedException {
        int line = 1;
        int length = 0;
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            if (c == '\n' || c == '\r') {
                if (c == '\r' && i + 1 < text.length() && text.charAt(i + 1) == '\n') {
                    i++;
                }
                line++;
                length = 0;
            } else if (++length > limits.maxLineChars()) {
                throw new UploadRejectedException(IntakeProblem.of(line, null, null, IntakeKey.CSV_LINE_TOO_LONG,
                        "Line " + line + " is longer than " + limits.maxLineChars() + " characters."));
            }
        }
    }

    private char detectDelimiter(String text, int headerStart, int headerRow) throws UploadRejectedException {
        int commas = 0;
        int semicolons = 0;
        boolean tabOrBar = false;
        boolean quoted = false;
        for (int i = headerStart; i < text.length(); i++) {
            char c = text.charAt(i);
            if (c == '"') {
                quoted = !quoted;
            } else if (!quoted && (c == '\n' || c == '\r')) {
                break;
            } else if (!quoted && c == ',') {
                commas++;
            } else if (!quoted && c == ';') {
                semicolons++;
            } else if (!quoted && (c == '\t' || c == '|')) {
                tabOrBar = true;
            }
        }
        if (commas > 0 && semicolons > 0) {
            throw new UploadRejectedException(IntakeProblem.of(headerRow, null, null, IntakeKey.CSV_MIXED_DELIMITERS,
                    "The header row uses both ',' and ';' as delimiters; use one of them throughout."));
        }
        if (commas == 0 && semicolons == 0 && tabOrBar) {
            throw new UploadRejectedException(IntakeProblem.of(headerRow, null, null,
                    IntakeKey.CSV_UNSUPPORTED_DELIMITER, "The columns must be separated by ',' or ';' (tabs and "
                            + "'|' are not accepted)."));
        }
        return semicolons > 0 ? ';' : ',';
    }

    /** Finds a quoted field that never closes, or text after a closing quote, before commons-csv reads the file. */
    private void checkQuotes(String text, int start, int startLine, char delimiter) throws UploadRejectedException {
        int line = startLine;
        boolean fieldStart = true;
        boolean quoted = false;
        int openLine = 0;
        for (int i = start; i < text.length(); i++) {
            char c = text.charAt(i);
            if (quoted) {
                if (c == '"') {
                    if (i + 1 < text.length() && text.charAt(i + 1) == '"') {
                        i++;
                        continue;
                    }
                    quoted = false;
                    int next = i + 1;
                    if (next < text.length()) {
                        char after = text.charAt(next);
                        if (after != delimiter && after != '\n' && after != '\r') {
                            throw new UploadRejectedException(IntakeProblem.of(line, null, null,
                                    IntakeKey.CSV_TEXT_AFTER_CLOSING_QUOTE, "On row " + line + " text follows the "
                                            + "closing quote of a field; put the whole field in quotes and double "
                                            + "any quote inside it."));
                        }
                    }
                } else if (isLineBreak(text, i)) {
                    line++;
                }
                continue;
            }
            if (c == '"' && fieldStart) {
                quoted = true;
                openLine = line;
                fieldStart = false;
            } else if (c == delimiter) {
                fieldStart = true;
            } else if (isLineBreak(text, i)) {
                line++;
                fieldStart = true;
            } else if (c != '\r' && c != '\n') {
                fieldStart = false;
            }
        }
        if (quoted) {
            throw new UploadRejectedException(IntakeProblem.of(openLine, null, null, IntakeKey.CSV_UNBALANCED_QUOTE,
                    "A quoted field opened on row " + openLine + " is never closed."));
        }
    }

    /** A line break ends at i: LF, or CR not followed by LF. */
    private static boolean isLineBreak(String text, int i) {
        char c = text.charAt(i);
        return c == '\n' || (c == '\r' && (i + 1 >= text.length() || text.charAt(i + 1) != '\n'));
    }

    private static boolean containsOtherDelimiter(List<String> cells, char delimiter) {
        char other = otherDelimiter(delimiter);
        for (String cell : cells) {
            if (cell.indexOf(other) < 0) {
                continue;
            }
            // in a semicolon file a comma may be a decimal comma
            if (delimiter == ';' && Texts.trimSpaces(cell).matches("<? *[0-9]*,[0-9]+")) {
                continue;
            }
            return true;
        }
        return false;
    }

    private static char otherDelimiter(char delimiter) {
        return delimiter == ',' ? ';' : ',';
    }

    private static boolean looksLikeUtf16(byte[] bytes, int start) {
        int sample = Math.min(bytes.length - start, 64);
        if (sample < 4) {
            return false;
        }
        int evenNuls = 0;
        int oddNuls = 0;
        for (int i = 0; i < sample; i++) {
            if (bytes[start + i] == 0) {
                if (i % 2 == 0) {
                    evenNuls++;
                } else {
                    oddNuls++;
                }
            }
        }
        return Math.max(evenNuls, oddNuls) * 4 >= sample / 2 * 3 && Math.min(evenNuls, oddNuls) * 4 < sample / 2;
    }

    private static int lineAtByte(byte[] bytes, int position) {
        int line = 1;
        for (int i = 0; i < position; i++) {
            if (bytes[i] == '\n' || (bytes[i] == '\r' && (i + 1 >= bytes.length || bytes[i + 1] != '\n'))) {
                line++;
            }
        }
        return line;
    }

    private static int firstNonBlankLineStart(String text) {
        int lineStart = 0;
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            if (c == '\n' || c == '\r') {
                lineStart = i + 1;
            } else if (c != ' ' && c != '\t') {
                return lineStart;
            }
        }
        return lineStart;
    }

    private static int skipLineBreaks(String text, int position) {
        int i = position;
        while (i < text.length() && (text.charAt(i) == '\n' || text.charAt(i) == '\r')) {
            i++;
        }
        return i;
    }

    /** Start offsets of the physical lines (LF, CRLF or CR). */
    private static int[] lineStarts(String text) {
        int[] starts = new int[1024];
        int count = 1;
        for (int i = 0; i < text.length(); i++) {
            if (isLineBreak(text, i)) {
                if (count == starts.length) {
                    starts = Arrays.copyOf(starts, starts.length * 2);
                }
                starts[count++] = i + 1;
            }
        }
        return Arrays.copyOf(starts, count);
    }

    private static int lineOf(int[] lineStarts, int position) {
        int low = 0;
        int high = lineStarts.length - 1;
        while (low < high) {
            int middle = (low + high + 1) >>> 1;
            if (lineStarts[middle] <= position) {
                low = middle;
            } else {
                high = middle - 1;
            }
        }
        return low + 1;
    }

    private static UploadRejectedException reject(IntakeKey key, String message) {
        return new UploadRejectedException(IntakeProblem.ofFile(key, message));
    }
}
