package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;
import static org.cryowarden.rules.engine.Site.alarm;
import static org.cryowarden.rules.engine.Site.at;
import static org.cryowarden.rules.engine.Site.q;

import java.time.Duration;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.Priority;
import org.cryowarden.rules.model.ValueRange;
import org.junit.jupiter.api.Test;

class LimitRuleTest {

    @Test
    void oxygenBelowDeficiencyLimitRaisesUnacknowledgedAlarmWithTheReading() {
        Site site = oxygenSite(Duration.ZERO, Duration.ZERO, "0 %vol");
        Engine engine = site.engine();

        // 19.5 %vol: oxygen-deficient atmosphere, 29 CFR 1910.146(b).
        List<EngineEvent> events = engine.onReading(Reading.good("o2_hall", 19.4, Unit.PERCENT_VOLUME, site.clock.wallNow()));

        assertThat(events).hasSize(1);
        AlarmTransition transition = (AlarmTransition) events.get(0);
        assertThat(transition.alarmId()).isEqualTo("o2_low");
        assertThat(transition.from()).isEqualTo(AlarmState.NORMAL);
        assertThat(transition.to()).isEqualTo(AlarmState.UNACKNOWLEDGED);
        assertThat(transition.priority()).isEqualTo(Priority.HIGH);
        assertThat(transition.message()).isEqualTo("Oxygen below 19.5 %vol in the magnet hall");
        assertThat(transition.reading()).map(Reading::value).contains(19.4);
        assertThat(transition.operator()).isEmpty();
        assertThat(transition.cause()).isEqualTo("o2_hall 19.4 %vol below 19.5 %vol");
        assertThat(transition.instant()).isEqualTo(Site.START);
    }

    @Test
    void oxygenExactlyAtTheLimitIsNotDeficient() {
        Site site = oxygenSite(Duration.ZERO, Duration.ZERO, "0 %vol");

        // "less than 19.5 percent oxygen by volume" is deficient, 29 CFR 1910.146(b): 19.5 itself is not.
        assertThat(site.read("o2_hall", 19.5, Unit.PERCENT_VOLUME)).isEmpty();
        assertThat(site.state("o2_low")).isEqualTo(AlarmState.NORMAL);
    }

    @Test
    void deadbandHoldsTheConditionUntilTheValueIsBackPastIt() {
        Site site = oxygenSite(Duration.ZERO, Duration.ZERO, "0.3 %vol");

        assertThat(site.read("o2_hall", 19.4, Unit.PERCENT_VOLUME)).hasSize(1);
        assertThat(site.read("o2_hall", 19.7, Unit.PERCENT_VOLUME)).isEmpty();
        assertThat(site.read("o2_hall", 19.8, Unit.PERCENT_VOLUME)).containsExactly(
                "18:00:00 o2_low active-unacknowledged -> returned-unacknowledged: "
                        + "o2_hall 19.8 %vol back above 19.5 %vol by the deadband of 0.3 %vol");
    }

    @Test
    void onDelayRaisesTheAlarmExactlyWhenTheDelayHasPassed() {
        Site site = oxygenSite(Duration.ofSeconds(10), Duration.ZERO, "0 %vol");
        site.read("o2_hall", 20.9, Unit.PERCENT_VOLUME);
        site.advance(Duration.ofSeconds(1));
        assertThat(site.read("o2_hall", 19.3, Unit.PERCENT_VOLUME)).isEmpty();

        assertThat(site.tickFor(Duration.ofSeconds(9))).isEmpty();
        assertThat(site.advance(Duration.ofSeconds(1))).containsExactly(
                "18:00:11 o2_low normal -> active-unacknowledged: "
                        + "o2_hall 19.3 %vol below 19.5 %vol, held for the on-delay of 10s");
    }

    @Test
    void conditionClearingWithinTheOnDelayCancelsIt() {
        Site site = oxygenSite(Duration.ofSeconds(10), Duration.ZERO, "0 %vol");
        site.read("o2_hall", 19.3, Unit.PERCENT_VOLUME);
        site.advance(Duration.ofSeconds(9));
        site.read("o2_hall", 20.0, Unit.PERCENT_VOLUME);

        assertThat(site.tickFor(Duration.ofSeconds(30))).isEmpty();
        assertThat(site.state("o2_low")).isEqualTo(AlarmState.NORMAL);
    }

    @Test
    void offDelayKeepsTheAlarmActiveUntilTheConditionHasBeenClearThatLong() {
        Site site = oxygenSite(Duration.ZERO, Duration.ofSeconds(30), "0 %vol");
        site.read("o2_hall", 19.0, Unit.PERCENT_VOLUME);
        site.engine().acknowledge("o2_low", "dana", "");
        site.advance(Duration.ofSeconds(1));
        assertThat(site.read("o2_hall", 20.5, Unit.PERCENT_VOLUME)).isEmpty();

        assertThat(site.tickFor(Duration.ofSeconds(29))).isEmpty();
        assertThat(site.advance(Duration.ofSeconds(1))).containsExactly(
                "18:00:31 o2_low active-acknowledged -> normal: "
                        + "o2_hall 20.5 %vol back above 19.5 %vol, clear for the off-delay of 30s");
    }

    @Test
    void badReadingNeitherRaisesNorClearsTheCondition() {
        Site site = oxygenSite(Duration.ZERO, Duration.ZERO, "0 %vol");
        assertThat(site.bad("o2_hall", Unit.PERCENT_VOLUME, "cell open circuit")).isEmpty();
        site.read("o2_hall", 19.0, Unit.PERCENT_VOLUME);

        assertThat(site.bad("o2_hall", Unit.PERCENT_VOLUME, "cell open circuit")).isEmpty();
        assertThat(site.engine().alarm("o2_low").orElseThrow().conditionActive()).isTrue();
    }

