package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;
import static org.cryowarden.rules.engine.Site.at;
import static org.cryowarden.rules.engine.Site.q;

import java.util.List;
import java.util.Map;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.DerivedChannelDef;
import org.junit.jupiter.api.Test;

class PhysicsFunctionsTest {

    @Test
    void bathTemperatureFollowsFromBathPressureByName() {
        Site site = new Site().channel("bath_p", Unit.KILOPASCAL)
                .derived("bath_t", "he4_saturation_temperature", Unit.KELVIN, "bath_p");
        // ITS-90 (Preston-Thomas, Metrologia 27 (1990)), helium-4 normal boiling point: 101.325 kPa -> 4.2221 K.
        site.read("bath_p", 101.325, Unit.KILOPASCAL);

        assertThat(site.engine().latest("bath_t").orElseThrow().value()).isCloseTo(4.2221, within(1e-4));
    }

    @Test
    void bathPressureOutsideTheEquationGivesABadReadingNamingTheRange() {
        Site site = new Site().channel("bath_p", Unit.KILOPASCAL)
                .derived("bath_t", "he4_saturation_temperature", Unit.KELVIN, "bath_p");
        // 300 kPa is above the helium-4 equation's 5.0 K end (about 196 kPa, ITS-90 Table 3 range).
        site.read("bath_p", 300, Unit.KILOPASCAL);

        Reading bad = site.engine().latest("bath_t").orElseThrow();
        assertThat(bad.quality()).isEqualTo(Quality.BAD);
        assertThat(bad.reason()).startsWith("he4_saturation_temperature: ").contains("K");
    }

    @Test
    void platinumThermometerResistanceBecomesCelsius() {
        Site site = new Site().channel("shield_r", Unit.OHM)
                .derived(new DerivedChannelDef("shield_t", "prt_temperature", List.of("shield_r"), Unit.CELSIUS,
                        Map.of("r0", q("100 ohm")), "shield", at("shield_t")));
        // IEC 60751:2008 table, Pt100: 60.26 ohm at -100 °C; the table rounds to 0.01 ohm, about 0.025 K there.
        site.read("shield_r", 60.26, Unit.OHM);

        assertThat(site.engine().latest("shield_t").orElseThrow().value()).isCloseTo(-100.0, within(0.03));
    }

    @Test
    void levelHeightBecomesLitresInAFlatBottomedDewar() {
        Site site = new Site().channel("ln2_h", Unit.MILLIMETRE)
                .derived(new DerivedChannelDef("ln2_l", "litres_flat_bottom", List.of("ln2_h"), Unit.LITRE,
                        Map.of("diameter", q("500 mm"), "straight_length", q("1 m")), "litres", at("ln2_l")));
        // Cylinder volume pi d^2 h / 4 (common practice): d = 0.5 m, h = 0.4 m -> 78.54 L.
        site.read("ln2_h", 400, Unit.MILLIMETRE);

        assertThat(site.engine().latest("ln2_l").orElseThrow().value()).isCloseTo(78.54, within(0.01));
    }

    @Test
    void oxygenPartialPressureUsesTheBarometricPressure() {
        Site site = new Site().channel("o2", Unit.PERCENT_VOLUME).channel("baro", Unit.MILLIBAR)
                .derived("o2_pp", "oxygen_partial_pressure", Unit.KILOPASCAL, "o2", "baro");
        // Fraction times barometric pressure (Dalton's law, common practice): 20.9 % of 1013.25 mbar = 21.18 kPa.
        site.read("o2", 20.9, Unit.PERCENT_VOLUME);
        site.read("baro", 1013.25, Unit.MILLIBAR);

        assertThat(site.engine().latest("o2_pp").orElseThrow().value()).isCloseTo(21.177, within(0.001));
    }
}
