package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;

import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.FloodDef;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.Priority;
import org.junit.jupiter.api.Test;

/**
 * Alarm floods. Criterion: EEMUA Publication 191, more than 10 alarms in 10 minutes per operator; end: fewer
 * than 5 in 10 minutes, as ANSI/ISA-18.2-2016 guidance puts it (as commonly quoted; from memory of the text).
 */
class AlarmFloodTest {

    @Test
    void thirtyAlarmsInTwoMinutesGiveOneFloodStartAndOneEndWithTheFirstOut() {
        Site site = thirtyChannels(FloodDef.DEFAULT);
        List<String> floods = new ArrayList<>();
        // One alarm every 4 s: 30 alarms from 18:00:00 to 18:01:56.
        for (int i = 0; i < 30; i++) {
            floods.addAll(floodEvents(site.read("t" + i, 300, Unit.KELVIN)));
            floods.addAll(floodEvents(site.advance(Duration.ofSeconds(4))));
        }
        floods.addAll(floodEvents(site.tickFor(Duration.ofMinutes(15))));

        // The 11th alarm (18:00:40) starts it. It ends when fewer than 5 remain in the last 10 min: at 18:11:40,
        // when the alarm of 18:01:40 leaves the window and those of 18:01:44 to 18:01:56 (4) are left.
        assertThat(floods).containsExactly(
                "18:00:40 flood started: 11 alarms, first out hot-0 at 18:00:00",
                "18:11:40 flood ended: 30 alarms since hot-0 in 11min40s");
        assertThat(site.engine().flood()).isEmpty();
    }

    @Test
    void tenAlarmsInTenMinutesAreNotAFlood() {
        Site site = thirtyChannels(FloodDef.DEFAULT);
        List<String> floods = new ArrayList<>();
        for (int i = 0; i < 10; i++) {
            floods.addAll(floodEvents(site.read("t" + i, 300, Unit.KELVIN)));
            site.clock.advance(Duration.ofSeconds(30));
        }
        assertThat(floods).isEmpty();
        // The 11th, 5 min after the first: still within 10 min of it.
        floods.addAll(floodEvents(site.read("t10", 300, Unit.KELVIN)));
        assertThat(floods).containsExactly("18:05:00 flood started: 11 alarms, first out hot-0 at 18:00:00");
        assertThat(site.engine().flood()).map(FloodStarted::count).contains(11);
    }

    @Test
    void criterionIsConfigurable() {
        Site site = thirtyChannels(new FloodDef(3, Duration.ofMinutes(1), 2));
        List<String> floods = new ArrayList<>();
        for (int i = 0; i < 4; i++) {
            floods.addAll(floodEvents(site.read("t" + i, 300, Unit.KELVIN)));
            floods.addAll(floodEvents(site.advance(Duration.ofSeconds(10))));
        }
        floods.addAll(floodEvents(site.tickFor(Duration.ofMinutes(2))));
        // More than 3 in 1 min: the 4th alarm, at 18:00:30, starts it. Fewer than 2 in the last minute ends it:
        // at 18:01:20 the 18:00:20 alarm leaves the window and only the 18:00:30 one is left.
        assertThat(floods).containsExactly(
                "18:00:30 flood started: 4 alarms, first out hot-0 at 18:00:00",
                "18:01:20 flood ended: 4 alarms since hot-0 in 1min20s");
    }

    @Test
    void shelvedAlarmsDoNotCountTowardsAFlood() {
        Site site = thirtyChannels(FloodDef.DEFAULT);
        for (int i = 0; i < 15; i++) {
            site.engine().shelve("hot-" + i, "night operator", Duration.ofHours(1), "sensor rack under repair");
        }
        List<String> floods = new ArrayList<>();
        for (int i = 0; i < 20; i++) {
            floods.addAll(floodEvents(site.read("t" + i, 300, Unit.KELVIN)));
            site.clock.advance(Duration.ofSeconds(1));
        }
        // 5 annunciated activations of 20.
        assertThat(floods).isEmpty();
    }

    // --- helpers ---

    private static List<String> floodEvents(List<String> lines) {
        return lines.stream().filter(line -> line.contains(" flood ")).toList();
    }

    private static Site thirtyChannels(FloodDef criterion) {
        Site site = new Site().flood(criterion);
        for (int i = 0; i < 30; i++) {
            site.channel("t" + i, Unit.KELVIN, Duration.ofSeconds(1), Duration.ofHours(1), Optional.empty());
            site.rule(new LimitRule("hot-" + i, "t" + i, Direction.HIGH, Site.q("250 K"), Site.q("0 K"),
                    Site.alarm(Priority.LOW, "Sensor " + i + " warm"), Site.at("hot-" + i)));
        }
        return site;
    }
}
