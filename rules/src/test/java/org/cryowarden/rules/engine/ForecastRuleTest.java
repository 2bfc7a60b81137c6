package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.time.Duration;
import java.time.Instant;
import java.time.LocalTime;
import java.time.ZoneId;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.ForecastRule;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.Priority;
import org.junit.jupiter.api.Test;

/**
 * Forecast rules. The check values are hand-computed from straight lines (time = level difference / rate); the
 * daylight-saving dates are those of the EU summer-time rule (last Sunday of March, 01:00 UTC), as the JDK's zone
 * rules for Europe/Berlin carry them.
 */
class ForecastRuleTest {

    @Test
    void linearFallGivesTheHandComputedHoursAndCrossingTime() {
        Site site = dewarSite(Site.START, Optional.empty(), Optional.of(Duration.ofHours(24)));

        // 60 % falling at 2 %/h reaches 10 % after (60 - 10) / 2 = 25 h: 2025-01-16 19:00 UTC. The forecast
        // exists from 1 h (half the 2 h window); at 1 h 1 min it is 23.983 h, under 24 h for the first time.
        List<String> events = new ArrayList<>();
        for (int minute = 0; minute <= 120; minute++) {
            events.addAll(site.read("he-level", 60 - 2.0 * minute / 60, Unit.PERCENT));
            site.clock.advance(Duration.ofMinutes(1));
        }

        assertThat(events).containsExactly("19:01:00 he-empty normal -> active-unacknowledged: he-level falling at 2 "
                + "%/h reaches 10 % at 2025-01-16 19:00 UTC (in 23.9833 h), within 1d");
        // After 2 h the level is 56 %: (56 - 10) / 2 = 23 h left.
        Reading hours = site.engine().latest("he-hours-left").orElseThrow();
        assertThat(hours.quality()).isEqualTo(Quality.GOOD);
        assertThat(hours.unit()).isEqualTo(Unit.HOUR);
        assertThat(hours.value()).isCloseTo(23.0, within(1e-9));
    }

    @Test
    void tooFewReadingsOrARisingLevelGiveNoForecast() {
        Site site = dewarSite(Site.START, Optional.empty(), Optional.of(Duration.ofHours(24)));

        site.read("he-level", 50, Unit.PERCENT);
        Reading early = site.engine().latest("he-hours-left").orElseThrow();
        assertThat(early.quality()).isEqualTo(Quality.UNCERTAIN);
        assertThat(early.value()).isNaN();
        assertThat(early.reason()).isEqualTo("no forecast yet: 1 GOOD readings over 0s, needs 5 over 1h");

        for (int minute = 1; minute <= 70; minute++) {
            site.clock.advance(Duration.ofMinutes(1));
            site.read("he-level", 50 + 0.01 * minute, Unit.PERCENT);
        }
        Reading rising = site.engine().latest("he-hours-left").orElseThrow();
        assertThat(rising.quality()).isEqualTo(Quality.UNCERTAIN);
        assertThat(rising.reason()).isEqualTo("no forecast: he-level is not falling (0.6 %/h)");
        assertThat(site.state("he-empty")).isEqualTo(AlarmState.NORMAL);

        site.bad("he-level", Unit.PERCENT, "probe open circuit");
        Reading dead = site.engine().latest("he-hours-left").orElseThrow();
        assertThat(dead.quality()).isEqualTo(Quality.BAD);
        assertThat(dead.reason()).isEqualTo("no forecast: he-level BAD (probe open circuit)");
    }

    @Test
    void singleSpikesBarelyMoveTheForecastWhereLeastSquaresWouldBeFarOff() {
        Site site = dewarSite(Site.START, Optional.empty(), Optional.of(Duration.ofHours(1)));
        // 121 readings over 2 h of a 60 % -> 56 % fall at 2 %/h; every 10th reading (12 of 121, 10 %) is a
        // one-poll glitch, 20 % high in the first hour and 20 % low in the second. Single spikes are outliers,
        // not refills.
        double[] x = new double[121];
        double[] y = new double[121];
        for (int minute = 0; minute <= 120; minute++) {
            double glitch = minute % 10 == 5 ? (minute < 60 ? 20 : -20) : 0;
            double level = 60 - 2.0 * minute / 60 + glitch;
            x[minute] = minute * 60.0;
            y[minute] = level;
            site.read("he-level", level, Unit.PERCENT);
            if (minute < 120) {
                site.clock.advance(Duration.ofMinutes(1));
            }
        }

        double robust = site.engine().latest("he-hours-left").orElseThrow().value();
        // The true answer is (56 - 10) / 2 = 23 h. Theil-Sen: the glitches move it by less than 0.01 h (the
        // median of the pairwise slopes is still a clean pair's -2 %/h).
        assertThat(robust).isCloseTo(23.0, within(0.01));
        // Least squares over the same points, for comparison: its slope is -4.93 %/h and its forecast 8.74 h,
        // less than 9 h: it would call for a refill 14 hours early.
        double leastSquaresHours = leastSquaresHoursTo(10, x, y, 120 * 60.0);
        assertThat(leastSquaresHours).isCloseTo(8.74, within(0.01));
    }

