package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.cryowarden.rules.engine.Site.alarm;
import static org.cryowarden.rules.engine.Site.at;
import static org.cryowarden.rules.engine.Site.q;

import java.time.Duration;
import java.time.Instant;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.InterlockDef;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.OutputAction;
import org.cryowarden.rules.model.Priority;
import org.junit.jupiter.api.Test;

/** After kill -9 and a restart, alarm states, latched trips and unacknowledged alarms are back before any reading. */
class SnapshotTest {

    private static final Instant RESTART = Site.START.plus(Duration.ofMinutes(15));

    @Test
    void restoredEngineHasTheSameAlarmStatesTripsShelvingAndBypassesBeforeTheFirstReading() {
        Site before = lab(Site.START);
        livelyEvening(before);
        EngineSnapshot snapshot = before.engine().snapshot();

        Site after = lab(RESTART);
        RestoreResult restored = after.engine().restore(snapshot);

        assertThat(states(after.engine())).isEqualTo(states(before.engine())).containsExactly(
                Map.entry("o2_evacuate", AlarmState.RETURNED_UNACKNOWLEDGED),
                Map.entry("level_low", AlarmState.UNACKNOWLEDGED),
                Map.entry("p_bath_high", AlarmState.ACKNOWLEDGED),
                Map.entry("t_magnet_high", AlarmState.SHELVED),
                Map.entry("t_shield_high", AlarmState.OUT_OF_SERVICE));
        assertThat(restored.notes()).isEmpty();
        assertThat(Site.describe(restored.events())).containsExactly("18:15:00 purge_fan := 1", "18:15:00 he_supply_valve := 0");
        assertThat(after.engine().interlocks().get(1).tripped()).isTrue();
        assertThat(after.engine().alarm("p_bath_high").orElseThrow().acknowledgedBy()).contains("dana");
        assertThat(after.engine().alarm("o2_evacuate").orElseThrow().since()).isEqualTo(Site.START.plusSeconds(60));
        InterlockStatus purge = after.engine().interlocks().get(0);
        assertThat(purge.tripped()).isTrue();
        assertThat(purge.causes()).containsExactly("o2_evacuate");
        assertThat(purge.trippedAt()).contains(Site.START);
        // Shelved at 18:10 for 1h, so until 19:10 whatever the restart took: 55 min left at 18:15.
        assertThat(after.engine().alarm("t_magnet_high").orElseThrow().shelving()).contains(
                new Shelving("erik", "quench heater test", Site.START.plus(Duration.ofMinutes(70)), Duration.ofMinutes(55)));
        assertThat(after.engine().interlocks().get(1).bypass()).contains(new Bypass("erik", "valve actuator swap",
                Site.START.plus(Duration.ofMinutes(130)), Duration.ofMinutes(115)));
    }

    @Test
    void restoredEngineCarriesOnAsTheOldOneWould() {
        Site before = lab(Site.START);
        livelyEvening(before);
        Site after = lab(RESTART);
        after.engine().restore(before.engine().snapshot());

        assertThat(after.read("o2_hall", 20.9, Unit.PERCENT_VOLUME)).isEmpty();
        assertThat(after.read("p_bath", 1600, Unit.MILLIBAR)).isEmpty();
        assertThat(after.read("level_d1", 50, Unit.PERCENT)).isEmpty();
        assertThat(after.engine().reset("hall_purge", "dana").isOk()).isTrue();
        assertThat(after.read("p_bath", 1400, Unit.MILLIBAR)).containsExactly(
                "18:15:00 p_bath_high active-acknowledged -> normal: p_bath 1400 mbar back below 1500 mbar");
        assertThat(after.advance(Duration.ofMinutes(55))).containsExactly(
                "19:10:00 t_magnet_high shelved -> normal: shelving by erik expired after 55min");
    }

    @Test
    void shelvingThatRanOutWhileTheDaemonWasDownExpiresAtTheFirstTick() {
        Site before = lab(Site.START);
        livelyEvening(before);
        Site after = lab(Site.START.plus(Duration.ofHours(3)));
        after.engine().restore(before.engine().snapshot());

        assertThat(after.engine().tick().stream().map(Site::describe)).contains(
                "21:00:00 t_magnet_high shelved -> normal: shelving by erik expired after 0s",
                "21:00:00 supply_stop bypass ended: bypass by erik expired after 0s");
    }

