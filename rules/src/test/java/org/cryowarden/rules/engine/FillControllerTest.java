package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;

import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.FillDef;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.Priority;
import org.junit.jupiter.api.Test;

/**
 * The automatic fill of a nitrogen cold trap: start below 30 %, stop at 85 %, at least 2 % rise per 5 min, open
 * for at most 20 min, never while the oxygen alarm (below 19.5 %vol, 29 CFR 1910.146(b)) is active. The levels
 * and times are invented for the test; the behaviour is the contract of {@link FillController}.
 */
class FillControllerTest {

    @Test
    void valveOpensBelowTheStartLevelAndClosesAtTheStopLevel() {
        Site site = trapSite();
        assertThat(site.read("trap-level", 31, Unit.PERCENT)).isEmpty();
        site.clock.advance(Duration.ofMinutes(1));
        assertThat(site.read("trap-level", 29.5, Unit.PERCENT)).containsExactly(
                "18:01:00 trap-fill started: fill started: trap-level 29.5 % below the start level of 30 %",
                "18:01:00 fill-valve := 1");
        List<String> events = new ArrayList<>();
        // Rising 5 %/min: 84.5 % after 11 min, 89.5 % after 12.
        for (int minute = 1; minute <= 12; minute++) {
            events.addAll(site.advance(Duration.ofMinutes(1)));
            events.addAll(site.read("trap-level", 29.5 + 5 * minute, Unit.PERCENT));
        }
        assertThat(events).containsExactly(
                "18:13:00 trap-fill stopped: fill stopped (stop-level): trap-level 89.5 % reached the stop level of "
                        + "85 %",
                "18:13:00 fill-valve := 0");
        assertThat(site.engine().fill("trap-fill").orElseThrow().state()).isEqualTo(FillState.IDLE);
        assertThat(site.state("trap-fill")).isEqualTo(AlarmState.NORMAL);
    }

    @Test
    void noRiseClosesTheValveRaisesTheAlarmAndLocksOutUntilReset() {
        Site site = trapSite();
        site.read("trap-level", 25, Unit.PERCENT);
        List<String> events = new ArrayList<>();
        // The supply dewar is empty: the level creeps up 0.2 %/min; the check at 5 min sees the 4th minute's
        // reading (the timer falls due before the 5th is delivered), 0.8 %, less than the 2 % asked for.
        for (int minute = 1; minute <= 5; minute++) {
            events.addAll(site.advance(Duration.ofMinutes(1)));
            events.addAll(site.read("trap-level", 25 + 0.2 * minute, Unit.PERCENT));
        }
        assertThat(events).containsExactly(
                "18:05:00 trap-fill stopped: fill stopped (no-rise): level rose 0.8 % in 5min, less than 2 %: supply "
                        + "empty or valve stuck; locked out until reset",
                "18:05:00 fill-valve := 0",
                "18:05:00 trap-fill normal -> active-unacknowledged: fill stopped (no-rise): level rose 0.8 % in "
                        + "5min, less than 2 %: supply empty or valve stuck; locked out until reset");
        // Locked out: still below the start level, but no new fill.
        assertThat(site.advance(Duration.ofMinutes(1))).isEmpty();
        assertThat(site.read("trap-level", 26, Unit.PERCENT)).isEmpty();
        assertThat(site.engine().fill("trap-fill").orElseThrow().state()).isEqualTo(FillState.LOCKED_OUT);

        CommandResult reset = site.engine().resetFill("trap-fill", "night operator");
        assertThat(reset.isOk()).isTrue();
        assertThat(Site.describe(reset.events())).containsExactly(
                "18:06:00 trap-fill reset by night operator",
                "18:06:00 trap-fill active-unacknowledged -> returned-unacknowledged: fill trap-fill reset by night "
                        + "operator");
        assertThat(site.engine().resetFill("trap-fill", "night operator").refusal())
                .contains("fill trap-fill is idle, not locked out: there is nothing to reset");
        // The next reading decides again.
        site.clock.advance(Duration.ofMinutes(1));
        assertThat(site.read("trap-level", 26, Unit.PERCENT)).first().asString().contains("trap-fill started");
    }

    @Test
    void noFillStartsWhileTheOxygenAlarmIsActiveAndARunningFillStopsWhenItRaises() {
        Site site = trapSite();
        site.read("o2-room", 18.9, Unit.PERCENT_VOLUME);
        assertThat(site.state("o2-low")).isEqualTo(AlarmState.UNACKNOWLEDGED);
        assertThat(site.read("trap-level", 20, Unit.PERCENT)).isEmpty();
        assertThat(site.engine().fill("trap-fill").orElseThrow().activeBlockers()).containsExactly("o2-low");

        site.clock.advance(Duration.ofMinutes(1));
        site.read("o2-room", 20.9, Unit.PERCENT_VOLUME);
        assertThat(site.read("trap-level", 20, Unit.PERCENT)).containsExactly(
                "18:01:00 trap-fill started: fill started: trap-level 20 % below the start level of 30 %",
                "18:01:00 fill-valve := 1");

        site.clock.advance(Duration.ofMinutes(1));
        assertThat(site.read("o2-room", 19.0, Unit.PERCENT_VOLUME)).containsExactly(
                "18:02:00 o2-low returned-unacknowledged -> active-unacknowledged: o2-room 19 %vol below 19.5 %vol",
                "18:02:00 trap-fill stopped: fill stopped (blocked): alarm o2-low is active (o2-room 19 %vol below "
                        + "19.5 %vol)",
                "18:02:00 fill-valve := 0");
        // Blocked is not a fault: no lockout, no fill alarm.
        assertThat(site.engine().fill("trap-fill").orElseThrow().state()).isEqualTo(FillState.IDLE);
        assertThat(site.state("trap-fill")).isEqualTo(AlarmState.NORMAL);
    }

