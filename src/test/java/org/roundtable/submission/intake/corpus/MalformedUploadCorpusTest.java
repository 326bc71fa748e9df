package org.roundtable.submission.intake.corpus;

import static org.assertj.core.api.Assertions.assertThat;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;

import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.net.URISyntaxException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.roundtable.submission.intake.CorpusRules;
import org.roundtable.submission.intake.IntakeProblem;
import org.roundtable.submission.intake.IntakeResult;
import org.roundtable.submission.intake.Limits;
import org.roundtable.submission.intake.ResultIntake;
import org.roundtable.submission.intake.UploadFormat;

/**
 * Runs every file of the malformed-upload corpus ({@code uploads/malformed/}, written by
 * {@link MalformedCorpusGenerator}) through the intake with the low-alloy steel test round, and checks that each is
 * rejected (within a generous guard against hanging) with the error key (and row and column, where given) of {@code MANIFEST.csv}. Also checks that
 * folder and manifest list the same files, and runs the large cases that are generated here instead of committed.
 */
class MalformedUploadCorpusTest {

    private static final String FOLDER = "/uploads/malformed/";
    /** A guard against a reader that hangs or loops (a zip bomb, a runaway scan), not a speed check: speed is benchmarked. */
    private static final Duration TIME_LIMIT = Duration.ofSeconds(30);

    private final ResultIntake intake = new ResultIntake();

    /** One line of the manifest. */
    record ManifestLine(String file, String expectedKey, Integer row, String column) {
        @Override
        public String toString() {
            return file + " → " + expectedKey;
        }
    }

