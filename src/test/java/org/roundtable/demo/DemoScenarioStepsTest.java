package org.roundtable.demo;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.time.LocalDateTime;
import java.time.ZoneId;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.function.Function;
import java.util.stream.Collectors;
import org.junit.jupiter.api.Test;
import org.roundtable.account.DemoAccounts;
import org.roundtable.submission.DemoSubmissions;

/**
 * The demo scenario's plan, without a server: its steps come in time order and in the order a round must take
 * them, so that no result is received after its deadline (but the one planted late) and no report is issued before
 * its round closed; the planted problems are in the numbers; the upload files in rounds-demo/files are the
 * generator's results of the open round.
 */
class DemoScenarioStepsTest {

    static final Instant FIRST_START = Instant.parse("2026-12-02T12:00:00Z");

    List<DemoScenario.Step> steps() {
        List<DemoAccounts.Loaded> labs = new ArrayList<>();
        for (int i = 0; i < 24; i++) {
            labs.add(new DemoAccounts.Loaded(100 + i, "lab" + i + ".manager", null, "Organisation " + i));
        }
        return new DemoScenario(null, null, null, null, null).steps(FIRST_START, labs);
    }

    @Test
    void stepsRunInTimeOrderAfterTheAccountsAndTheOpenRoundIsOpenAtTheFirstStart() {
        List<DemoScenario.Step> steps = steps();
        assertThat(steps).isSortedAccordingTo((a, b) -> a.at().compareTo(b.at()));
        assertThat(steps.get(0).at()).isAfter(DemoScenario.accountsAt(FIRST_START));
        assertThat(steps).allMatch(s -> s.at().isBefore(FIRST_START));
        List<String> codes = steps.stream().map(DemoScenario.Step::what).filter(w -> w.endsWith(" prepared"))
                .map(w -> w.substring(0, w.indexOf(' '))).toList();
        assertThat(codes).containsExactly("NLS-2026-1", "NLS-2026-2", "NAL-2026-1", "NLS-2026-3", "NLS-2026-4");
        // the open round: opened, some results in, nothing closed or issued
        assertThat(steps).noneMatch(s -> s.what().startsWith("NLS-2026-4 closed") || s.what().startsWith("NLS-2026-4 reports"));
        assertThat(steps.stream().filter(s -> s.what().startsWith("NLS-2026-4 results"))).hasSize(DemoScenario.OPEN_ROUND_REPORTED.size());
    }

    @Test
    void eachPastRoundIsPreparedDispatchedOpenedReportedClosedEvaluatedAndIssuedInThatOrder() {
        Map<String, Instant> at = steps().stream().collect(Collectors.toMap(DemoScenario.Step::what,
                DemoScenario.Step::at, (a, b) -> a));
        for (String code : List.of("NLS-2026-1", "NLS-2026-2", "NLS-2026-3", "NAL-2026-1")) {
            Function<String, Instant> step = what -> at.get(code + " " + what);
            assertThat(step.apply("prepared")).isBefore(step.apply("dispatched"));
            assertThat(step.apply("dispatched")).isBefore(step.apply("opened"));
            assertThat(step.apply("closed")).isBefore(step.apply("evaluated"));
            assertThat(step.apply("evaluated")).isBefore(step.apply("reports"));
            Instant deadline = deadline(step.apply("dispatched"));
            at.forEach((what, when) -> {
                if (what.startsWith(code + " received")) {
                    assertThat(when).as(what).isAfter(step.apply("dispatched")).isBefore(deadline);
                }
                if (what.startsWith(code + " results")) {
                    assertThat(when).as(what).isAfter(step.apply("opened")).isBefore(step.apply("closed"));
                    boolean planted = code.equals("NLS-2026-1") && what.endsWith("lab" + DemoScenario.LATE_LAB + ".manager");
                    assertThat(when.isAfter(deadline)).as(what).isEqualTo(planted);
                }
            });
        }
        // the missing laboratory of the second round has no results there
        assertThat(at).doesNotContainKey("NLS-2026-2 results of lab" + DemoScenario.MISSING_LAB + ".manager");
    }

