package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;
import static org.cryowarden.rules.engine.Site.alarm;
import static org.cryowarden.rules.engine.Site.at;
import static org.cryowarden.rules.engine.Site.q;

import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.Priority;
import org.cryowarden.rules.model.RateRule;
import org.junit.jupiter.api.Test;

class RateRuleTest {

    @Test
    void levelFallingFasterThanThreePercentPerHourRaisesTheAlarmOnceHalfTheWindowIsCovered() {
        // 3 %/h over 30 min: an example limit for a helium dewar, common practice.
        Site site = levelSite();
        List<String> events = new ArrayList<>();
        for (int second = 0; second <= 3600; second += 10) {
            events.addAll(site.read("level_d1", 80 - 4.0 * second / 3600, Unit.PERCENT));
            site.advance(Duration.ofSeconds(10));
        }

        // A straight line of 4 %/h: least squares gives exactly 4 %/h as soon as the fit may judge (15 min).
        assertThat(events).containsExactly(
                "18:15:00 level_fast_fall normal -> active-unacknowledged: "
                        + "level_d1 falling at 4 %/h, faster than 3 %/h");
    }

    @Test
    void levelFallingSlowerThanTheRateDoesNotAlarm() {
        Site site = levelSite();
        List<String> events = new ArrayList<>();
        for (int second = 0; second <= 7200; second += 10) {
            events.addAll(site.read("level_d1", 80 - 2.0 * second / 3600, Unit.PERCENT));
            site.advance(Duration.ofSeconds(10));
        }

        assertThat(events).isEmpty();
    }

    @Test
    void leastSquaresSlopeRidesThroughNoiseThatWouldFoolTwoPoints() {
        Site site = levelSite();
        List<String> events = new ArrayList<>();
        for (int second = 0; second <= 3600; second += 10) {
            // 2 %/h true fall plus +-0.3 % alternating noise: point-to-point slopes reach +-216 %/h.
            double noise = (second / 10) % 2 == 0 ? 0.3 : -0.3;
            events.addAll(site.read("level_d1", 80 - 2.0 * second / 3600 + noise, Unit.PERCENT));
            site.advance(Duration.ofSeconds(10));
        }

        assertThat(events).isEmpty();
    }

    @Test
    void pressureRisingFasterThanFiveKilopascalPerMinuteOnAMillibarChannelAlarmsAndClears() {
        // 5 kPa/min = 50 mbar/min (1 mbar = 100 Pa); an example from a cryostat bath, common practice.
        Site site = new Site().channel("p_bath", Unit.MILLIBAR)
                .rule(new RateRule("p_bath_rising", "p_bath", Direction.HIGH, q("5 kPa"), Duration.ofMinutes(1),
                        Duration.ofMinutes(2), alarm(Priority.HIGH, "Bath pressure rising fast"), at("p_bath_rising")));
        List<String> events = new ArrayList<>();
        for (int second = 0; second <= 600; second++) {
            double pressure = second < 300 ? 1013 + second : 1313;
            events.addAll(site.read("p_bath", pressure, Unit.MILLIBAR));
            site.advance(Duration.ofSeconds(1));
        }

        // 1 mbar/s = 60 mbar/min = 6 kPa/min. After the rise stops at 18:05:00 the fit over 2 min falls below
        // 5 kPa/min before the window is flat again.
        assertThat(events).hasSize(2);
        assertThat(events.get(0)).isEqualTo("18:01:00 p_bath_rising normal -> active-unacknowledged: "
                + "p_bath rising at 6 kPa/min, faster than 5 kPa/min");
        assertThat(events.get(1)).startsWith("18:05:").contains("active-unacknowledged -> returned-unacknowledged");
    }

    @Test
    void badReadingsAreLeftOutOfTheFit() {
        Site site = levelSite();
        List<String> events = new ArrayList<>();
        for (int second = 0; second <= 3600; second += 10) {
            if (second % 60 == 30) {
                events.addAll(site.bad("level_d1", Unit.PERCENT, "probe heater fault"));
            } else {
                events.addAll(site.read("level_d1", 80 - 2.0 * second / 3600, Unit.PERCENT));
            }
            site.advance(Duration.ofSeconds(10));
        }

        assertThat(events).isEmpty();
    }

    @Test
    void wallClockStepDoesNotFakeASlope() {
        Site site = levelSite();
        List<String> events = new ArrayList<>();
        for (int second = 0; second <= 3600; second += 10) {
            events.addAll(site.read("level_d1", 70, Unit.PERCENT));
            if (second == 1800) {
                site.clock.stepWall(Duration.ofHours(-1));
            }
            site.advance(Duration.ofSeconds(10));
        }

        assertThat(events).isEmpty();
    }

    private static Site levelSite() {
        return new Site().channel("level_d1", Unit.PERCENT, Duration.ofSeconds(10), Duration.ofMinutes(1), Optional.empty())
                .rule(new RateRule("level_fast_fall", "level_d1", Direction.LOW, q("3 %"), Duration.ofHours(1),
                        Duration.ofMinutes(30), alarm(Priority.MEDIUM, "Dewar D1 losing liquid fast"),
                        at("level_fast_fall")));
    }
}
