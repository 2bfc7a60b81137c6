package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;
import static org.cryowarden.rules.engine.Site.alarm;
import static org.cryowarden.rules.engine.Site.at;
import static org.cryowarden.rules.engine.Site.q;

import java.util.List;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.DeviationRule;
import org.cryowarden.rules.model.Priority;
import org.junit.jupiter.api.Test;

class DeviationRuleTest {

    @Test
    void redundantSensorsThatDisagreeByMoreThanTheToleranceAlarm() {
        Site site = oxygenTrio();
        site.read("o2_a", 20.9, Unit.PERCENT_VOLUME);
        site.read("o2_b", 20.8, Unit.PERCENT_VOLUME);

        assertThat(site.read("o2_c", 19.6, Unit.PERCENT_VOLUME)).containsExactly(
                "18:00:00 o2_disagree normal -> active-unacknowledged: "
                        + "o2_a and o2_c differ by 1.3 %vol, more than the tolerance of 1 %vol");
        assertThat(site.read("o2_c", 20.7, Unit.PERCENT_VOLUME)).containsExactly(
                "18:00:00 o2_disagree active-unacknowledged -> returned-unacknowledged: "
                        + "spread back to 0.2 %vol, within the tolerance of 1 %vol");
    }

    @Test
    void spreadAtTheToleranceIsNotADisagreement() {
        Site site = oxygenTrio();
        site.read("o2_a", 20.5, Unit.PERCENT_VOLUME);

        assertThat(site.read("o2_b", 19.5, Unit.PERCENT_VOLUME)).isEmpty();
    }

    @Test
    void badSensorIsLeftOutOfTheSpread() {
        Site site = oxygenTrio();
        site.read("o2_a", 20.9, Unit.PERCENT_VOLUME);
        site.read("o2_b", 20.8, Unit.PERCENT_VOLUME);
        site.read("o2_c", 17.0, Unit.PERCENT_VOLUME);

        assertThat(site.bad("o2_c", Unit.PERCENT_VOLUME, "cell open circuit")).containsExactly(
                "18:00:00 o2_disagree active-unacknowledged -> returned-unacknowledged: "
                        + "spread back to 0.1 %vol, within the tolerance of 1 %vol");
    }

    @Test
    void sensorsInCelsiusAndKelvinAreComparedInTheFirstChannelUnit() {
        Site site = new Site().channel("t_shield_a", Unit.KELVIN).channel("t_shield_b", Unit.CELSIUS)
                .rule(new DeviationRule("shield_disagree", List.of("t_shield_a", "t_shield_b"), q("2 K"),
                        alarm(Priority.LOW, "Shield thermometers disagree"), at("shield_disagree")));
        site.read("t_shield_a", 80.0, Unit.KELVIN);

        // -193.15 °C = 80 K (0 °C = 273.15 K, ITS-90 convention).
        assertThat(site.read("t_shield_b", -191.5, Unit.CELSIUS)).isEmpty();
        assertThat(site.read("t_shield_b", -190.0, Unit.CELSIUS)).containsExactly(
                "18:00:00 shield_disagree normal -> active-unacknowledged: "
                        + "t_shield_b and t_shield_a differ by 3.15 K, more than the tolerance of 2 K");
    }

    private static Site oxygenTrio() {
        return new Site().channel("o2_a", Unit.PERCENT_VOLUME).channel("o2_b", Unit.PERCENT_VOLUME)
                .channel("o2_c", Unit.PERCENT_VOLUME)
                .rule(new DeviationRule("o2_disagree", List.of("o2_a", "o2_b", "o2_c"), q("1 %vol"),
                        alarm(Priority.LOW, "Oxygen sensors disagree"), at("o2_disagree")));
    }
}