    @Test
    void thePlantedSlipsAreInTheNumbers() {
        String sulfur = value(DemoScenario.steelResults(1, DemoScenario.UNIT_SLIP_LAB), "S");
        assertThat(Double.parseDouble(sulfur)).as("mg/kg typed as %").isGreaterThan(10);
        String manganese = value(DemoScenario.steelResults(2, DemoScenario.DECIMAL_SLIP_LAB), "Mn");
        assertThat(Double.parseDouble(manganese)).as("a decimal slipped").isGreaterThan(5);
        String nickel = value(DemoScenario.steelResults(3, DemoScenario.BLUNDER_LAB), "Ni");
        assertThat(Double.parseDouble(nickel)).as("a decimal slipped, inside the range 0.006–5.0").isBetween(1.0, 5.0);
        assertThat(DemoScenario.OPEN_ROUND_REPORTED).contains(DemoScenario.BLUNDER_LAB);
        assertThat(value(DemoScenario.steelResults(0, 4), "V")).isEqualTo("<0.005");
        assertThat(value(DemoScenario.steelResults(0, 20), "V")).isEqualTo("<0.002");
        // the drifting laboratory's Mn bias grows over the past rounds: 0.047, 0.055, 0.069 against σpt 0.020
        assertThat(DemoScenario.DRIFT_MN[0]).isLessThan(DemoScenario.DRIFT_MN[1]);
        assertThat(DemoScenario.DRIFT_MN[1]).isLessThan(DemoScenario.DRIFT_MN[2]);
        // carbon: spark OES reads higher than combustion in every round
        for (int r = 0; r < 4; r++) {
            double spark = 0;
            double combustion = 0;
            int nSpark = 0;
            int nCombustion = 0;
            for (int lab = 0; lab < 24; lab++) {
                DemoSubmissions.Result c = DemoScenario.steelResults(r, lab).get(0);
                if (c.method().equals("combustion")) {
                    combustion += Double.parseDouble(c.value());
                    nCombustion++;
                } else {
                    spark += Double.parseDouble(c.value());
                    nSpark++;
                }
            }
            assertThat(spark / nSpark - combustion / nCombustion).as("round " + r).isGreaterThan(0.010);
        }
    }

    @Test
    void theUploadFilesAreTheOpenRoundsResultsOfTheLaboratoriesThatHaveNotReported() throws Exception {
        String kestrel = Files.readString(Path.of("rounds-demo/files/kestrel-results.csv"), StandardCharsets.UTF_8);
        for (DemoSubmissions.Result r : DemoScenario.steelResults(3, 0)) {
            assertThat(kestrel).contains(r.element() + "," + r.value() + "," + r.unit() + ",");
        }
        String calderon = Files.readString(Path.of("rounds-demo/files/calderon-results.csv"), StandardCharsets.UTF_8);
        for (DemoSubmissions.Result r : DemoScenario.steelResults(3, 4)) {
            assertThat(calderon).contains(r.element() + ";" + r.value().replace('.', ',') + ";" + r.unit() + ";");
        }
        assertThat(calderon).contains("\r\n");
        assertThat(Files.readAllBytes(Path.of("rounds-demo/files/tarnvik-results.xlsx"))).startsWith((byte) 'P', (byte) 'K');
        assertThat(DemoScenario.OPEN_ROUND_REPORTED).doesNotContain(0, 3, 4);
        assertThat(Files.readString(Path.of("rounds-demo/files/open-round-homogeneity.csv")))
                .isEqualTo(DemoScenario.homogeneity(DemoScenario.STEEL, 3, "Mn", "Si"));
    }

    private static Instant deadline(Instant dispatched) {
        LocalDateTime local = LocalDateTime.ofInstant(dispatched, java.time.ZoneOffset.UTC).toLocalDate().plusDays(28)
                .atTime(17, 0);
        return local.atZone(ZoneId.of("Europe/London")).toInstant();
    }

    private static String value(List<DemoSubmissions.Result> results, String element) {
        return results.stream().filter(r -> r.element().equals(element)).findFirst().orElseThrow().value();
    }
}
