package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.cryowarden.rules.engine.Site.alarm;
import static org.cryowarden.rules.engine.Site.at;
import static org.cryowarden.rules.engine.Site.q;

import java.util.List;
import java.util.Map;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.DerivedChannelDef;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.Priority;
import org.junit.jupiter.api.Test;

class DerivedChannelTest {

    @Test
    void lowestOfThreeOxygenSensorsFeedsALimitRuleLikeAMeasuredChannel() {
        Site site = oxygenTrio().derived("o2_min", "min", Unit.PERCENT_VOLUME, "o2_a", "o2_b", "o2_c")
                .rule(new LimitRule("o2_min_low", "o2_min", Direction.LOW, q("19.5 %vol"), q("0 %vol"),
                        alarm(Priority.HIGH, "Oxygen low somewhere in the hall"), at("o2_min_low")));
        site.read("o2_a", 20.9, Unit.PERCENT_VOLUME);
        site.read("o2_b", 20.8, Unit.PERCENT_VOLUME);

        assertThat(site.engine().latest("o2_min")).isEmpty();
        assertThat(site.read("o2_c", 19.1, Unit.PERCENT_VOLUME)).containsExactly(
                "18:00:00 o2_min_low normal -> active-unacknowledged: o2_min 19.1 %vol below 19.5 %vol");
    }

    @Test
    void maxMeanAndDifferenceComputeInTheDerivedChannelUnit() {
        Site site = new Site().channel("t_top", Unit.KELVIN).channel("t_bottom", Unit.CELSIUS)
                .derived("t_max", "max", Unit.KELVIN, "t_top", "t_bottom")
                .derived("t_mean", "mean", Unit.KELVIN, "t_top", "t_bottom")
                .derived("t_gradient", "difference", Unit.KELVIN, "t_top", "t_bottom");
        site.read("t_top", 80.0, Unit.KELVIN);
        // -195.15 °C = 78 K (0 °C = 273.15 K).
        site.read("t_bottom", -195.15, Unit.CELSIUS);

        assertThat(value(site, "t_max")).isEqualTo(80.0);
        assertThat(value(site, "t_mean")).isCloseTo(79.0, org.assertj.core.data.Offset.offset(1e-9));
        assertThat(value(site, "t_gradient")).isCloseTo(2.0, org.assertj.core.data.Offset.offset(1e-9));
    }

    @Test
    void derivedQualityIsTheWorstOfItsInputsWithTheReason() {
        Site site = oxygenTrio().derived("o2_mean", "mean", Unit.PERCENT_VOLUME, "o2_a", "o2_b", "o2_c");
        site.read("o2_a", 20.9, Unit.PERCENT_VOLUME);
        site.read("o2_b", 20.8, Unit.PERCENT_VOLUME, Quality.UNCERTAIN, "cell end of life");
        site.read("o2_c", 20.7, Unit.PERCENT_VOLUME);

        Reading uncertain = site.engine().latest("o2_mean").orElseThrow();
        assertThat(uncertain.quality()).isEqualTo(Quality.UNCERTAIN);
        assertThat(uncertain.reason()).isEqualTo("from o2_b 20.8 %vol UNCERTAIN (cell end of life)");
    }

    @Test
    void aggregateOverSensorsWithOneDeadIsComputedFromTheOthersAsUncertain() {
        Site site = oxygenTrio().derived("o2_mean", "mean", Unit.PERCENT_VOLUME, "o2_a", "o2_b", "o2_c");
        site.read("o2_a", 20.9, Unit.PERCENT_VOLUME);
        site.read("o2_b", 20.7, Unit.PERCENT_VOLUME);
        site.bad("o2_c", Unit.PERCENT_VOLUME, "no reply");

        Reading partial = site.engine().latest("o2_mean").orElseThrow();
        assertThat(partial.quality()).isEqualTo(Quality.UNCERTAIN);
        assertThat(partial.value()).isCloseTo(20.8, org.assertj.core.data.Offset.offset(1e-9));
        assertThat(partial.reason()).isEqualTo("over 2 of 3 inputs; from o2_c BAD (no reply)");
    }

    @Test
    void lowestOxygenStillAlarmsWhenOneOfTheThreeSensorsIsDead() {
        // 19.5 %vol: oxygen deficient below it (29 CFR 1910.146(b)). A dead sensor must not blind the others.
        Site site = oxygenTrio().derived("o2_min", "min", Unit.PERCENT_VOLUME, "o2_a", "o2_b", "o2_c")
                .rule(new LimitRule("o2_min_low", "o2_min", Direction.LOW, q("19.5 %vol"), q("0 %vol"),
                        alarm(Priority.HIGH, "Oxygen low somewhere in the hall"), at("o2_min_low")));
        site.read("o2_a", 20.9, Unit.PERCENT_VOLUME);
        site.read("o2_b", 20.9, Unit.PERCENT_VOLUME);
        site.bad("o2_c", Unit.PERCENT_VOLUME, "wire break");

        assertThat(site.read("o2_b", 18.9, Unit.PERCENT_VOLUME)).hasSize(1)
                .allSatisfy(line -> assertThat(line).contains("o2_min_low normal -> active-unacknowledged"));
    }