    @Test
    void maximumOpenTimeClosesTheValveAndLocksOut() {
        Site site = trapSite();
        site.read("trap-level", 28, Unit.PERCENT);
        List<String> events = new ArrayList<>();
        // 0.6 %/min passes every rise check (each sees 2.4 % or more in 5 min: a check due with a reading sees
        // the reading before it) but never reaches 85 % in 20 min.
        for (int minute = 1; minute <= 20; minute++) {
            events.addAll(site.advance(Duration.ofMinutes(1)));
            events.addAll(site.read("trap-level", 28 + 0.6 * minute, Unit.PERCENT));
        }
        assertThat(events).containsExactly(
                "18:20:00 trap-fill stopped: fill stopped (max-open-time): open for the maximum of 20min without "
                        + "reaching 85 %; check the supply and the valve; locked out until reset",
                "18:20:00 fill-valve := 0",
                "18:20:00 trap-fill normal -> active-unacknowledged: fill stopped (max-open-time): open for the "
                        + "maximum of 20min without reaching 85 %; check the supply and the valve; locked out until "
                        + "reset");
    }

    @Test
    void aDeadLevelSensorClosesTheValve() {
        Site site = trapSite();
        site.read("trap-level", 28, Unit.PERCENT);
        site.clock.advance(Duration.ofSeconds(30));
        assertThat(site.bad("trap-level", Unit.PERCENT, "no reply")).containsExactly(
                "18:00:30 trap-fill stopped: fill stopped (level-unusable): level reading not GOOD: trap-level BAD "
                        + "(no reply)",
                "18:00:30 fill-valve := 0");
    }

    @Test
    void lockoutSurvivesARestartAndAnOpenValveIsClosedUntilTheControllerDecides() {
        Site before = trapSite();
        before.read("trap-level", 25, Unit.PERCENT);
        before.tickFor(Duration.ofMinutes(5)); // no reading: no rise -> locked out
        assertThat(before.engine().fill("trap-fill").orElseThrow().state()).isEqualTo(FillState.LOCKED_OUT);
        Site second = trapSite();
        second.read("trap-level", 25, Unit.PERCENT); // open
        EngineSnapshot lockedOut = before.engine().snapshot();
        EngineSnapshot open = second.engine().snapshot();
        assertThat(open.fills()).singleElement().satisfies(record -> assertThat(record.valveOpen()).isTrue());

        Site afterLockout = trapSite(before.clock.wallNow().plusSeconds(60));
        RestoreResult restored = afterLockout.engine().restore(lockedOut);
        assertThat(Site.describe(restored.events())).containsExactly("18:06:00 fill-valve := 0");
        assertThat(afterLockout.engine().fill("trap-fill").orElseThrow().state()).isEqualTo(FillState.LOCKED_OUT);
        assertThat(afterLockout.state("trap-fill")).isEqualTo(AlarmState.UNACKNOWLEDGED);
        assertThat(afterLockout.engine().snapshot().fills()).isEqualTo(lockedOut.fills());
        assertThat(afterLockout.read("trap-level", 25, Unit.PERCENT)).isEmpty();

        Site afterOpen = trapSite(second.clock.wallNow().plusSeconds(60));
        RestoreResult reopened = afterOpen.engine().restore(open);
        assertThat(Site.describe(reopened.events())).containsExactly(
                "18:01:00 trap-fill stopped: fill stopped (restart): the valve was open when the engine stopped; "
                        + "closed until the next level reading decides",
                "18:01:00 fill-valve := 0");
        assertThat(afterOpen.read("trap-level", 25, Unit.PERCENT)).first().asString().contains("trap-fill started");
    }

    @Test
    void sameReadingsGiveTheSameFillEvents() {
        assertThat(scriptedFill()).isEqualTo(scriptedFill());
    }

    // --- helpers ---

    private static List<String> scriptedFill() {
        Site site = trapSite();
        List<String> events = new ArrayList<>();
        double[] levels = {31, 29, 31, 36, 40, 41, 41.5, 42, 42, 42, 42, 42};
        for (double level : levels) {
            events.addAll(site.read("trap-level", level, Unit.PERCENT));
            events.addAll(site.advance(Duration.ofMinutes(1)));
        }
        return events;
    }

    private static Site trapSite() {
        return trapSite(Site.START);
    }

    private static Site trapSite(java.time.Instant start) {
        Site site = new Site(start)
                .channel("trap-level", Unit.PERCENT, Duration.ofSeconds(10), Duration.ofMinutes(30), Optional.empty())
                .channel("o2-room", Unit.PERCENT_VOLUME, Duration.ofSeconds(1), Duration.ofMinutes(30),
                        Optional.empty())
                .output("fill-valve", 0);
        site.rule(new LimitRule("o2-low", "o2-room", Direction.LOW, Site.q("19.5 %vol"), Site.q("0.3 %vol"),
                Site.alarm(Priority.CRITICAL, "Oxygen below 19.5 %vol"), Site.at("o2-low")));
        site.fill(new FillDef("trap-fill", "trap-level", "fill-valve", Site.q("30 %"), Site.q("85 %"), 1,
                Duration.ofMinutes(20), Site.q("2 %"), Duration.ofMinutes(5), List.of("o2-low"),
                Site.alarm(Priority.HIGH, "Cold trap fill failed; check the nitrogen supply dewar"),
                Site.at("trap-fill")));
        return site;
    }
}
