package org.roundtable.platform;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.junit.jupiter.api.Test;

import static org.assertj.core.api.Assertions.assertThat;

/** CSV exports are safe against spreadsheet formula injection and stay valid RFC 4180. */
class CsvTextTest {

    @ParameterizedTest
    @ValueSource(strings = {"=HYPERLINK(\"http://x\")", "+1+1", "-2+3", "@SUM(A1:A2)", "\tTAB", "\rCR", "\0NUL"})
    void aFormulaPrefixedValueIsNeutralised(String value) {
        String cell = CsvText.cell(value);
        String unquoted = cell.startsWith("\"") ? cell.substring(1, cell.length() - 1).replace("\"\"", "\"") : cell;
        assertThat(unquoted).startsWith("'").isEqualTo("'" + value);
    }

    @Test
    void theClassicPayloadsAreQuotedAndPrefixed() {
        assertThat(CsvText.cell("=1+2")).isEqualTo("'=1+2");
        assertThat(CsvText.cell("=cmd|' /C calc'!A0")).isEqualTo("'=cmd|' /C calc'!A0");
        assertThat(CsvText.cell("@SUM(1,2)")).isEqualTo("\"'@SUM(1,2)\"");
        assertThat(CsvText.cell("\rX")).isEqualTo("\"'\rX\"");
    }

    @Test
    void ordinaryTextIsUnchangedOrQuoted() {
        assertThat(CsvText.cell("Northfield")).isEqualTo("Northfield");
        assertThat(CsvText.cell("a,b")).isEqualTo("\"a,b\"");
        assertThat(CsvText.cell("say \"hi\"")).isEqualTo("\"say \"\"hi\"\"\"");
        assertThat(CsvText.cell("")).isEmpty();
        assertThat(CsvText.cell(null)).isEmpty();
    }

    @Test
    void numbersWeComputedKeepTheirSign() {
        assertThat(CsvText.number(-1.5)).isEqualTo("-1.5");
        assertThat(CsvText.number(null)).isEmpty();
    }
}
