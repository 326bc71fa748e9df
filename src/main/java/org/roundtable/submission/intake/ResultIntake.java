package org.roundtable.submission.intake;

import java.io.IOException;
import java.io.InputStream;
import com.fasterxml.jackson.databind.json.JsonMapper;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Objects;

/**
 * Reads a laboratory's result upload (CSV, XLSX or JSON) into typed results, all or nothing.
 *
 * <p>Usage by the server:
 * <pre>{@code
 * ResultIntake intake = new ResultIntake();                       // Limits.defaults(); thread-safe, reusable
 * UploadFormat format = UploadFormat.fromFileName(fileName).orElseThrow(...);   // or CSV/XLSX/JSON by endpoint
 * IntakeResult outcome = intake.read(bytes, format, rulesOfTheRound);
 * if (outcome instanceof IntakeResult.Accepted accepted) {
 *     // show accepted.warnings() for confirmation; store accepted.results() in one transaction;
 *     // put accepted.sha256() (of accepted.canonicalJson()) on the receipt
 * } else if (outcome instanceof IntakeResult.Rejected rejected) {
 *     // answer 4xx (e.g. 422) with rejected.problems() and rejected.detection(); store nothing
 * }
 * }</pre>
 * The caller also enforces the HTTP body limit; {@link #read(InputStream, UploadFormat, UploadRules)} reads at most
 * one byte more than {@link Limits#maxFileBytes()}.
 *
 * <p>All channels share one validation path ({@link Table} for CSV/XLSX, then {@link ResultValidator}); the rules
 * and error keys are documented there, in {@link CsvUploadReader}, {@link XlsxUploadReader},
 * {@link JsonUploadReader}, {@link IntakeKey} and {@link Limits}. The intake never throws for bad content: any
 * unexpected failure of a parser becomes {@code file.unreadable} (fail closed). Problems are listed by row (file-level
 * problems, row 0, first). There is no cap on their number: it is bounded by the row, column and cell limits.
 *
 * <p>The class is pure Java (plus Commons CSV, POI and Jackson): no framework, no database, no file system.
 */
public final class ResultIntake {

    private final Limits limits;
    private final JsonMapper jsonMapper;

    /** An intake with {@link Limits#defaults()}. */
    public ResultIntake() {
        this(Limits.defaults());
    }

    public ResultIntake(Limits limits) {
        this.limits = Objects.requireNonNull(limits, "limits");
        this.jsonMapper = JsonUploadReader.strictMapper(limits);
    }

    public Limits limits() {
        return limits;
    }

    /**
     * Reads at most {@link Limits#maxFileBytes()} + 1 bytes from {@code content} and validates them; a longer stream
     * is rejected with {@code file.too-large} without reading the rest. The stream is not closed.
     *
     * @throws IOException only when reading the stream itself fails
     */
    public IntakeResult read(InputStream content, UploadFormat declaredFormat, UploadRules rules) throws IOException {
        byte[] bytes = content.readNBytes((int) Math.min(Integer.MAX_VALUE - 8, limits.maxFileBytes() + 1));
        return read(bytes, declaredFormat, rules);
    }

    /**
     * Validates an upload held in memory.
     *
     * @param content        the uploaded bytes
     * @param declaredFormat the type the upload claims (by file extension or endpoint); the content must match it
     * @param rules          the round's catalogue
     * @return {@link IntakeResult.Accepted} with every result, or {@link IntakeResult.Rejected} with every problem
     */
    public IntakeResult read(byte[] content, UploadFormat declaredFormat, UploadRules rules) {
        Objects.requireNonNull(content, "content");
        Objects.requireNonNull(declaredFormat, "declaredFormat");
        Objects.requireNonNull(rules, "rules");
        if (content.length > limits.maxFileBytes()) {
            return new IntakeResult.Rejected(List.of(IntakeProblem.ofFile(IntakeKey.FILE_TOO_LARGE,
                    "The file is larger than " + limits.maxFileBytes() + " bytes.")), Detection.of(declaredFormat));
        }
        return switch (declaredFormat) {
            case CSV -> readCsv(content, rules);
            case XLSX -> readXlsx(content, rules);
            case JSON -> readJson(content, rules);
        };
    }

    private IntakeResult readCsv(byte[] content, UploadRules rules) {
        CsvUploadReader reader = new CsvUploadReader(limits);
        List<IntakeProblem> problems = new ArrayList<>();
        try {
            Table table = reader.read(content, problems);
            List<RawRow> rows = table.toRawRows(rules, true, problems);
            ResultValidator.NumberStyle style = reader.detection().delimiter() == ';'
                    ? ResultValidator.NumberStyle.POINT_OR_COMMA_CONSISTENT
                    : ResultValidator.NumberStyle.POINT_ONLY;
            return outcome(new ResultValidator(rules, limits, style, UploadColumn::headerName)
                    .validate(rows, problems), reader.detection());
        } catch (UploadRejectedException e) {
            return new IntakeResult.Rejected(e.problems(), reader.detection());
        } catch (RuntimeException e) {
            return unreadable(reader.detection());
        }
    }

    private IntakeResult readXlsx(byte[] content, UploadRules rules) {
        XlsxUploadReader reader = new XlsxUploadReader(limits);
        List<IntakeProblem> problems = new ArrayList<>();
        try {
            Table table = reader.read(content);
            List<RawRow> rows = table.toRawRows(rules, false, problems);
            return outcome(new ResultValidator(rules, limits, ResultValidator.NumberStyle.POINT_OR_COMMA,
                    UploadColumn::headerName).validate(rows, problems), reader.detection());
        } catch (UploadRejectedException e) {
            return new IntakeResult.Rejected(e.problems(), reader.detection());
        } catch (RuntimeException e) {
            return unreadable(reader.detection());
        }
    }

    private IntakeResult readJson(byte[] content, UploadRules rules) {
        JsonUploadReader reader = new JsonUploadReader(limits, jsonMapper);
        List<IntakeProblem> problems = new ArrayList<>();
        try {
            List<RawRow> rows = reader.read(content, problems);
            return outcome(new ResultValidator(rules, limits, ResultValidator.NumberStyle.POINT_ONLY,
                    UploadColumn::jsonName).validate(rows, problems), reader.detection());
        } catch (UploadRejectedException e) {
            return new IntakeResult.Rejected(e.problems(), reader.detection());
        } catch (RuntimeException e) {
            return unreadable(reader.detection());
        }
    }

    private static IntakeResult outcome(ResultValidator.Outcome outcome, Detection detection) {
        Detection detected = detection.withDecimalSeparator(outcome.decimalSeparator());
        if (!outcome.problems().isEmpty()) {
            // stable sort: file-level problems first, then by row; within a row in the order found
            List<IntakeProblem> problems = new ArrayList<>(outcome.problems());
            problems.sort(Comparator.comparingInt(IntakeProblem::row));
            return new IntakeResult.Rejected(problems, detected);
        }
        String canonicalJson = CanonicalPayload.toJson(outcome.results());
        return new IntakeResult.Accepted(outcome.results(), outcome.warnings(), detected, canonicalJson,
                CanonicalPayload.sha256Hex(canonicalJson));
    }

    private static IntakeResult unreadable(Detection detection) {
        return new IntakeResult.Rejected(List.of(IntakeProblem.ofFile(IntakeKey.FILE_UNREADABLE,
                "The file could not be read.")), detection);
    }
}
