package org.roundtable.evaluation;

import org.junit.jupiter.api.Test;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * Warning texts for people: the trade's symbols, decisions by their label, numbers through NumberFormats; the codes
 * stay as they are. The numbers are the raw doubles of texts stored before this pass (common practice, no source).
 */
class WarningTextsTest {

    @Test
    void aQuantityOfTheMeasurandPrintsAtItsReportingDigitsPlusOne() {
        String text = WarningTexts.forPeople("method-groups-differ",
                "The method groups' robust means differ by 0.01335989289173295 %, more than the 0.01 the plan allows", 2);
        assertThat(text).isEqualTo("The method groups' robust means differ by 0.013 %, more than the 0.010 the plan allows");
    }

    @Test
    void internalSpellingsBecomeTheTradesSymbolsAndDecisionsTheirLabels() {
        String text = WarningTexts.forPeople("sigma-pt-widened", "sigma_pt widened by the between-item SD"
                + " (qualification decision WIDEN_SIGMA_PT): sqrt(0.1² + s_s²) with s_s = 0.011690451944500121 gives"
                + " 0.10068101443296326 %", 2);
        assertThat(text).isEqualTo("σpt widened by the between-item SD (qualification decision “Widen σpt”):"
                + " √(0.100² + ss²) with ss = 0.012 gives 0.101 %");
        assertThat(WarningTexts.forPeople("uncertainty-of-assigned-value-large",
                "u(x_pt) > 0.3·sigma_pt: z' is used instead of z (ISO 13528:2015, 9.2.1); u(x_pt) <= 0.3·sigma_pt fails", 3))
                .isEqualTo("u(xpt) > 0.3·σpt: z' is used instead of z (ISO 13528:2015, 9.2.1); u(xpt) ≤ 0.3·σpt fails");
    }

    @Test
    void otherNumbersKeepTheirFewDigitsAndARawDoubleIsCut() {
        String text = WarningTexts.forPeople("multimodal", "bootstrap p = 0.012 < 0.05 (200 samples), ratio 0.6666666666666666", 3);
        assertThat(text).isEqualTo("bootstrap p = 0.012 < 0.05 (200 samples), ratio 0.6667");
        assertThat(WarningTexts.forPeople("subset-consensus", "consensus of method group SPARK_OES", 3))
                .isEqualTo("consensus of method group Spark OES");
        assertThat(WarningTexts.forPeople("negative-between-variance", "s_d^2 < s_r^2: s_L set to 0", null))
                .isEqualTo("sd² < sr²: sL set to 0");
    }

    @Test
    void withoutTheMeasurandsDigitsAQuantityHasFourSignificantDigits() {
        assertThat(WarningTexts.quantity(0.01335989289173295, null)).isEqualTo("0.01336");
        assertThat(WarningTexts.quantity(0.01335989289173295, 3)).isEqualTo("0.0134");
        assertThat(WarningTexts.share(41.66666666666667)).isEqualTo("41.7");
    }
}
