package org.roundtable.history;

import org.roundtable.platform.NumberFormats;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
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
        List<Kind> kinds = new ArrayList<>();
        for (Kind k : Kind.values()) {
            if (series.entries().stream().anyMatch(e -> score(k).apply(e) != null)) {
                kinds.add(k);
            }
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
        List<String> rounds = rounds(entries);
        xLabels(svg, rounds);
        for (HistoryService.Entry e : entries) {
            Double v = score.apply(e);
            if (v == null || !Double.isFinite(v)) {
                continue;
            }
            double shown = Math.max(-top, Math.min(top, v));
            point(svg, x(rounds, e.roundCode()), y.at(shown), link.apply(e),
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
        List<String> rounds = rounds(entries);
        xLabels(svg, rounds);
        for (double t : new double[]{lo, (lo + hi) / 2, hi}) {
            svg.append(String.format(Locale.ROOT, "<text fill=\"#333333\" x=\"%d\" y=\"%.1f\" text-anchor=\"end\">%s</text>",
                    LEFT - 4, y.at(t) + 4, esc(NumberFormats.plain(t, 3))));
        }
        for (HistoryService.Entry e : entries) {
            Double xpt = e.assignedValue();
            Double low = band(e, -2);
            Double high = band(e, 2);
            double cx = x(rounds, e.roundCode());
            if (low != null && high != null) {
                svg.append(String.format(Locale.ROOT,
                        "<rect fill=\"#cfe3f5\" x=\"%.1f\" y=\"%.1f\" width=\"12\" height=\"%.1f\"/>",
                        cx - 6, y.at(high), Math.max(1, y.at(low) - y.at(high))));
            }
            if (xpt != null) {
                svg.append(String.format(Locale.ROOT,
                        "<line stroke=\"#1d4f7a\" stroke-width=\"2\" x1=\"%.1f\" x2=\"%.1f\" y1=\"%.1f\" y2=\"%.1f\"/>",
                        cx - 8, cx + 8, y.at(xpt), y.at(xpt)));
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
        return new StringBuilder(4096).append(String.format(Locale.ROOT,
                "<svg xmlns=\"http://www.w3.org/2000/svg\" class=\"history-chart\" width=\"%d\" height=\"%d\" viewBox=\"0 0 %d %d\" "
                        + "role=\"group\" aria-label=\"%s\" font-family=\"sans-serif\" font-size=\"11\"><title>%s</title>",
                WIDTH, HEIGHT, WIDTH, HEIGHT, esc(label), esc(label)));
    }

    private static void hline(StringBuilder svg, Axis y, double v, String cls, String label) {
        // presentation attributes, not CSS: the pages' content security policy allows no inline styles
        String stroke = switch (cls) {
            case "warning" -> "stroke=\"#c08a00\" stroke-dasharray=\"4 3\"";
            case "action" -> "stroke=\"#b3261e\"";
            default -> "stroke=\"#888888\"";
        };
        svg.append(String.format(Locale.ROOT,
                "<line %s x1=\"%d\" x2=\"%d\" y1=\"%.1f\" y2=\"%.1f\"/>"
                        + "<text fill=\"#333333\" x=\"%d\" y=\"%.1f\" text-anchor=\"end\">%s</text>",
                stroke, LEFT, WIDTH - RIGHT, y.at(v), y.at(v), LEFT - 4, y.at(v) + 4, esc(label)));
    }

    private static List<String> rounds(List<HistoryService.Entry> entries) {
        return entries.stream().map(HistoryService.Entry::roundCode).distinct().toList();
    }

    private static double x(List<String> rounds, String round) {
        int i = rounds.indexOf(round);
        int n = Math.max(1, rounds.size());
        return LEFT + (i + 0.5) * (WIDTH - LEFT - RIGHT) / n;
    }

    private static void xLabels(StringBuilder svg, List<String> rounds) {
        int step = Math.max(1, (int) Math.ceil(rounds.size() / 12.0));
        for (int i = 0; i < rounds.size(); i += step) {
            double cx = x(rounds, rounds.get(i));
            int cy = HEIGHT - BOTTOM + 14;
            svg.append(String.format(Locale.ROOT,
                    "<text fill=\"#333333\" x=\"%.1f\" y=\"%d\" text-anchor=\"end\" transform=\"rotate(-30 %.1f %d)\">%s</text>",
                    cx, cy, cx, cy, esc(shortCode(rounds.get(i)))));
        }
    }

    private static String shortCode(String code) {
        return code.length() > 14 ? code.substring(0, 13) + "…" : code;
    }

    private static void point(StringBuilder svg, double cx, double cy, String href, String title, String cls) {
        svg.append(String.format(Locale.ROOT,
                "<a href=\"%s\"><circle fill=\"%s\" stroke=\"#222222\" cx=\"%.1f\" cy=\"%.1f\" r=\"5\"><title>%s</title></circle></a>",
                esc(href), fill(cls), cx, cy, esc(title)));
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
        return s.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace("\"", "&quot;");
    }
}
