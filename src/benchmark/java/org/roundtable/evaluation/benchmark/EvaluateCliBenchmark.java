package org.roundtable.evaluation.benchmark;

import java.io.BufferedWriter;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import java.util.concurrent.TimeUnit;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;

/**
 * The packaged jar's {@code evaluate} on a generated 1,000,000-row file (10,000 participants × 100 measurands, demo
 * numbers), against a floor measured in the same run: a JVM with the same heap that only parses the same file with
 * Commons CSV and only writes the same output (copied from the real run's output file). Both include JVM start.
 * Writes {@code evaluate-cli.json}: {@code seconds}, {@code floorSeconds}, {@code ratio}, {@code peakRssMiB} (the
 * child's VmHWM), {@code heap} and {@code exitCode}; targets: ratio ≤ 1.5, peak RSS &lt; 512 MiB, exit 0 under
 * {@code -Xmx256m}.
 *
 * <p>Alone: {@code mvn -o -Pbenchmark package -DskipTests exec:exec@run-evaluate-cli-benchmark}.
 */
public final class EvaluateCliBenchmark {

    private static final String HEADER = "participant,measurand,unit,value,expanded_uncertainty,coverage_factor,method";

    private EvaluateCliBenchmark() {
    }

    public static void main(String[] args) throws Exception {
        Path jar = Path.of(args[0]);
        Path out = Path.of(args[1]);
        int participants = Integer.getInteger("bench.participants", 10_000);
        int measurands = Integer.getInteger("bench.measurands", 100);
        String heap = System.getProperty("bench.heap", "256m");
        int repetitions = Integer.getInteger("bench.repetitions", 3);
        Path dir = out.getParent();
        Files.createDirectories(dir);
        Path input = dir.resolve("evaluate-cli-input.csv");
        generate(input, participants, measurands);
        Path output = dir.resolve("evaluate-cli-output.jsonl");
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();

        double best = Double.MAX_VALUE;
        double bestFloor = Double.MAX_VALUE;
        long peakKiB = 0;
        int exit = 0;
        for (int i = 0; i < repetitions; i++) {
            Run run = run(List.of(java, "-Xmx" + heap, "-jar", jar.toString(), "evaluate", input.toString()), output);
            exit = Math.max(exit, run.exitCode());
            best = Math.min(best, run.seconds());
            peakKiB = Math.max(peakKiB, run.peakKiB());
            Run floor = run(List.of(java, "-Xmx" + heap, "-cp", System.getProperty("java.class.path"),
                    Floor.class.getName(), input.toString(), output.toString()), dir.resolve("evaluate-cli-floor.out"));
            bestFloor = Math.min(bestFloor, floor.seconds());
        }
        long outputBytes = Files.size(output);
        String json = String.format(Locale.ROOT, "{\"rows\": %d, \"participants\": %d, \"measurands\": %d,"
                        + " \"heap\": \"%s\", \"exitCode\": %d, \"seconds\": %.2f, \"floorSeconds\": %.2f,"
                        + " \"ratio\": %.2f, \"peakRssMiB\": %.0f, \"outputMiB\": %.1f, \"repetitions\": %d}%n",
                (long) participants * measurands, participants, measurands, heap, exit, best, bestFloor,
                best / bestFloor, peakKiB / 1024.0, outputBytes / 1048576.0, repetitions);
        Files.writeString(out, json);
        System.out.print(json);
    }

    private record Run(int exitCode, double seconds, long peakKiB) {
    }

    /** Runs a child, stdout to a file, and samples its peak resident set (VmHWM) until it ends. */
    private static Run run(List<String> command, Path stdout) throws IOException, InterruptedException {
        long start = System.nanoTime();
        Process child = new ProcessBuilder(command).redirectOutput(stdout.toFile())
                .redirectError(ProcessBuilder.Redirect.DISCARD).start();
        long peak = 0;
        Path status = Path.of("/proc", Long.toString(child.pid()), "status");
        while (!child.waitFor(20, TimeUnit.MILLISECONDS)) {
            peak = Math.max(peak, highWaterMark(status));
        }
        double seconds = (System.nanoTime() - start) / 1e9;
        return new Run(child.exitValue(), seconds, peak);
    }

    private static long highWaterMark(Path status) {
        try {
            for (String line : Files.readAllLines(status)) {
                if (line.startsWith("VmHWM:")) {
                    return Long.parseLong(line.replaceAll("[^0-9]", ""));
                }
            }
        } catch (IOException | RuntimeException e) {
            // the process ended between two samples
        }
        return 0;
    }

    /** 10,000 × 100 results of demo numbers: a normal spread with 2 % gross errors, a few "less than" values. */
    static void generate(Path file, int participants, int measurands) throws IOException {
        SplittableRandom random = new SplittableRandom(20261202);
        try (BufferedWriter w = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
            w.write(HEADER);
            w.newLine();
            for (int m = 0; m < measurands; m++) {
                double level = 0.05 + m * 0.2;
                for (int p = 0; p < participants; p++) {
                    double v = level * (1 + 0.02 * random.nextGaussian());
                    if (random.nextInt(50) == 0) {
                        v *= 1 + (random.nextBoolean() ? 0.3 : -0.3);
                    }
                    String value = random.nextInt(500) == 0 ? String.format(Locale.ROOT, "<%.4f", level / 10)
                            : String.format(Locale.ROOT, "%.4f", Math.abs(v));
                    w.write(String.format(Locale.ROOT, "L%05d,M%03d,mg/kg,%s,%.4f,2,%s%n", p, m, value,
                            level * 0.03, p % 3 == 0 ? "combustion" : "spark OES"));
                }
            }
        }
    }

    /** The floor: the same file parsed with Commons CSV (every value read as a number), the same output written. */
    public static final class Floor {
        public static void main(String[] args) throws IOException {
            double sum = 0;
            long rows = 0;
            try (Reader reader = Files.newBufferedReader(Path.of(args[0]), StandardCharsets.UTF_8);
                    CSVParser parser = CSVParser.parse(reader, CSVFormat.RFC4180)) {
                List<String> header = new ArrayList<>();
                for (CSVRecord record : parser) {
                    if (header.isEmpty()) {
                        record.forEach(header::add);
                        continue;
                    }
                    String value = record.get(3);
                    sum += Double.parseDouble(value.startsWith("<") ? value.substring(1) : value);
                    rows++;
                }
            }
            try (InputStream in = Files.newInputStream(Path.of(args[1])); OutputStream out = System.out) {
                in.transferTo(out);
            }
            System.err.println(rows + " rows, sum " + sum);
        }
    }
}