    static List<ManifestLine> manifest() throws IOException {
        List<ManifestLine> lines = new ArrayList<>();
        try (InputStream in = MalformedUploadCorpusTest.class.getResourceAsStream(FOLDER + "MANIFEST.csv")) {
            String[] rows = new String(in.readAllBytes(), StandardCharsets.UTF_8).split("\n");
            for (String row : List.of(rows).subList(1, rows.length)) {
                if (row.isBlank()) {
                    continue;
                }
                String[] cells = row.split(",", -1);
                lines.add(new ManifestLine(cells[0], cells[1], cells[2].isEmpty() ? null : Integer.valueOf(cells[2]),
                        cells[3].isEmpty() ? null : cells[3]));
            }
        }
        return lines;
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("manifest")
    void everyMalformedUploadIsRejectedWithItsExpectedKeyWithinTwoSeconds(ManifestLine line) throws IOException {
        byte[] content;
        try (InputStream in = getClass().getResourceAsStream(FOLDER + line.file())) {
            assertThat(in).as("file %s", line.file()).isNotNull();
            content = in.readAllBytes();
        }
        assertThat(content.length).as("committed corpus files stay below 1 MB").isLessThan(1_000_000);
        UploadFormat format = UploadFormat.fromFileName(line.file()).orElseThrow();

        IntakeResult result = assertTimeoutPreemptively(TIME_LIMIT,
                () -> intake.read(content, format, CorpusRules.lowAlloySteel()));

        assertThat(result).as("%s must be rejected", line.file()).isInstanceOf(IntakeResult.Rejected.class);
        List<IntakeProblem> problems = ((IntakeResult.Rejected) result).problems();
        assertThat(problems).as("problems of %s", line.file())
                .anySatisfy(problem -> {
                    assertThat(problem.key()).isEqualTo(line.expectedKey());
                    if (line.row() != null) {
                        assertThat(problem.row()).isEqualTo(line.row());
                    }
                    if (line.column() != null) {
                        assertThat(problem.column()).isEqualTo(line.column());
                    }
                    assertThat(problem.message()).isNotBlank();
                });
    }

    @Test
    void everyFileInTheCorpusFolderIsInTheManifestAndEveryManifestLineHasAFile()
            throws IOException, URISyntaxException {
        Path folder = Path.of(getClass().getResource(FOLDER).toURI());
        Set<String> files;
        try (Stream<Path> listing = Files.list(folder)) {
            files = listing.map(path -> path.getFileName().toString())
                    .filter(name -> !name.equals("MANIFEST.csv"))
                    .collect(Collectors.toCollection(TreeSet::new));
        }
        Set<String> listed = manifest().stream().map(ManifestLine::file)
                .collect(Collectors.toCollection(TreeSet::new));

        assertThat(files).as("files missing from MANIFEST.csv").isSubsetOf(listed);
        assertThat(listed).as("MANIFEST.csv lines without a file").isSubsetOf(files);
        assertThat(listed).as("manifest lines are unique").hasSize(manifest().size());
    }

    @Test
    void theUnbrokenUploadEveryCaseStartsFromIsAcceptedAsCsvAndAsXlsx() throws IOException {
        byte[] csv = MalformedCorpusGenerator.csv(MalformedCorpusGenerator.table()).getBytes(StandardCharsets.UTF_8);
        byte[] xlsx = MalformedCorpusGenerator.xlsx(MalformedCorpusGenerator.cellsOf(MalformedCorpusGenerator.table()));

        IntakeResult fromCsv = intake.read(csv, UploadFormat.CSV, CorpusRules.lowAlloySteel());
        IntakeResult fromXlsx = intake.read(xlsx, UploadFormat.XLSX, CorpusRules.lowAlloySteel());

        assertThat(fromCsv).isInstanceOf(IntakeResult.Accepted.class);
        assertThat(fromXlsx).isInstanceOf(IntakeResult.Accepted.class);
        assertThat(((IntakeResult.Accepted) fromXlsx).sha256()).isEqualTo(((IntakeResult.Accepted) fromCsv).sha256());
    }

    @Test
    void theCorpusHoldsAtLeast100CsvAnd50XlsxCases() throws IOException {
        List<ManifestLine> lines = manifest();

        assertThat(lines).filteredOn(line -> line.file().endsWith(".csv")).hasSizeGreaterThanOrEqualTo(100);
        assertThat(lines).filteredOn(line -> line.file().endsWith(".xlsx")).hasSizeGreaterThanOrEqualTo(50);
    }

    @Test
    void aTenMegabyteFileIsRefusedBeforeItIsParsed() {
        byte[] tenMegabytes = new byte[10 * 1024 * 1024];
        java.util.Arrays.fill(tenMegabytes, (byte) 'a');

        IntakeResult result = assertTimeoutPreemptively(TIME_LIMIT,
                () -> intake.read(tenMegabytes, UploadFormat.CSV, CorpusRules.lowAlloySteel()));

        assertThat(keys(result)).containsExactly("file.too-large");
    }

    @Test
    void aTenMegabyteStreamIsRefusedAfterReadingOnlyTheLimit() throws IOException {
        CountingStream stream = new CountingStream(10 * 1024 * 1024);

        IntakeResult result = intake.read(stream, UploadFormat.XLSX, CorpusRules.lowAlloySteel());

        assertThat(keys(result)).containsExactly("file.too-large");
        assertThat(stream.consumed).isLessThanOrEqualTo(intake.limits().maxFileBytes() + 1);
    }

    @Test
    void aMillionRowsAreRefusedAsTooLarge() {
        byte[] millionRows = millionRows();

        IntakeResult result = assertTimeoutPreemptively(TIME_LIMIT,
                () -> intake.read(millionRows, UploadFormat.CSV, CorpusRules.lowAlloySteel()));

        assertThat(keys(result)).containsExactly("file.too-large");
    }

    @Test
    void aMillionRowsUnderARaisedSizeLimitAreRefusedAsTooManyRows() {
        Limits defaults = Limits.defaults();
        ResultIntake generous = new ResultIntake(new Limits(64 * Limits.MEBIBYTE, defaults.maxDataRows(),
                defaults.maxLineChars(), defaults.maxCellChars(), defaults.maxColumns(), defaults.maxZipEntries(),
                defaults.maxUncompressedBytes(), defaults.minInflateRatio(), defaults.inflateGraceBytes()));
        byte[] millionRows = millionRows();

        IntakeResult result = assertTimeoutPreemptively(TIME_LIMIT,
                () -> generous.read(millionRows, UploadFormat.CSV, CorpusRules.lowAlloySteel()));

        assertThat(((IntakeResult.Rejected) result).problems()).singleElement()
                .satisfies(problem -> {
                    assertThat(problem.key()).isEqualTo("file.too-many-rows");
                    assertThat(problem.row()).isEqualTo(5002);
                });
    }

    @Test
    void aOneMegabyteLineIsRefusedAsTooLong() {
        String line = "Mn,1.215,%,0.030,2," + "x".repeat(1024 * 1024) + ",3,\n";
        byte[] upload = (String.join(",", MalformedCorpusGenerator.HEADER) + "\n" + line)
                .getBytes(StandardCharsets.UTF_8);

        IntakeResult result = assertTimeoutPreemptively(TIME_LIMIT,
                () -> intake.read(upload, UploadFormat.CSV, CorpusRules.lowAlloySteel()));

        assertThat(((IntakeResult.Rejected) result).problems()).singleElement()
                .satisfies(problem -> {
                    assertThat(problem.key()).isEqualTo("csv.line-too-long");
                    assertThat(problem.row()).isEqualTo(2);
                });
    }

    private static byte[] millionRows() {
        StringBuilder text = new StringBuilder(String.join(",", MalformedCorpusGenerator.HEADER)).append('\n');
        for (int i = 0; i < 1_000_000; i++) {
            text.append("Mn,1.215,%,,,spark-oes,3,\n");
        }
        return text.toString().getBytes(StandardCharsets.UTF_8);
    }

    private static List<String> keys(IntakeResult result) {
        assertThat(result).isInstanceOf(IntakeResult.Rejected.class);
        return ((IntakeResult.Rejected) result).problems().stream().map(IntakeProblem::key).toList();
    }

    /** A stream of {@code size} bytes that counts how many were read. */
    private static final class CountingStream extends InputStream {
        private final ByteArrayInputStream source;
        private long consumed;

        CountingStream(int size) {
            source = new ByteArrayInputStream(new byte[size]);
        }

        @Override
        public int read() {
            int value = source.read();
            if (value >= 0) {
                consumed++;
            }
            return value;
        }

        @Override
        public int read(byte[] buffer, int offset, int length) {
            int read = source.read(buffer, offset, length);
            if (read > 0) {
                consumed += read;
            }
            return read;
        }
    }
}
