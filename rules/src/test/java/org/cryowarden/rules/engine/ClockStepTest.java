package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;
import static org.cryowarden.rules.engine.Site.alarm;
import static org.cryowarden.rules.engine.Site.at;
import static org.cryowarden.rules.engine.Site.q;

import java.time.Duration;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.Priority;
import org.junit.jupiter.api.Test;

/** Timers run on the monotonic clock: an NTP step or an operator setting the wall clock neither fires nor stalls them. */
class ClockStepTest {

    @Test
    void wallClockStepOfPlusOneHourDoesNotFireAPendingOnDelay() {
        Site site = oxygenSite();
        site.read("o2_hall", 19.0, Unit.PERCENT_VOLUME);
        site.clock.stepWall(Duration.ofHours(1));

        assertThat(site.engine().tick()).isEmpty();
        assertThat(site.tickFor(Duration.ofSeconds(9))).isEmpty();
        assertThat(site.advance(Duration.ofSeconds(1))).containsExactly(
                "19:00:10 o2_low normal -> active-unacknowledged: o2_hall 19 %vol below 19.5 %vol, "
                        + "held for the on-delay of 10s");
    }

    @Test
    void wallClockStepOfMinusOneHourDoesNotStallAPendingOnDelay() {
        Site site = oxygenSite();
        site.read("o2_hall", 19.0, Unit.PERCENT_VOLUME);
        site.clock.stepWall(Duration.ofHours(-1));

        assertThat(site.tickFor(Duration.ofSeconds(9))).isEmpty();
        assertThat(site.advance(Duration.ofSeconds(1))).containsExactly(
                "17:00:10 o2_low normal -> active-unacknowledged: o2_hall 19 %vol below 19.5 %vol, "
                        + "held for the on-delay of 10s");
    }

    @Test
    void shelvingExpiresAfterItsDurationWhateverTheWallClockDoes() {
        Site site = oxygenSite();
        site.engine().shelve("o2_low", "dana", Duration.ofMinutes(30), "calibration gas test");
        site.clock.stepWall(Duration.ofHours(1));
        assertThat(site.advance(Duration.ofMinutes(29))).isEmpty();
        site.clock.stepWall(Duration.ofHours(-2));

        assertThat(site.advance(Duration.ofMinutes(1))).containsExactly(
                "17:30:00 o2_low shelved -> normal: shelving by dana expired after 30min");
    }

    @Test
    void staleTimeoutIsMeasuredOnTheMonotonicClock() {
        Site site = new Site().channel("o2_hall", Unit.PERCENT_VOLUME)
                .rule(new org.cryowarden.rules.model.StaleRule("o2_fault", "o2_hall", Optional.empty(),
                        alarm(Priority.HIGH, "Oxygen sensor fault"), at("o2_fault")));
        site.read("o2_hall", 20.9, Unit.PERCENT_VOLUME);
        site.clock.stepWall(Duration.ofHours(1));

        assertThat(site.tickFor(Duration.ofSeconds(4))).isEmpty();
        assertThat(site.advance(Duration.ofSeconds(1))).hasSize(1);
    }

    private static Site oxygenSite() {
        return new Site().channel("o2_hall", Unit.PERCENT_VOLUME, Duration.ofSeconds(1), Duration.ofHours(3),
                        Optional.empty())
                .rule(new LimitRule("o2_low", "o2_hall", Direction.LOW, q("19.5 %vol"), q("0 %vol"),
                        alarm(Priority.HIGH, "Oxygen low", Duration.ofSeconds(10), Duration.ZERO, false, List.of(),
                                Optional.empty()), at("o2_low")));
    }
}
