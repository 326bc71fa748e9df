package org.roundtable.scheme.qualification;

import org.roundtable.platform.DomainException;
import org.roundtable.scheme.ChemicalElement;
import org.roundtable.submission.intake.GridIntake;
import org.roundtable.submission.intake.Limits;
import org.roundtable.submission.intake.UploadFormat;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import java.util.regex.Pattern;

/**
 * Reads the qualification uploads, typed or pasted as CSV text or sent as a CSV or XLSX file, through the result
 * intake's readers ({@link GridIntake}). Both have a header line naming these columns in any order:
 * <ul>
 *   <li>homogeneity: {@code item,replicate,measurand,value} — one line per measurement;</li>
 *   <li>stability: {@code item,measurand,value} — one line per measurement at or after the round's end.</li>
 * </ul>
 * The measurand is the element symbol; values are decimal numbers with a point ({@code 18.12}, {@code 1.2e-3}).
 * CSV: UTF-8, comma or semicolon delimiter, quotes as in RFC 4180 (not needed). XLSX: the first sheet. Any error
 * is reported with its line (a workbook's row), column and reason, and nothing of the upload is kept.
 */
public final class QualificationCsv {

    /** At most this many data lines per upload. */
    public static final int MAX_LINES = 50_000;
    private static final List<String> HOMOGENEITY_HEADER = List.of("item", "replicate", "measurand", "value");
    private static final List<String> STABILITY_HEADER = List.of("item", "measurand", "value");
    /** The intake's file rules with more rows (a homogeneity study has items × replicates × measurands lines). */
    private static final GridIntake READER = new GridIntake(new Limits(4 * Limits.MEBIBYTE, MAX_LINES, 4_096, 256, 32,
            200, 20 * Limits.MEBIBYTE, 0.01, 100 * 1024L));
    private static final Pattern ITEM = Pattern.compile("[A-Za-z0-9._-]{1,40}");
    private static final Pattern NUMBER = Pattern.compile("[-+]?[0-9]+(\\.[0-9]+)?([eE][-+]?[0-9]{1,3})?");

    private QualificationCsv() {
    }

    public record HomogeneityRow(int line, String item, int replicate, String element, double value, String valueText) {
    }

    public record StabilityRow(int line, String item, String element, double value, String valueText) {
    }

    /** Homogeneity data typed or pasted as CSV text. */
    public static List<HomogeneityRow> homogeneity(String csv) {
        return homogeneity(lines(csv, null, UploadFormat.CSV, HOMOGENEITY_HEADER));
    }

    /** Homogeneity data from a CSV or XLSX file. */
    public static List<HomogeneityRow> homogeneity(byte[] file, UploadFormat format) {
        return homogeneity(lines(null, file, format, HOMOGENEITY_HEADER));
    }

    /** Stability data typed or pasted as CSV text. */
    public static List<StabilityRow> stability(String csv) {
        return stability(lines(csv, null, UploadFormat.CSV, STABILITY_HEADER));
    }

    /** Stability data from a CSV or XLSX file. */
    public static List<StabilityRow> stability(byte[] file, UploadFormat format) {
        return stability(lines(null, file, format, STABILITY_HEADER));
    }

    private static List<HomogeneityRow> homogeneity(List<Line> lines) {
        List<HomogeneityRow> rows = new ArrayList<>();
        Set<String> seen = new HashSet<>();
        for (Line l : lines) {
            String[] c = l.cells();
            int line = l.line();
            String item = item(c[0], line);
            if (!c[1].matches("[1-9][0-9]{0,2}")) {
                throw error(line, "replicate", "a replicate number of 1 or more is expected, found '" + clip(c[1]) + "'");
            }
            int replicate = Integer.parseInt(c[1]);
            String element = element(c[2], line);
            double value = value(c[3], line);
            if (!seen.add(item + "\u0000" + replicate + "\u0000" + element)) {
                throw error(line, "replicate", "item " + item + " replicate " + replicate + " for " + element + " appears twice");
            }
            rows.add(new HomogeneityRow(line, item, replicate, element, value, c[3]));
        }
        return rows;
    }

