package org.roundtable.scheme.qualification;

import org.roundtable.platform.DomainException;
import org.roundtable.scheme.ChemicalElement;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import java.util.regex.Pattern;

/**
 * Reads the qualification uploads. Both are plain comma-separated text with a header line:
 * <ul>
 *   <li>homogeneity: {@code item,replicate,measurand,value} — one line per measurement;</li>
 *   <li>stability: {@code item,measurand,value} — one line per measurement at or after the round's end.</li>
 * </ul>
 * The measurand is the element symbol; values are decimal numbers with a point ({@code 18.12}, {@code 1.2e-3}).
 * Quoting is not needed and not accepted. Any error is reported with its line, column and reason, and
 * nothing of the upload is kept.
 */
public final class QualificationCsv {

    public static final int MAX_LINES = 100_000;
    private static final Pattern ITEM = Pattern.compile("[A-Za-z0-9._-]{1,40}");
    private static final Pattern NUMBER = Pattern.compile("[-+]?[0-9]+(\\.[0-9]+)?([eE][-+]?[0-9]{1,3})?");

    private QualificationCsv() {
    }

    public record HomogeneityRow(int line, String item, int replicate, String element, double value, String valueText) {
    }

    public record StabilityRow(int line, String item, String element, double value, String valueText) {
    }

    public static List<HomogeneityRow> homogeneity(String csv) {
        List<String[]> lines = lines(csv, List.of("item", "replicate", "measurand", "value"));
        List<HomogeneityRow> rows = new ArrayList<>();
        Set<String> seen = new HashSet<>();
        for (int i = 0; i < lines.size(); i++) {
            String[] c = lines.get(i);
            int line = i + 2;
            String item = item(c[0], line);
            int replicate;
            if (!c[1].matches("[1-9][0-9]{0,2}")) {
                throw error(line, "replicate", "a replicate number of 1 or more is expected, found '" + clip(c[1]) + "'");
            }
            replicate = Integer.parseInt(c[1]);
            String element = element(c[2], line);
            double value = value(c[3], line);
            if (!seen.add(item + "\u0000" + replicate + "\u0000" + element)) {
                throw error(line, "replicate", "item " + item + " replicate " + replicate + " for " + element + " appears twice");
            }
            rows.add(new HomogeneityRow(line, item, replicate, element, value, c[3]));
        }
        return rows;
    }

    public static List<StabilityRow> stability(String csv) {
        List<String[]> lines = lines(csv, List.of("item", "measurand", "value"));
        List<StabilityRow> rows = new ArrayList<>();
        for (int i = 0; i < lines.size(); i++) {
            String[] c = lines.get(i);
            int line = i + 2;
            rows.add(new StabilityRow(line, item(c[0], line), element(c[1], line), value(c[2], line), c[2]));
        }
        return rows;
    }

    private static List<String[]> lines(String csv, List<String> header) {
        if (csv == null || csv.isBlank()) {
            throw new DomainException.BadRequest("The upload is empty. The first line is the header: " + String.join(",", header) + ".");
        }
        String[] raw = csv.replace("\uFEFF", "").split("\r?\n|\r");
        List<String[]> out = new ArrayList<>();
        boolean headerSeen = false;
        for (int i = 0; i < raw.length; i++) {
            String text = raw[i].strip();
            int line = i + 1;
            if (!headerSeen) {
                List<String> found = List.of(text.toLowerCase(Locale.ROOT).split("\\s*,\\s*", -1));
                if (!found.equals(header)) {
                    throw new DomainException.BadRequest("Line 1: the header must be " + String.join(",", header)
                            + ", found '" + clip(text) + "'.");
                }
                headerSeen = true;
                continue;
            }
            if (text.isEmpty()) {
                if (i == raw.length - 1) {
                    continue;
                }
                throw new DomainException.BadRequest("Line " + line + ": empty line.");
            }
            if (text.indexOf('"') >= 0) {
                throw new DomainException.BadRequest("Line " + line + ": quotes are not used in this file.");
            }
            String[] cells = text.split(",", -1);
            if (cells.length != header.size()) {
                throw new DomainException.BadRequest("Line " + line + ": " + header.size() + " columns expected ("
                        + String.join(",", header) + "), found " + cells.length + ".");
            }
            for (int c = 0; c < cells.length; c++) {
                cells[c] = cells[c].strip();
            }
            out.add(cells);
            if (out.size() > MAX_LINES) {
                throw new DomainException.BadRequest("At most " + MAX_LINES + " data lines per upload.");
            }
        }
        if (out.isEmpty()) {
            throw new DomainException.BadRequest("The upload has a header but no data lines.");
        }
        // line numbers in errors count from the file's first line; blank trailing lines are dropped above
        return out;
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
        return text.length() <= 30 ? text : text.substring(0, 30) + "…";
    }
}