    @Test
    void uncertainReadingMayRaiseTheConditionButNeverClearsIt() {
        Site site = oxygenSite(Duration.ZERO, Duration.ZERO, "0 %vol");

        assertThat(site.read("o2_hall", 19.0, Unit.PERCENT_VOLUME, Quality.UNCERTAIN, "loop current 3.7 mA"))
                .containsExactly("18:00:00 o2_low normal -> active-unacknowledged: "
                        + "o2_hall 19 %vol UNCERTAIN (loop current 3.7 mA) below 19.5 %vol");
        assertThat(site.read("o2_hall", 20.9, Unit.PERCENT_VOLUME, Quality.UNCERTAIN, "loop current 3.7 mA")).isEmpty();
        assertThat(site.read("o2_hall", 20.9, Unit.PERCENT_VOLUME)).hasSize(1);
    }

    @Test
    void setpointInKilopascalOnAMillibarChannelIsConverted() {
        Site site = new Site().channel("p_bath", Unit.MILLIBAR)
                .rule(new LimitRule("p_bath_high", "p_bath", Direction.HIGH, q("150 kPa"), q("0 kPa"),
                        alarm(Priority.HIGH, "Bath pressure high"), at("p_bath_high")));

        // 150 kPa = 1500 mbar (1 mbar = 100 Pa, SI definition).
        assertThat(site.read("p_bath", 1500, Unit.MILLIBAR)).isEmpty();
        assertThat(site.read("p_bath", 1500.5, Unit.MILLIBAR)).containsExactly(
                "18:00:00 p_bath_high normal -> active-unacknowledged: p_bath 1500.5 mbar above 1500 mbar");
    }

    @Test
    void gaugeSetpointOnAnAbsoluteChannelIsConvertedThroughTheSiteAmbientPressure() {
        // An invented lab at altitude with 95 kPa ambient: 0.5 bar(g) = 50 kPa + 95 kPa = 1.45 bar(a).
        Site site = new Site().ambient(95_000).channel("p_dewar", Unit.BAR)
                .rule(new LimitRule("p_dewar_high", "p_dewar", Direction.HIGH, q("0.5 bar(g)"), q("0 bar"),
                        alarm(Priority.CRITICAL, "Dewar pressure high"), at("p_dewar_high")));

        assertThat(site.read("p_dewar", 1.449, Unit.BAR)).isEmpty();
        assertThat(site.read("p_dewar", 1.451, Unit.BAR)).containsExactly(
                "18:00:00 p_dewar_high normal -> active-unacknowledged: p_dewar 1.451 bar above 1.45 bar");
    }

    @Test
    void deadbandInCelsiusIsADifferenceNotALevel() {
        Site site = new Site().channel("t_magnet", Unit.KELVIN)
                .rule(new LimitRule("t_magnet_high", "t_magnet", Direction.HIGH, q("5 K"), q("0.5 °C"),
                        alarm(Priority.HIGH, "Magnet warm"), at("t_magnet_high")));
        site.read("t_magnet", 5.2, Unit.KELVIN);

        // 0.5 °C of deadband is 0.5 K, not 273.65 K.
        assertThat(site.read("t_magnet", 4.6, Unit.KELVIN)).isEmpty();
        assertThat(site.read("t_magnet", 4.5, Unit.KELVIN)).hasSize(1);
    }

    @Test
    void readingInAnotherUnitOfTheSameDimensionIsConvertedIntoTheChannelUnit() {
        Site site = new Site().channel("p_bath", Unit.MILLIBAR)
                .rule(new LimitRule("p_bath_high", "p_bath", Direction.HIGH, q("1500 mbar"), q("0 mbar"),
                        alarm(Priority.HIGH, "Bath pressure high"), at("p_bath_high")));

        assertThat(site.read("p_bath", 151, Unit.KILOPASCAL)).containsExactly(
                "18:00:00 p_bath_high normal -> active-unacknowledged: p_bath 1510 mbar above 1500 mbar");
        assertThat(site.engine().latest("p_bath")).map(Reading::unit).contains(Unit.MILLIBAR);
    }

    @Test
    void readingOutsideTheValidRangeIsDowngradedToBadWithAReason() {
        Site site = new Site().channel("level_d1", Unit.PERCENT, Duration.ofSeconds(1), Duration.ofSeconds(5),
                        Optional.of(new ValueRange(0, 100)))
                .rule(new LimitRule("level_low", "level_d1", Direction.LOW, q("20 %"), q("0 %"),
                        alarm(Priority.MEDIUM, "Dewar D1 level low"), at("level_low")));

        assertThat(site.read("level_d1", -3, Unit.PERCENT)).isEmpty();
        Reading seen = site.engine().latest("level_d1").orElseThrow();
        assertThat(seen.quality()).isEqualTo(Quality.BAD);
        assertThat(seen.reason()).isEqualTo("value -3 % outside the valid range 0 to 100 %");
    }

    private static Site oxygenSite(Duration onDelay, Duration offDelay, String deadband) {
        return new Site().channel("o2_hall", Unit.PERCENT_VOLUME)
                .rule(new LimitRule("o2_low", "o2_hall", Direction.LOW, q("19.5 %vol"), q(deadband),
                        alarm(Priority.HIGH, "Oxygen below 19.5 %vol in the magnet hall", onDelay, offDelay, false,
                                List.of(), Optional.empty()),
                        at("o2_low")));
    }
}
