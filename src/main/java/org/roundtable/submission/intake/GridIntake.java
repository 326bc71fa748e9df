package org.roundtable.submission.intake;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;

/**
 * Reads a CSV or XLSX file into a grid of cell texts — a header row and data rows — with the file rules of the
 * result intake ({@link CsvUploadReader}, {@link XlsxUploadReader}: size, encoding, delimiter, quotes, workbook
 * safety, {@link Limits}). For other features' own tabular uploads (sample qualification data): they check the
 * columns and cells themselves and so need not parse files of their own.
 *
 * <p>A CSV row split by the other delimiter than the header's is a problem like in the result intake; a rejected
 * file answers every problem with its row, as a spreadsheet numbers rows.
 */
public final class GridIntake {

    /** One data row: its spreadsheet row number and its cells in file order. */
    public record GridRow(int row, List<String> cells) {
        public GridRow {
            cells = List.copyOf(cells);
        }
    }

    /** What was read: the header row number and cells, the data rows, and how the file was read. */
    public sealed interface Outcome permits Read, Rejected {
        Detection detection();
    }

    /** The file could be read. */
    public record Read(int headerRow, List<String> header, List<GridRow> rows, Detection detection) implements Outcome {
        public Read {
            header = List.copyOf(header);
            rows = List.copyOf(rows);
        }
    }

    /** The file cannot be read; nothing of it may be used. */
    public record Rejected(List<IntakeProblem> problems, Detection detection) implements Outcome {
        public Rejected {
            problems = List.copyOf(problems);
        }
    }

    private final Limits limits;

    public GridIntake(Limits limits) {
        this.limits = Objects.requireNonNull(limits, "limits");
    }

    /** Reads text typed or pasted into a form as CSV (the same rules as a CSV file in UTF-8). */
    public Outcome readText(String text) {
        return read(text == null ? new byte[0] : text.getBytes(StandardCharsets.UTF_8), UploadFormat.CSV);
    }

    /** Reads a file held in memory; {@code format} is CSV or XLSX. */
    public Outcome read(byte[] content, UploadFormat format) {
        if (format != UploadFormat.CSV && format != UploadFormat.XLSX) {
            throw new IllegalArgumentException("a grid is read from CSV or XLSX, not " + format);
        }
        Detection detection = Detection.of(format);
        if (content.length > limits.maxFileBytes()) {
            return new Rejected(List.of(IntakeProblem.ofFile(IntakeKey.FILE_TOO_LARGE,
                    "The file is larger than " + limits.maxFileBytes() + " bytes.")), detection);
        }
        List<IntakeProblem> problems = new ArrayList<>();
        try {
            Table table;
            if (format == UploadFormat.CSV) {
                CsvUploadReader reader = new CsvUploadReader(limits);
                try {
                    table = reader.read(content, problems);
                } finally {
                    detection = reader.detection();
                }
            } else {
                XlsxUploadReader reader = new XlsxUploadReader(limits);
                try {
                    table = reader.read(content);
                } finally {
                    detection = reader.detection();
                }
            }
            if (!problems.isEmpty()) {
                return new Rejected(problems, detection);
            }
            if (table.header() == null) {
                return new Rejected(List.of(IntakeProblem.ofFile(IntakeKey.FILE_EMPTY, "The file contains no rows.")),
                        detection);
            }
            List<GridRow> rows = new ArrayList<>();
            for (Table.Row row : table.rows()) {
                List<String> cells = new ArrayList<>();
                for (String cell : row.cells()) {
                    cells.add(cell == null ? "" : Texts.trimSpaces(cell));
                }
                rows.add(new GridRow(row.row(), cells));
            }
            List<String> header = table.header().stream().map(h -> h == null ? "" : Texts.trimSpaces(h)).toList();
            return new Read(table.headerRow(), header, rows, detection);
        } catch (UploadRejectedException e) {
            return new Rejected(e.problems(), detection);
        } catch (RuntimeException e) {
            return new Rejected(List.of(IntakeProblem.ofFile(IntakeKey.FILE_UNREADABLE, "The file could not be read.")),
                    detection);
        }
    }
}
