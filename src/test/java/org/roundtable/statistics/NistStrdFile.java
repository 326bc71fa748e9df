package org.roundtable.statistics;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Reads a NIST Statistical Reference Dataset (StRD) file from the test resources
 * ({@code statistics/nist-strd/}, public domain, see SOURCE.md there): the data block and the
 * certified values printed in its header.
 */
public final class NistStrdFile {

    /** Univariate file: data and certified mean, standard deviation and lag-1 autocorrelation. */
    public record Univariate(String name, double[] data, double mean, double sd, double lag1) {
        @Override
        public String toString() {
            return name;
        }
    }

    /** One-way ANOVA file: groups in file order and the certified table. */
    public record Anova(String name, double[][] groups, int dfBetween, int dfWithin,
            double ssBetween, double ssWithin, double msBetween, double msWithin, double f,
            double rSquared, double residualSd) {
        @Override
        public String toString() {
            return name;
        }
    }

    public static final List<String> UNIVARIATE = List.of("Lew", "Lottery", "Mavro", "Michelso",
            "NumAcc1", "NumAcc2", "NumAcc3", "NumAcc4");
    public static final List<String> ANOVA = List.of("SiRstv", "SmLs01", "SmLs02", "SmLs03",
            "SmLs04", "SmLs05", "SmLs06", "SmLs07", "SmLs08", "SmLs09", "AtmWtAg");

    private NistStrdFile() {
    }

    static List<String> lines(String name) {
        String resource = "/statistics/nist-strd/" + name + ".dat";
        try (InputStream in = NistStrdFile.class.getResourceAsStream(resource)) {
            if (in == null) {
                throw new IllegalStateException("missing test resource " + resource);
            }
            return new String(in.readAllBytes(), StandardCharsets.US_ASCII).lines().toList();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private static double lastNumber(String line) {
        String[] tokens = line.trim().split("\\s+");
        return Double.parseDouble(tokens[tokens.length - 1]);
    }

    public static Univariate univariate(String name) {
        List<String> lines = lines(name);
        double mean = Double.NaN;
        double sd = Double.NaN;
        double lag1 = Double.NaN;
        List<Double> data = new ArrayList<>();
        boolean inData = false;
        for (int i = 0; i < lines.size(); i++) {
            String line = lines.get(i);
            if (inData) {
                if (!line.isBlank()) {
                    data.add(Double.parseDouble(line.trim()));
                }
            } else if (line.startsWith("Sample Mean")) {
                mean = lastNumber(line);
            } else if (line.startsWith("Sample Standard Deviation")) {
                sd = lastNumber(line);
            } else if (line.startsWith("Sample Autocorrelation")) {
                lag1 = lastNumber(line);
            } else if (line.startsWith("Data: Y") && lines.get(i + 1).startsWith("---")) {
                inData = true;
                i++;
            }
        }
        return new Univariate(name, data.stream().mapToDouble(Double::doubleValue).toArray(), mean,
                sd, lag1);
    }

    public static Anova anova(String name) {
        List<String> lines = lines(name);
        String[] between = null;
        String[] within = null;
        double rSquared = Double.NaN;
        double residualSd = Double.NaN;
        Map<String, List<Double>> groups = new LinkedHashMap<>();
        boolean inData = false;
        for (String line : lines) {
            String trimmed = line.trim();
            if (inData) {
                if (!trimmed.isEmpty()) {
                    String[] t = trimmed.split("\\s+");
                    groups.computeIfAbsent(t[0], k -> new ArrayList<>()).add(Double.parseDouble(t[1]));
                }
            } else if (trimmed.startsWith("Between ")) {
                between = afterTwoWords(trimmed);
            } else if (trimmed.startsWith("Within ")) {
                within = afterTwoWords(trimmed);
            } else if (trimmed.startsWith("Certified R-Squared")) {
                rSquared = lastNumber(trimmed);
            } else if (trimmed.startsWith("Standard Deviation")) {
                residualSd = lastNumber(trimmed);
            } else if (trimmed.startsWith("Data:") && between != null) {
                inData = true;
            }
        }
        double[][] g = groups.values().stream()
                .map(l -> l.stream().mapToDouble(Double::doubleValue).toArray())
                .toArray(double[][]::new);
        return new Anova(name, g, Integer.parseInt(between[0]), Integer.parseInt(within[0]),
                Double.parseDouble(between[1]), Double.parseDouble(within[1]),
                Double.parseDouble(between[2]), Double.parseDouble(within[2]),
                Double.parseDouble(between[3]), rSquared, residualSd);
    }

    private static String[] afterTwoWords(String line) {
        String[] t = line.split("\\s+");
        return java.util.Arrays.copyOfRange(t, 2, t.length);
    }

    /**
     * NIST's log relative error: number of agreeing significant digits, capped at 15 for an exact
     * match. For a certified value of 0 the absolute error is used.
     */
    public static double lre(double computed, double certified) {
        double err = certified == 0 ? Math.abs(computed) : Math.abs(computed - certified) / Math.abs(certified);
        return err == 0 ? 15.0 : Math.min(15.0, -Math.log10(err));
    }
}
