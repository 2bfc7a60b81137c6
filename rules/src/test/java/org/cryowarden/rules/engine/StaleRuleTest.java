package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;
import static org.cryowarden.rules.engine.Site.alarm;
import static org.cryowarden.rules.engine.Site.at;

import java.time.Duration;
import java.util.Optional;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.Priority;
import org.cryowarden.rules.model.StaleRule;
import org.cryowarden.rules.model.ValueRange;
import org.junit.jupiter.api.Test;

class StaleRuleTest {

    @Test
    void silentChannelTurnsStaleAndRaisesTheFaultAlarm() {
        Site site = oxygenSite(Optional.empty());
        site.read("o2_a", 20.9, Unit.PERCENT_VOLUME);

        assertThat(site.tickFor(Duration.ofSeconds(4))).isEmpty();
        assertThat(site.advance(Duration.ofSeconds(1))).containsExactly(
                "18:00:05 o2_a_fault normal -> active-unacknowledged: o2_a STALE (no reading for 5s, polled every 1s)");
        assertThat(site.engine().latest("o2_a").orElseThrow().quality()).isEqualTo(Quality.STALE);
    }

    @Test
    void channelThatNeverReportsTurnsStaleAfterItsTimeoutFromStart() {
        Site site = oxygenSite(Optional.empty());
        site.engine();

        assertThat(site.tickFor(Duration.ofSeconds(5))).containsExactly(
                "18:00:05 o2_a_fault normal -> active-unacknowledged: o2_a STALE (no reading for 5s, polled every 1s)");
    }

    @Test
    void noGoodReadingWithinTheRuleTimeoutRaisesTheFaultEvenWhileReadingsArrive() {
        Site site = oxygenSite(Optional.of(Duration.ofSeconds(30)));
        site.read("o2_a", 20.9, Unit.PERCENT_VOLUME);
        for (int second = 1; second < 30; second++) {
            site.advance(Duration.ofSeconds(1));
            assertThat(site.read("o2_a", 20.9, Unit.PERCENT_VOLUME, Quality.UNCERTAIN, "cell end of life")).isEmpty();
        }

        assertThat(site.advance(Duration.ofSeconds(1))).containsExactly(
                "18:00:30 o2_a_fault normal -> active-unacknowledged: no GOOD reading of o2_a for 30s");
    }

    @Test
    void badReadingRaisesTheFaultAtOnceAndAGoodOneClearsIt() {
        Site site = oxygenSite(Optional.of(Duration.ofSeconds(30)));
        site.read("o2_a", 20.9, Unit.PERCENT_VOLUME);

        assertThat(site.bad("o2_a", Unit.PERCENT_VOLUME, "no reply within 500ms")).containsExactly(
                "18:00:00 o2_a_fault normal -> active-unacknowledged: o2_a BAD (no reply within 500ms)");
        assertThat(site.read("o2_a", 20.9, Unit.PERCENT_VOLUME)).containsExactly(
                "18:00:00 o2_a_fault active-unacknowledged -> returned-unacknowledged: o2_a GOOD again");
    }

    @Test
    void missedReplyWithinTheStaleTimeoutDoesNotRaiseTheFault() {
        Site site = new Site().channel("o2_a", Unit.PERCENT_VOLUME, Duration.ofSeconds(1), Duration.ofSeconds(10),
                        Optional.empty())
                .rule(new StaleRule("o2_a_fault", "o2_a", Optional.empty(), alarm(Priority.HIGH, "Oxygen sensor A fault"),
                        at("o2_a_fault")));
        site.read("o2_a", 20.9, Unit.PERCENT_VOLUME);
        site.advance(Duration.ofSeconds(2));

        assertThat(site.engine().onReading(Reading.stale("o2_a", Unit.PERCENT_VOLUME, site.clock.wallNow(),
                "no reply within 500ms"))).isEmpty();
        site.tickFor(Duration.ofSeconds(7));
        assertThat(site.engine().onReading(Reading.stale("o2_a", Unit.PERCENT_VOLUME, site.clock.wallNow(),
                "no reply within 500ms"))).isEmpty();
        assertThat(site.advance(Duration.ofSeconds(1))).containsExactly(
                "18:00:10 o2_a_fault normal -> active-unacknowledged: no GOOD reading of o2_a for 10s");
    }

    @Test
    void readingOutsideTheValidRangeRaisesTheFaultWithTheRangeInTheCause() {
        Site site = new Site().channel("o2_a", Unit.PERCENT_VOLUME, Duration.ofSeconds(1), Duration.ofSeconds(5),
                        Optional.of(new ValueRange(0, 25)))
                .rule(new StaleRule("o2_a_fault", "o2_a", Optional.empty(), alarm(Priority.HIGH, "Oxygen sensor A fault"),
                        at("o2_a_fault")));

        assertThat(site.read("o2_a", 99.9, Unit.PERCENT_VOLUME)).containsExactly(
                "18:00:00 o2_a_fault normal -> active-unacknowledged: "
                        + "o2_a 99.9 %vol BAD (value 99.9 %vol outside the valid range 0 to 25 %vol)");
    }

