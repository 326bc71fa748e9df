package org.roundtable.report.render;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

/** Writes rendered samples to {@code target/report-samples/} for a person to look at. */
final class ReportSamplesOutput {

    private static final Path DIRECTORY = Path.of("target", "report-samples");

    private ReportSamplesOutput() {
    }

    static void save(String name, byte[] bytes) {
        try {
            Files.createDirectories(DIRECTORY);
            Files.write(DIRECTORY.resolve(name), bytes);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static void save(String name, String text) {
        save(name, text.getBytes(StandardCharsets.UTF_8));
    }
}
