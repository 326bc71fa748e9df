package org.roundtable.web;

import io.quarkus.qute.Engine;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.enterprise.context.control.ActivateRequestContext;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.platform.Paging;
import org.roundtable.statistics.score.Classification;

import java.time.OffsetDateTime;
import java.util.Map;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * The shared tags under templates/tags render by the product's rules: numbers through NumberFormats, times with
 * their zone, scores with their verdict (none for information-only scores), fields keeping the typed value with
 * their problem beside them, tables with pages. (An anonymous viewer sees the installation's zone: UTC in tests.)
 */
@QuarkusTest
class TagsTest {

    @Inject
    Engine engine;

    private String render(String template, Map<String, Object> data) {
        var instance = engine.parse(template).instance();
        data.forEach(instance::data);
        return instance.render().strip();
    }

    @Test
    @ActivateRequestContext
    void numbersFollowTheProductsRules() {
        assertThat(render("{#number x digits=2 /}", Map.of("x", 0.125))).contains(">0.13<");
        assertThat(render("{#number x digits=2 kind='statistic' /}", Map.of("x", -0.0125))).contains(">\u22120.013<");
        assertThat(render("{#quantity x digits=3 unit='%' u=u k=2 /}", Map.of("x", 1.2345, "u", 0.01234)))
                .contains(">1.235<").contains("± <span class=\"num\">0.0123</span> %").contains("<i>k</i> = 2");
    }

    @Test
    @ActivateRequestContext
    void aScoreCarriesItsVerdictUnlessItIsForInformationOnly() {
        String judged = render("{#score z decimals=2 verdict=v /}", Map.of("z", 2.456, "v", Classification.QUESTIONABLE));
        assertThat(judged).contains("+2.46").contains("verdict-questionable").contains("Questionable");
        String named = render("{#score z decimals=1 verdict='UNSATISFACTORY' /}", Map.of("z", -3.04));
        assertThat(named).contains("\u22123.0").contains("Unsatisfactory");
        String information = render("{#score z decimals=2 informationOnly=true verdict=v /}",
                Map.of("z", 1.0, "v", Classification.SATISFACTORY));
        assertThat(information).contains("+1.00").contains("for information").doesNotContain("verdict");
    }

    @Test
    @ActivateRequestContext
    void timesNameTheirZoneAndDeadlinesShowTheRoundsZone() {
        OffsetDateTime t = OffsetDateTime.parse("2026-12-02T18:00:00Z");
        assertThat(render("{#time t /}", Map.of("t", t))).contains(">2026-12-02 18:00 UTC<")
                .contains("datetime=\"2026-12-02T18:00:00Z\"");
        assertThat(render("{#deadline t zone='Europe/London' /}", Map.of("t", t)))
                .contains("2026-12-02 18:00 Europe/London (18:00 UTC)");
    }

    @Test
    @ActivateRequestContext
    void aFieldKeepsTheTypedValueAndShowsItsProblemBesideIt() {
        String html = render("{#field name='value' label='Value' value=typed problem=problem /}",
                Map.of("typed", "0,12x", "problem", "The value is not a number."));
        assertThat(html).contains("value=\"0,12x\"").contains("aria-invalid=\"true\"")
                .contains("aria-describedby=\"value-problem\"").contains("The value is not a number.");
        assertThat(render("{#field name='value' label='Value' value='' /}", Map.of())).doesNotContain("aria-invalid");
    }

    @Test
    @ActivateRequestContext
    void aTableShowsItsPageAndLinksTheNextKeepingTheSearch() {
        String html = render("{#table paging=p path='/laboratories' caption='Laboratories' search=q}<tbody></tbody>{/table}",
                Map.of("p", Paging.of(2, 5, 12), "q", "steel works"));
        assertThat(html).contains("Rows 6–10 of 12.").contains("Page 2 of 3")
                .contains("href=\"/laboratories?page=3&amp;q=steel+works\"").contains("href=\"/laboratories?page=1&amp;q=steel+works\"")
                .contains("value=\"steel works\"");
    }
}
