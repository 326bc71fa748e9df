package org.roundtable.history;

import org.roundtable.platform.NumberFormats;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Function;

/**
 * Small SVG charts of one measurand over rounds: one score kind per chart with its action lines (±2 and ±3 for
 * z, z′ and ζ; ±1 for En), and the reported value against x_pt ± 2σpt. Each point links to the report that
 * published it. Plain SVG text, no scripts; the numbers are also in the table beside the chart.
 */
public final class HistoryCharts {

    /** Which score a chart shows. */
    public enum Kind {
        Z_LIKE("z / z′ (the score used)"), ZETA("ζ"), EN("En");

        private final String label;

        Kind(String label) {
            this.label = label;
        }

        public String label() {
            return label;
        }
    }

    private static final int WIDTH = 640;
    private static final int HEIGHT = 220;
    private static final int LEFT = 64;
    private static final int RIGHT = 16;
    private static final int TOP = 16;
    private static final int BOTTOM = 64;

    private HistoryCharts() {
    }

    /** The score kinds the series has values for, z / z′ first. */
    public static List<Kind> kinds(HistoryService.Series series) {
        boolean zLike = false;
        boolean zeta = false;
        boolean en = false;
        for (HistoryService.Entry e : series.entries()) { // one pass over the entries
            zLike |= e.z() != null || e.zPrime() != null;
            zeta |= e.zeta() != null;
            en |= e.en() != null;
        }
        List<Kind> kinds = new ArrayList<>(3);
        if (zLike) {
            kinds.add(Kind.Z_LIKE);
        }
        if (zeta) {
            kinds.add(Kind.ZETA);
        }
        if (en) {
            kinds.add(Kind.EN);
        }
        return kinds;
    }

    static Function<HistoryService.Entry, Double> score(Kind kind) {
        return switch (kind) {
            case Z_LIKE -> HistoryService.Entry::zLike;
            case ZETA -> HistoryService.Entry::zeta;
            case EN -> HistoryService.Entry::en;
        };
    }

    /** The chart of one score kind; {@code link} gives each point's report address. */
    public static String scoreChart(HistoryService.Series series, Kind kind,
                                    Function<HistoryService.Entry, String> link) {
        List<HistoryService.Entry> entries = series.entries();
        Function<HistoryService.Entry, Double> score = score(kind);
        double[] limits = kind == Kind.EN ? new double[]{1} : new double[]{2, 3};
        double max = limits[limits.length - 1] + 1;
        for (HistoryService.Entry e : entries) {
            Double v = score.apply(e);
            if (v != null && Double.isFinite(v)) {
                max = Math.max(max, Math.ceil(Math.abs(v)) + 0.5);
            }
        }
        double top = max;
        StringBuilder svg = open(series.element() + " " + kind.label() + " over rounds");
        Axis y = new Axis(-top, top);
        for (double l : limits) {
            String cls = l == limits[limits.length - 1] ? "action" : "warning";
            hline(svg, y, l, cls, "+" + fmt(l));
            hline(svg, y, -l, cls, NumberFormats.MINUS + fmt(l));
        }
        hline(svg, y, 0, "zero", "0");
        Map<String, Double> xs = xs(entries);
        xLabels(svg, xs);
        for (HistoryService.Entry e : entries) {
            Double v = score.apply(e);
            if (v == null || !Double.isFinite(v)) {
                continue;
            }
            double shown = Math.max(-top, Math.min(top, v));
            point(svg, xs.get(e.roundCode()), y.at(shown), link.apply(e),
                    e.roundCode() + " " + e.itemLabel() + ": " + kind.label() + " = " + NumberFormats.signedScore(v, 2)
                            + (e.verdict() == null ? "" : " (" + e.verdict().word() + ")"),
                    e.verdict() == null ? "none" : e.verdict().word());
        }
        return svg.append("</svg>").toString();
    }

    /** The reported value against x_pt ± 2σpt over rounds. */
    public static String valueChart(HistoryService.Series series, Function<HistoryService.Entry, String> link) {
        List<HistoryService.Entry> entries = series.entries();
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (HistoryService.Entry e : entries) {
            for (Double v : new Double[]{e.value(), band(e, -2), band(e, 2)}) {
                if (v != null && Double.isFinite(v)) {
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                }
            }
        }
        StringBuilder svg = open(series.element() + " reported value and x_pt ± 2σpt over rounds");
        if (!Double.isFinite(lo)) {
            return svg.append("</svg>").toString();
        }
        double pad = hi > lo ? (hi - lo) * 0.1 : Math.max(Math.abs(hi) * 0.05, 1e-9);
        Axis y = new Axis(lo - pad, hi + pad);
        Map<String, Double> xs = xs(entries);
        xLabels(svg, xs);
        for (double t : new double[]{lo, (lo + hi) / 2, hi}) {
            svg.append("<text fill=\"#333333\" x=\"").append(LEFT - 4).append("\" y=\"");
            num(svg, y.at(t) + 4).append("\" text-anchor=\"end\">");
            esc(svg, NumberFormats.plain(t, 3)).append("</text>");
        }
        for (HistoryService.Entry e : entries) {
            Double xpt = e.assignedValue();
            Double low = band(e, -2);
            Double high = band(e, 2);
            double cx = xs.get(e.roundCode());
            if (low != null && high != null) {
                svg.append("<rect fill=\"#cfe3f5\" x=\"");
                num(svg, cx - 6).append("\" y=\"");
                num(svg, y.at(high)).append("\" width=\"12\" height=\"");
                num(svg, Math.max(1, y.at(low) - y.at(high))).append("\"/>");
            }
            if (xpt != null) {
                double yx = y.at(xpt);
                svg.append("<line stroke=\"#1d4f7a\" stroke-width=\"2\" x1=\"");
                num(svg, cx - 8).append("\" x2=\"");
                num(svg, cx + 8).append("\" y1=\"");
                num(svg, yx).append("\" y2=\"");
                num(svg, yx).append("\"/>");
            }
            if (e.value() != null) {
                point(svg, cx, y.at(e.value()), link.apply(e), e.roundCode() + " " + e.itemLabel() + ": reported "
                        + e.reported() + " " + e.unit() + (xpt == null ? "" : ", x_pt " + NumberFormats.plain(xpt, 4)),
                        e.verdict() == null ? "none" : e.verdict().word());
            }
        }
        return svg.append("</svg>").toString();
    }