    @Test
    void aggregateWithEveryInputDeadIsBad() {
        Site site = new Site().channel("p_a", Unit.KILOPASCAL).channel("p_b", Unit.KILOPASCAL)
                .derived("p_max", "max", Unit.KILOPASCAL, "p_a", "p_b");
        site.bad("p_a", Unit.KILOPASCAL, "no reply");
        site.bad("p_b", Unit.KILOPASCAL, "bad CRC");

        Reading bad = site.engine().latest("p_max").orElseThrow();
        assertThat(bad.quality()).isEqualTo(Quality.BAD);
        assertThat(bad.value()).isNaN();
    }

    @Test
    void differenceWithADeadInputIsBadWithTheInputsReason() {
        Site site = new Site().channel("t_top", Unit.KELVIN).channel("t_bottom", Unit.KELVIN)
                .derived("t_gradient", "difference", Unit.KELVIN, "t_top", "t_bottom");
        site.read("t_top", 80.0, Unit.KELVIN);
        site.bad("t_bottom", Unit.KELVIN, "no reply");

        Reading bad = site.engine().latest("t_gradient").orElseThrow();
        assertThat(bad.quality()).isEqualTo(Quality.BAD);
        assertThat(bad.value()).isNaN();
        assertThat(bad.reason()).isEqualTo("from t_bottom BAD (no reply)");
    }

    @Test
    void derivedChannelsMayBeBuiltOnDerivedChannels() {
        Site site = oxygenTrio()
                .derived("o2_spread", "difference", Unit.PERCENT_VOLUME, "o2_high", "o2_low")
                .derived("o2_high", "max", Unit.PERCENT_VOLUME, "o2_a", "o2_b", "o2_c")
                .derived("o2_low", "min", Unit.PERCENT_VOLUME, "o2_a", "o2_b", "o2_c");
        site.read("o2_a", 20.9, Unit.PERCENT_VOLUME);
        site.read("o2_b", 20.1, Unit.PERCENT_VOLUME);
        site.read("o2_c", 20.5, Unit.PERCENT_VOLUME);

        assertThat(value(site, "o2_spread")).isCloseTo(0.8, org.assertj.core.data.Offset.offset(1e-9));
    }

    @Test
    void functionRegisteredInTheCatalogueGetsItsInputsAndParametersInItsOwnUnits() {
        // Hydrostatic head of a liquid column, p = rho g h: 1 m of liquid nitrogen (806 kg/m3, NIST via
        // Jacobsen et al. 1986) with g = 9.80665 m/s2 (standard gravity, CGPM 1901) is 7904.2 Pa.
        DerivedFunctions catalogue = DerivedFunctions.builtIn().with(DerivedFunctions.Entry.fixedUnits(
                "ln2_head", "hydrostatic pressure of a liquid-nitrogen column", List.of(Unit.METRE), Unit.PASCAL,
                List.of(new DerivedFunctions.Parameter("density_kg_m3", Unit.ONE)),
                (in, p) -> in[0] < 0 ? Double.NaN : p[0] * 9.80665 * in[0]));
        Site site = new Site().functions(catalogue).channel("ln2_height", Unit.MILLIMETRE)
                .derived(new DerivedChannelDef("ln2_head_p", "ln2_head", List.of("ln2_height"), Unit.MILLIBAR,
                        Map.of("density_kg_m3", q("806 1")), "head", at("ln2_head_p")));

        site.read("ln2_height", 1000, Unit.MILLIMETRE);
        assertThat(value(site, "ln2_head_p")).isCloseTo(79.042, org.assertj.core.data.Offset.offset(0.001));

        site.read("ln2_height", -5, Unit.MILLIMETRE);
        Reading undefined = site.engine().latest("ln2_head_p").orElseThrow();
        assertThat(undefined.quality()).isEqualTo(Quality.BAD);
        assertThat(undefined.reason()).isEqualTo("ln2_head has no value for these inputs");
    }

    @Test
    void builtInCatalogueNamesItsFunctions() {
        assertThat(DerivedFunctions.builtIn().names()).containsExactly("min", "max", "mean", "difference",
                "he4_saturation_temperature", "n2_saturation_temperature", "prt_temperature", "level_probe_height", "probe_percent_height",
                "litres_flat_bottom", "litres_hemispherical_bottom", "litres_asme_fd_bottom",
                "litres_torispherical_bottom", "oxygen_partial_pressure", "boiloff_helium", "boiloff_nitrogen");
        assertThatThrownBy(() -> DerivedFunctions.builtIn().with(
                DerivedFunctions.Entry.sameUnit("mean", "again", 1, 2, (in, p) -> in[0])))
                .hasMessage("a derived function named mean already exists");
    }

    private static double value(Site site, String channel) {
        return site.engine().latest(channel).orElseThrow().value();
    }

    private static Site oxygenTrio() {
        return new Site().channel("o2_a", Unit.PERCENT_VOLUME).channel("o2_b", Unit.PERCENT_VOLUME)
                .channel("o2_c", Unit.PERCENT_VOLUME);
    }
}