    @Test
    void aRefillClearsTheAlarmAndRestartsTheFitOnTheNewReadingsOnly() {
        Site site = dewarSite(Site.START, Optional.empty(), Optional.of(Duration.ofHours(24)));
        for (int minute = 0; minute <= 90; minute++) {
            site.read("he-level", 30 - 2.0 * minute / 60, Unit.PERCENT);
            site.clock.advance(Duration.ofMinutes(1));
        }
        assertThat(site.state("he-empty")).isEqualTo(AlarmState.UNACKNOWLEDGED);

        // Refilled to 90 %: the first high reading could be a spike, the second confirms the refill.
        assertThat(site.read("he-level", 90, Unit.PERCENT)).isEmpty();
        site.clock.advance(Duration.ofMinutes(1));
        assertThat(site.read("he-level", 90, Unit.PERCENT)).containsExactly("19:32:00 he-empty active-unacknowledged "
                + "-> returned-unacknowledged: refill: he-level 90 %, the forecast starts again");
        assertThat(site.engine().latest("he-hours-left").orElseThrow().reason())
                .isEqualTo("no forecast: refill (he-level 90 %), the fit starts again");

        // Now 90 % falling at 4 %/h: after 1 h, 86 %, (86 - 10) / 4 = 19 h left. Had the old points stayed in the
        // fit, the slope would be far off this.
        for (int minute = 1; minute <= 60; minute++) {
            site.clock.advance(Duration.ofMinutes(1));
            site.read("he-level", 90 - 4.0 * minute / 60, Unit.PERCENT);
        }
        assertThat(site.engine().latest("he-hours-left").orElseThrow().value()).isCloseTo(19.0, within(1e-9));
    }

    @Test
    void refillBeforeSevenAlarmsOnAnOrdinaryNightButNotOnTheNightTheClocksGoForward() {
        // The same dewar, the same readings, a week apart: 68 % at 15:00 UTC on a Saturday, falling at 4 %/h,
        // reaches 10 % after (68 - 10) / 4 = 14.5 h, at 05:30 UTC on Sunday. On 23 March 2025 that is 06:30 CET,
        // before 07:00: alarm at the first forecast. On 30 March 2025 the clocks go forward at 01:00 UTC, 07:00
        // CEST is 05:00 UTC and the dewar lasts until 07:30 CEST: no alarm until 07:00 local has passed, when
        // the next 07:00 is a day away and the dewar will not see it.
        Instant ordinary = Instant.parse("2025-03-22T15:00:00Z");
        Instant summerTime = Instant.parse("2025-03-29T15:00:00Z");

        List<String> first = night(ordinary);
        List<String> second = night(summerTime);

        assertThat(first).containsExactly("16:00:00 he-empty normal -> active-unacknowledged: he-level falling at 4 "
                + "%/h reaches 10 % at 2025-03-23 06:30 Europe/Berlin (in 13.5 h), before the next 07:00 "
                + "Europe/Berlin");
        assertThat(second).containsExactly("05:00:00 he-empty normal -> active-unacknowledged: he-level falling at "
                + "4 %/h reaches 10 % at 2025-03-30 07:30 Europe/Berlin (in 0.5 h), before the next 07:00 "
                + "Europe/Berlin");
    }