    private static Double band(HistoryService.Entry e, int k) {
        return e.assignedValue() == null || e.sigmaPt() == null ? null : e.assignedValue() + k * e.sigmaPt();
    }

    private record Axis(double min, double max) {
        double at(double v) {
            return TOP + (max - v) / (max - min) * (HEIGHT - TOP - BOTTOM);
        }
    }

    private static StringBuilder open(String label) {
        StringBuilder svg = new StringBuilder(32_768).append("<svg xmlns=\"http://www.w3.org/2000/svg\" class=\"history-chart\" width=\"")
                .append(WIDTH).append("\" height=\"").append(HEIGHT).append("\" viewBox=\"0 0 ").append(WIDTH).append(' ')
                .append(HEIGHT).append("\" role=\"group\" aria-label=\"");
        esc(svg, label).append("\" font-family=\"sans-serif\" font-size=\"11\"><title>");
        return esc(svg, label).append("</title>");
    }

    private static void hline(StringBuilder svg, Axis y, double v, String cls, String label) {
        // presentation attributes, not CSS: the pages' content security policy allows no inline styles
        String stroke = switch (cls) {
            case "warning" -> "stroke=\"#c08a00\" stroke-dasharray=\"4 3\"";
            case "action" -> "stroke=\"#b3261e\"";
            default -> "stroke=\"#888888\"";
        };
        double at = y.at(v);
        svg.append("<line ").append(stroke).append(" x1=\"").append(LEFT).append("\" x2=\"").append(WIDTH - RIGHT)
                .append("\" y1=\"");
        num(svg, at).append("\" y2=\"");
        num(svg, at).append("\"/><text fill=\"#333333\" x=\"").append(LEFT - 4).append("\" y=\"");
        num(svg, at + 4).append("\" text-anchor=\"end\">");
        esc(svg, label).append("</text>");
    }

    /** The x of each round of the entries (in their order), looked up once per point instead of searched. */
    private static Map<String, Double> xs(List<HistoryService.Entry> entries) {
        Map<String, Double> xs = new LinkedHashMap<>();
        for (HistoryService.Entry e : entries) {
            xs.putIfAbsent(e.roundCode(), 0.0);
        }
        int n = Math.max(1, xs.size());
        int i = 0;
        for (Map.Entry<String, Double> x : xs.entrySet()) {
            x.setValue(LEFT + (i++ + 0.5) * (WIDTH - LEFT - RIGHT) / n);
        }
        return xs;
    }

    private static void xLabels(StringBuilder svg, Map<String, Double> xs) {
        int step = Math.max(1, (int) Math.ceil(xs.size() / 12.0));
        int i = 0;
        int cy = HEIGHT - BOTTOM + 14;
        for (Map.Entry<String, Double> x : xs.entrySet()) {
            if (i++ % step != 0) {
                continue;
            }
            double cx = x.getValue();
            svg.append("<text fill=\"#333333\" x=\"");
            num(svg, cx).append("\" y=\"").append(cy).append("\" text-anchor=\"end\" transform=\"rotate(-30 ");
            num(svg, cx).append(' ').append(cy).append(")\">");
            esc(svg, shortCode(x.getKey())).append("</text>");
        }
    }

    private static String shortCode(String code) {
        return code.length() > 14 ? code.substring(0, 13) + "…" : code;
    }

    private static void point(StringBuilder svg, double cx, double cy, String href, String title, String cls) {
        svg.append("<a href=\"");
        esc(svg, href).append("\"><circle fill=\"").append(fill(cls)).append("\" stroke=\"#222222\" cx=\"");
        num(svg, cx).append("\" cy=\"");
        num(svg, cy).append("\" r=\"5\"><title>");
        esc(svg, title).append("</title></circle></a>");
    }

    /**
     * A coordinate with one decimal, as {@code %.1f} would write it in the root locale but without a formatter
     * (rounded half up in tenths; charts only).
     */
    static StringBuilder num(StringBuilder svg, double v) {
        long tenths = Math.round(v * 10);
        if (tenths < 0) {
            svg.append('-');
            tenths = -tenths;
        }
        return svg.append(tenths / 10).append('.').append((char) ('0' + tenths % 10));
    }

    private static String fill(String verdict) {
        return switch (verdict) {
            case "satisfactory" -> "#2e7d32";
            case "questionable" -> "#f0b400";
            case "unsatisfactory" -> "#b3261e";
            default -> "#ffffff";
        };
    }

    private static String fmt(double v) {
        return NumberFormats.plain(v, 0);
    }

    static String esc(String s) {
        return esc(new StringBuilder(s.length() + 16), s).toString();
    }

    /** Appends {@code s} escaped for SVG text and attributes, in one pass. */
    static StringBuilder esc(StringBuilder out, String s) {
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '&' -> out.append("&amp;");
                case '<' -> out.append("&lt;");
                case '>' -> out.append("&gt;");
                case '"' -> out.append("&quot;");
                default -> out.append(c);
            }
        }
        return out;
    }
}
