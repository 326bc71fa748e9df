package org.roundtable.submission.intake;

import java.util.List;
import java.util.Map;

/**
 * One result row before validation: the cell texts by column, as read from CSV, XLSX or JSON.
 *
 * @param row             spreadsheet row number (JSON: index + 1)
 * @param cells           cell text by column; a missing key means the column is absent or the cell empty
 * @param replicateValues the replicate values, already split (CSV/XLSX: at {@code |}; JSON: the array), or {@code null}
 */
record RawRow(int row, Map<UploadColumn, String> cells, List<String> replicateValues) {
}