    @Test
    void readingInAnIncompatibleUnitIsBad() {
        Site site = oxygenSite(Optional.empty());

        site.engine().onReading(Reading.good("o2_a", 4.2, Unit.KELVIN, site.clock.wallNow()));

        Reading seen = site.engine().latest("o2_a").orElseThrow();
        assertThat(seen.quality()).isEqualTo(Quality.BAD);
        assertThat(seen.reason()).isEqualTo("reading in K cannot be converted to the channel's unit %vol");
    }

    /**
     * Stale timeouts re-arm themselves in place while readings keep coming (they fire early and move on). Two
     * channels read at the same instants and then silent together: both turn stale exactly their timeout after
     * their last reading, not a tick earlier, and the faults come in the same order as they always did for timers
     * due at the same time.
     */
    @Test
    void channelsReadForMinutesTurnStaleExactlyTheirTimeoutAfterTheLastReadingInAFixedOrder() {
        Site site = new Site().channel("o2_a", Unit.PERCENT_VOLUME).channel("o2_b", Unit.PERCENT_VOLUME)
                .rule(new StaleRule("o2_b_fault", "o2_b", Optional.empty(), alarm(Priority.HIGH, "Oxygen sensor B fault"),
                        at("o2_b_fault")))
                .rule(new StaleRule("o2_a_fault", "o2_a", Optional.empty(), alarm(Priority.HIGH, "Oxygen sensor A fault"),
                        at("o2_a_fault")));
        for (int second = 0; second < 120; second++) {
            assertThat(site.read("o2_a", 20.9, Unit.PERCENT_VOLUME)).isEmpty();
            assertThat(site.read("o2_b", 20.8, Unit.PERCENT_VOLUME)).isEmpty();
            assertThat(site.advance(Duration.ofMillis(250))).isEmpty();
            assertThat(site.advance(Duration.ofMillis(750))).isEmpty();
        }
        // The last readings were at 18:01:59; silence since.
        for (int tenth = 1; tenth < 40; tenth++) {
            assertThat(site.advance(Duration.ofMillis(100))).as("%d ms after the last readings", 1_000 + 100 * tenth)
                    .isEmpty();
        }

        assertThat(site.advance(Duration.ofMillis(100))).containsExactly(
                "18:02:04 o2_a_fault normal -> active-unacknowledged: o2_a STALE (no reading for 5s, polled every 1s)",
                "18:02:04 o2_b_fault normal -> active-unacknowledged: o2_b STALE (no reading for 5s, polled every 1s)");
    }

    /**
     * A rule whose timeout (30 s) is longer than the channel's own (5 s) lets the channel notice silence after a GOOD
     * reading, even right after UNCERTAIN ones: the fault comes with the channel's STALE reading, 5 s after the last
     * GOOD one.
     */
    @Test
    void silenceAfterUncertainThenGoodReadingsRaisesTheFaultAtTheChannelsTimeout() {
        Site site = oxygenSite(Optional.of(Duration.ofSeconds(30)));
        site.read("o2_a", 20.9, Unit.PERCENT_VOLUME);
        for (int second = 1; second <= 3; second++) {
            site.advance(Duration.ofSeconds(1));
            assertThat(site.read("o2_a", 20.9, Unit.PERCENT_VOLUME, Quality.UNCERTAIN, "cell end of life")).isEmpty();
        }
        site.advance(Duration.ofSeconds(1));
        assertThat(site.read("o2_a", 20.9, Unit.PERCENT_VOLUME)).isEmpty();

        assertThat(site.tickFor(Duration.ofSeconds(4))).isEmpty();
        assertThat(site.advance(Duration.ofSeconds(1))).containsExactly(
                "18:00:09 o2_a_fault normal -> active-unacknowledged: o2_a STALE (no reading for 5s, polled every 1s)");
    }

    /** After a long healthy run, UNCERTAIN readings still raise the fault exactly the rule's timeout after the last GOOD. */
    @Test
    void uncertainReadingsAfterALongGoodRunRaiseTheFaultAtTheRuleTimeout() {
        Site site = oxygenSite(Optional.of(Duration.ofSeconds(30)));
        for (int second = 0; second <= 60; second++) {
            assertThat(site.read("o2_a", 20.9, Unit.PERCENT_VOLUME)).isEmpty();
            assertThat(site.advance(Duration.ofSeconds(1))).isEmpty();
        }
        // The last GOOD reading was at 18:01:00.
        for (int second = 61; second < 90; second++) {
            assertThat(site.read("o2_a", 20.9, Unit.PERCENT_VOLUME, Quality.UNCERTAIN, "cell end of life"))
                    .as("UNCERTAIN at %d s", second).isEmpty();
            if (second < 89) {
                assertThat(site.advance(Duration.ofSeconds(1))).as("tick after %d s", second).isEmpty();
            }
        }

        assertThat(site.advance(Duration.ofSeconds(1))).containsExactly(
                "18:01:30 o2_a_fault normal -> active-unacknowledged: no GOOD reading of o2_a for 30s");
    }

    private static Site oxygenSite(Optional<Duration> timeout) {
        return new Site().channel("o2_a", Unit.PERCENT_VOLUME)
                .rule(new StaleRule("o2_a_fault", "o2_a", timeout, alarm(Priority.HIGH, "Oxygen sensor A fault"),
                        at("o2_a_fault")));
    }
}
