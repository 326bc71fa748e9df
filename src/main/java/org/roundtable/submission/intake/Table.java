package org.roundtable.submission.intake;

import java.util.ArrayList;
import java.util.EnumMap;
import java.util.List;
import java.util.Map;

/**
 * A grid of cell texts read from CSV or XLSX: a header row and data rows. Blank rows (every cell empty or spaces)
 * are left out by the readers.
 *
 * @param headerRow the spreadsheet row number of the header
 * @param header    the header cells in file order
 * @param rows      the data rows in file order
 */
record Table(int headerRow, List<String> header, List<Table.Row> rows) {

    /** One data row: its spreadsheet row number and its cells in file order. */
    record Row(int row, List<String> cells) {
    }

    /**
     * Maps the header to our columns and the rows to {@link RawRow}s.
     *
     * <p>Header rules: names are compared without regard to case (see {@link UploadColumn}); an unknown name is
     * {@code header.unknown-column}, a repeated one {@code header.duplicate-column}, a missing required one
     * {@code header.missing-column}; a column without a name is ignored when all its cells are empty, else
     * {@code header.empty-column-name}. Header problems end the reading.
     *
     * <p>Row rules: non-empty cells beyond the header are {@code row.column-count}; with {@code strictCellCount}
     * (CSV) a row with fewer cells than the header is too. Such a row is not validated further.
     *
     * @throws UploadRejectedException with the header problems
     */
    List<RawRow> toRawRows(UploadRules rules, boolean strictCellCount, List<IntakeProblem> problems)
            throws UploadRejectedException {
        List<IntakeProblem> headerProblems = new ArrayList<>();
        UploadColumn[] columnAt = new UploadColumn[header.size()];
        Map<UploadColumn, Integer> seen = new EnumMap<>(UploadColumn.class);
        for (int index = 0; index < header.size(); index++) {
            String name = Texts.trimSpaces(header.get(index));
            if (name.isEmpty()) {
                if (columnHasData(index)) {
                    headerProblems.add(IntakeProblem.of(headerRow, "column " + (index + 1), null,
                            IntakeKey.HEADER_EMPTY_COLUMN_NAME,
                            "Column " + (index + 1) + " has values but no name in the header row."));
                }
                continue;
            }
            var column = UploadColumn.fromHeader(name);
            if (column.isEmpty()) {
                headerProblems.add(IntakeProblem.of(headerRow, name, name, IntakeKey.HEADER_UNKNOWN_COLUMN,
                        "The column '" + Texts.shown(name) + "' is not part of the upload format."));
                continue;
            }
            if (seen.containsKey(column.get())) {
                headerProblems.add(IntakeProblem.of(headerRow, column.get().headerName(), name,
                        IntakeKey.HEADER_DUPLICATE_COLUMN,
                        "The column '" + column.get().headerName() + "' appears more than once."));
                continue;
            }
            seen.put(column.get(), index);
            columnAt[index] = column.get();
        }
        for (UploadColumn column : UploadColumn.values()) {
            if (column.required(rules) && !seen.containsKey(column)) {
                headerProblems.add(IntakeProblem.of(headerRow, column.headerName(), null,
                        IntakeKey.HEADER_MISSING_COLUMN, "The required column '" + column.headerName()
                                + "' is missing from the header row."));
            }
        }
        if (!headerProblems.isEmpty()) {
            throw new UploadRejectedException(headerProblems);
        }

        List<RawRow> rawRows = new ArrayList<>();
        for (Row row : rows) {
            List<String> cells = row.cells();
            if (cells.size() > header.size()) {
                String extra = firstNonEmpty(cells.subList(header.size(), cells.size()));
                if (extra != null) {
                    problems.add(IntakeProblem.of(row.row(), null, extra, IntakeKey.ROW_COLUMN_COUNT,
                            "The row has " + cells.size() + " cells but the header has " + header.size() + "."));
                    continue;
                }
            } else if (strictCellCount && cells.size() < header.size()) {
                problems.add(IntakeProblem.of(row.row(), null, null, IntakeKey.ROW_COLUMN_COUNT,
                        "The row has " + cells.size() + " cells but the header has " + header.size() + "."));
                continue;
            }
            Map<UploadColumn, String> mapped = new EnumMap<>(UploadColumn.class);
            for (int index = 0; index < Math.min(cells.size(), header.size()); index++) {
                if (columnAt[index] != null && !Texts.trimSpaces(cells.get(index)).isEmpty()) {
                    mapped.put(columnAt[index], cells.get(index));
                }
            }
            String replicateText = mapped.remove(UploadColumn.REPLICATE_VALUES);
            List<String> replicateValues = replicateText == null ? null : List.of(replicateText.split("\\|", -1));
            rawRows.add(new RawRow(row.row(), mapped, replicateValues));
        }
        return rawRows;
    }

    private boolean columnHasData(int index) {
        for (Row row : rows) {
            if (index < row.cells().size() && !Texts.trimSpaces(row.cells().get(index)).isEmpty()) {
                return true;
            }
        }
        return false;
    }

    private static String firstNonEmpty(List<String> cells) {
        for (String cell : cells) {
            if (!Texts.trimSpaces(cell).isEmpty()) {
                return cell;
            }
        }
        return null;
    }

    /** Whether every cell is empty or spaces: such rows are skipped by the readers. */
    static boolean isBlank(List<String> cells) {
        for (String cell : cells) {
            if (!Texts.trimSpaces(cell).isEmpty()) {
                return false;
            }
        }
        return true;
    }
}