    @Test
    void nextSevenOClockFollowsTheZoneRulesAcrossBothChanges() {
        ForecastEvaluator evaluator = evaluator(ZoneId.of("America/Chicago"), LocalTime.of(7, 0));
        // US rule: second Sunday in March forward, first Sunday in November back (Energy Policy Act of 2005).
        assertThat(evaluator.nextOccurrence(Instant.parse("2025-03-08T23:00:00Z")))
                .isEqualTo(Instant.parse("2025-03-09T12:00:00Z")); // 07:00 CDT, UTC-5
        assertThat(evaluator.nextOccurrence(Instant.parse("2025-11-01T23:00:00Z")))
                .isEqualTo(Instant.parse("2025-11-02T13:00:00Z")); // 07:00 CST, UTC-6
        // At 07:00 exactly the next one is tomorrow's.
        assertThat(evaluator.nextOccurrence(Instant.parse("2025-11-02T13:00:00Z")))
                .isEqualTo(Instant.parse("2025-11-03T13:00:00Z"));
        // 02:30 does not exist on 9 March 2025 in Chicago: the clocks show 03:30 CDT an hour after 01:30 CST.
        ForecastEvaluator gap = evaluator(ZoneId.of("America/Chicago"), LocalTime.of(2, 30));
        assertThat(gap.nextOccurrence(Instant.parse("2025-03-09T06:00:00Z")))
                .isEqualTo(Instant.parse("2025-03-09T08:30:00Z"));
    }

    @Test
    void aLimitRuleCanReadThePublishedForecastChannel() {
        Site site = dewarSite(Site.START, Optional.empty(), Optional.of(Duration.ofHours(1)));
        site.rule(new LimitRule("he-hours-short", "he-hours-left", Direction.LOW, Site.q("24 h"), Site.q("0 h"),
                Site.alarm(Priority.MEDIUM, "Less than a day of helium left"), Site.at("he-hours-short")));
        List<String> events = new ArrayList<>();
        for (int minute = 0; minute <= 61; minute++) {
            events.addAll(site.read("he-level", 60 - 2.0 * minute / 60, Unit.PERCENT));
            site.clock.advance(Duration.ofMinutes(1));
        }
        // 24 h is the forecast at 1 h exactly (58 % -> 10 % at 2 %/h); below it a minute later.
        assertThat(events).containsExactly(
                "19:01:00 he-hours-short normal -> active-unacknowledged: he-hours-left 23.9833 h below 24 h");
    }

    // --- helpers ---

    private static List<String> night(Instant start) {
        Site site = dewarSite(start, Optional.of(LocalTime.of(7, 0)), Optional.empty());
        site.timeZone("Europe/Berlin");
        List<String> events = new ArrayList<>();
        for (int step = 0; step <= 14 * 12; step++) {
            events.addAll(site.read("he-level", 68 - 4.0 * step / 12, Unit.PERCENT));
            site.clock.advance(Duration.ofMinutes(5));
        }
        return events;
    }

    private static Site dewarSite(Instant start, Optional<LocalTime> before, Optional<Duration> within) {
        Site site = new Site(start)
                .channel("he-level", Unit.PERCENT, Duration.ofMinutes(1), Duration.ofMinutes(10), Optional.empty());
        site.rule(new ForecastRule("he-empty", "he-level", Site.q("10 %"), Duration.ofHours(2), Site.q("5 %"),
                Optional.of("he-hours-left"), before, within, Optional.empty(),
                Site.alarm(Priority.HIGH, "Helium dewar runs empty before the morning shift"), Site.at("he-empty")));
        return site;
    }

    private static ForecastEvaluator evaluator(ZoneId zone, LocalTime before) {
        Site site = new Site().channel("he-level", Unit.PERCENT);
        Core core = new Core(site.clock, 101325);
        return new ForecastEvaluator(null, core, "he-level", Unit.PERCENT, 10, 5, Duration.ofHours(2).toNanos(),
                null, before, zone, 0);
    }

    /** Hours until the least-squares line through the points reaches {@code level}, seen from {@code nowSeconds}. */
    private static double leastSquaresHoursTo(double level, double[] x, double[] y, double nowSeconds) {
        double n = x.length;
        double sx = 0;
        double sy = 0;
        double sxx = 0;
        double sxy = 0;
        for (int i = 0; i < x.length; i++) {
            sx += x[i];
            sy += y[i];
            sxx += x[i] * x[i];
            sxy += x[i] * y[i];
        }
        double slope = (n * sxy - sx * sy) / (n * sxx - sx * sx);
        double intercept = (sy - slope * sx) / n;
        return ((level - intercept) / slope - nowSeconds) / 3600;
    }
}