    private static List<StabilityRow> stability(List<Line> lines) {
        List<StabilityRow> rows = new ArrayList<>();
        for (Line l : lines) {
            String[] c = l.cells();
            int line = l.line();
            rows.add(new StabilityRow(line, item(c[0], line), element(c[1], line), value(c[2], line), c[2]));
        }
        return rows;
    }

    private record Line(int line, String[] cells) {
    }

    /**
     * Reads text or a file through the intake's readers ({@link GridIntake}: encoding, delimiter, quotes, workbook
     * safety and size limits) and returns the data lines with their cells in the order of {@code header}. The
     * header names its columns in any order, without regard to case.
     */
    private static List<Line> lines(String text, byte[] file, UploadFormat format, List<String> header) {
        if (file == null && (text == null || text.isBlank())) {
            throw new DomainException.BadRequest("The upload is empty. The first line is the header: " + String.join(",", header) + ".");
        }
        GridIntake.Outcome outcome = file == null ? READER.readText(text) : READER.read(file, format);
        if (outcome instanceof GridIntake.Rejected rejected) {
            throw new DomainException.BadRequest(String.join(" ", rejected.problems().stream().limit(3)
                    .map(p -> (p.row() > 0 ? place(format) + " " + p.row() + ": " : "") + p.message()).toList()));
        }
        GridIntake.Read read = (GridIntake.Read) outcome;
        int[] at = new int[header.size()];
        java.util.Arrays.fill(at, -1);
        List<String> found = read.header().stream().map(h -> h.strip().toLowerCase(Locale.ROOT)).toList();
        List<String> named = found.stream().filter(h -> !h.isEmpty()).toList();
        for (int i = 0; i < found.size(); i++) {
            int column = header.indexOf(found.get(i));
            if (column >= 0 && at[column] < 0) {
                at[column] = i;
            }
        }
        if (named.size() != header.size() || java.util.Arrays.stream(at).anyMatch(i -> i < 0)) {
            throw new DomainException.BadRequest(place(format) + " " + read.headerRow() + ": the header must be "
                    + String.join(",", header) + " (in any order), found '" + clip(String.join(",", named), 80) + "'.");
        }
        List<Line> out = new ArrayList<>();
        for (GridIntake.GridRow row : read.rows()) {
            List<String> cells = row.cells();
            boolean extra = cells.size() > found.size()
                    && cells.subList(found.size(), cells.size()).stream().anyMatch(c -> !c.isBlank());
            if (extra || (format == UploadFormat.CSV && cells.size() != found.size())) {
                throw new DomainException.BadRequest(place(format) + " " + row.row() + ": " + header.size()
                        + " columns expected (" + String.join(",", header) + "), found " + cells.size() + ".");
            }
            String[] ordered = new String[header.size()];
            for (int c = 0; c < header.size(); c++) {
                ordered[c] = at[c] < cells.size() ? cells.get(at[c]).strip() : "";
            }
            out.add(new Line(row.row(), ordered));
        }
        if (out.isEmpty()) {
            throw new DomainException.BadRequest("The upload has a header but no data lines.");
        }
        return out;
    }

    private static String place(UploadFormat format) {
        return format == UploadFormat.XLSX ? "Row" : "Line";
    }

    private static String item(String text, int line) {
        if (!ITEM.matcher(text).matches()) {
            throw error(line, "item", "an item id of 1 to 40 letters, digits or . _ - is expected, found '" + clip(text) + "'");
        }
        return text;
    }

    private static String element(String text, int line) {
        try {
            return ChemicalElement.require(text);
        } catch (DomainException e) {
            throw error(line, "measurand", "'" + clip(text) + "' is not an element symbol from H to U");
        }
    }

    private static double value(String text, int line) {
        if (!NUMBER.matcher(text).matches()) {
            throw error(line, "value", "a decimal number with a point is expected, found '" + clip(text) + "'");
        }
        double value = Double.parseDouble(text);
        if (!Double.isFinite(value)) {
            throw error(line, "value", "the number is out of range");
        }
        return value;
    }

    static DomainException error(int line, String column, String reason) {
        return new DomainException.BadRequest("Line " + line + ", column " + column + ": " + reason + ".");
    }

    private static String clip(String text) {
        return clip(text, 30);
    }

    private static String clip(String text, int length) {
        return text.length() <= length ? text : text.substring(0, length) + "…";
    }
}