    @Test
    void snapshotEntriesThatNoLongerMatchTheRuleSetAreReportedNotApplied() {
        Site before = lab(Site.START);
        livelyEvening(before);
        Site after = new Site(RESTART).channel("o2_hall", Unit.PERCENT_VOLUME).output("purge_fan", 0);

        RestoreResult restored = after.engine().restore(before.engine().snapshot());

        assertThat(restored.notes()).contains(
                "alarm level_low is no longer in the rule set; its state (active-unacknowledged) was dropped",
                "interlock hall_purge is no longer in the rule set; it was tripped");
    }

    @Test
    void restoreAfterTheEngineHasStartedIsRefused() {
        Site site = lab(Site.START);
        site.engine().tick();

        assertThatThrownBy(() -> site.engine().restore(site.engine().snapshot()))
                .isInstanceOf(IllegalStateException.class)
                .hasMessage("restore must come before the engine's first reading, tick or command");
    }

    /** An evening with one of every persistent state. */
    private static void livelyEvening(Site site) {
        Engine engine = site.engine();
        site.read("o2_hall", 17.5, Unit.PERCENT_VOLUME);
        site.read("level_d1", 12, Unit.PERCENT);
        site.read("p_bath", 1600, Unit.MILLIBAR);
        site.read("t_magnet", 4.2, Unit.KELVIN);
        site.read("t_shield", 60, Unit.KELVIN);
        site.advance(Duration.ofSeconds(60));
        site.read("o2_hall", 20.9, Unit.PERCENT_VOLUME);
        site.read("level_d1", 60, Unit.PERCENT);
        engine.acknowledge("p_bath_high", "dana", "relief valve checked");
        site.advance(Duration.ofMinutes(9));
        engine.shelve("t_magnet_high", "erik", Duration.ofHours(1), "quench heater test");
        engine.removeFromService("t_shield_high", "erik", "thermometer lead broken");
        engine.bypass("supply_stop", "erik", "valve actuator swap", Duration.ofHours(2));
        site.advance(Duration.ofSeconds(1));
    }

    private static Map<String, AlarmState> states(Engine engine) {
        Map<String, AlarmState> states = new LinkedHashMap<>();
        engine.alarms().forEach(status -> states.put(status.id(), status.state()));
        return states;
    }

    private static Site lab(Instant start) {
        return new Site(start)
                .channel("o2_hall", Unit.PERCENT_VOLUME, Duration.ofSeconds(1), Duration.ofDays(1), Optional.empty())
                .channel("level_d1", Unit.PERCENT, Duration.ofSeconds(10), Duration.ofDays(1), Optional.empty())
                .channel("p_bath", Unit.MILLIBAR, Duration.ofSeconds(1), Duration.ofDays(1), Optional.empty())
                .channel("t_magnet", Unit.KELVIN, Duration.ofSeconds(1), Duration.ofDays(1), Optional.empty())
                .channel("t_shield", Unit.KELVIN, Duration.ofSeconds(1), Duration.ofDays(1), Optional.empty())
                .output("purge_fan", 0).output("he_supply_valve", 1)
                .rule(limit("o2_evacuate", "o2_hall", Direction.LOW, "18 %vol", false, Optional.of("hall_purge")))
                .rule(limit("level_low", "level_d1", Direction.LOW, "20 %", true, Optional.empty()))
                .rule(limit("p_bath_high", "p_bath", Direction.HIGH, "1500 mbar", false, Optional.of("supply_stop")))
                .rule(limit("t_magnet_high", "t_magnet", Direction.HIGH, "6 K", false, Optional.empty()))
                .rule(limit("t_shield_high", "t_shield", Direction.HIGH, "90 K", false, Optional.empty()))
                .interlock(new InterlockDef("hall_purge", "Purge the hall", List.of(new OutputAction("purge_fan", 1)),
                        at("hall_purge")))
                .interlock(new InterlockDef("supply_stop", "Stop the helium supply",
                        List.of(new OutputAction("he_supply_valve", 0)), at("supply_stop")));
    }

    private static LimitRule limit(String id, String channel, Direction direction, String setpoint, boolean latching,
            Optional<String> trips) {
        Unit unit = q(setpoint).unit();
        return new LimitRule(id, channel, direction, q(setpoint), q("0 " + unit.symbol()),
                alarm(Priority.HIGH, id, Duration.ZERO, Duration.ZERO, latching, List.of(), trips), at(id));
    }
}
