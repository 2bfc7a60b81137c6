package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;
import static org.cryowarden.rules.engine.Site.alarm;
import static org.cryowarden.rules.engine.Site.at;
import static org.cryowarden.rules.engine.Site.q;

import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.model.DeviationRule;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.InterlockDef;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.OutputAction;
import org.cryowarden.rules.model.Priority;
import org.cryowarden.rules.model.RateRule;
import org.cryowarden.rules.model.StaleRule;
import org.cryowarden.rules.model.VoteRule;
import org.junit.jupiter.api.Test;

/**
 * A whole invented night in magnet hall B, 18:00 to 06:00: five channels read every second (three oxygen cells, a
 * helium dewar level, a bath pressure), one engine tick per second, and an operator. The script is built so that
 * every expected event follows from it by construction: a value crosses a setpoint at a known second, a delay adds
 * its exact length, a least-squares fit of an exact straight line gives its slope.
 */
class ScriptedNightTest {

    private static final int NIGHT_SECONDS = 12 * 3600;

    /** Seconds from 18:00:00. */
    private static final int O2_A_DIP = hms(19, 0, 0);
    private static final int O2_A_DIP_END = hms(19, 5, 0);
    private static final int O2_B_SILENT = hms(21, 0, 0);
    private static final int O2_B_BACK = hms(21, 1, 0);
    private static final int RELEASE = hms(23, 0, 0);
    private static final int RELEASE_END = hms(23, 10, 0);
    private static final int LEVEL_SILENT = hms(0, 30, 0);
    private static final int LEVEL_BACK = hms(1, 0, 0);
    private static final int PRESSURE_PEAK = hms(3, 0, 0);
    private static final int PRESSURE_PEAK_END = hms(3, 2, 0);

    private static final List<String> EXPECTED = List.of(
            // 19.5 %vol with a 10 s on-delay (29 CFR 1910.146(b)): o2_a dips at 19:00:00, so the alarm comes at 19:00:10.
            "19:00:00 o2_disagree normal -> active-unacknowledged: "
                    + "o2_b and o2_a differ by 1.6 %vol, more than the tolerance of 1 %vol",
            "19:00:10 o2_a_low normal -> active-unacknowledged: "
                    + "o2_a 19.3 %vol below 19.5 %vol, held for the on-delay of 10s",
            "19:05:00 o2_a_low active-unacknowledged -> returned-unacknowledged: "
                    + "o2_a 20.9 %vol back above 19.5 %vol by the deadband of 0.2 %vol",
            "19:05:00 o2_disagree active-unacknowledged -> returned-unacknowledged: "
                    + "spread back to 0 %vol, within the tolerance of 1 %vol",
            "19:06:40 o2_a_low returned-unacknowledged -> normal: acknowledged by dana",
            "19:06:40 o2_disagree returned-unacknowledged -> normal: acknowledged by dana",
            // o2_b's last reading is at 20:59:59; 5 s later the channel is STALE.
            "21:00:04 o2_b_fault normal -> active-unacknowledged: o2_b STALE (no reading for 5s, polled every 1s)",
            "21:01:00 o2_b_fault active-unacknowledged -> returned-unacknowledged: o2_b GOOD again",
            "21:05:00 o2_b_fault returned-unacknowledged -> shelved: shelved by erik for 1h until 2025-01-15T22:05:00Z",
            "22:05:00 o2_b_fault shelved -> normal: shelving by erik expired after 1h",
            // A release takes o2_a and o2_c to 17.5 %vol: below 18 %vol (evacuate, common practice) on two of three.
            "23:00:00 o2_disagree normal -> active-unacknowledged: "
                    + "o2_b and o2_a differ by 3.4 %vol, more than the tolerance of 1 %vol",
            "23:00:00 o2_vote_evacuate normal -> active-unacknowledged: "
                    + "2oo3 met: 2 of 3 below 18 %vol or faulted (o2_a 17.5 %vol, o2_c 17.5 %vol)",
            "23:00:00 hall_purge tripped by o2_vote_evacuate",
            "23:00:00 purge_fan := 1",
            "23:00:10 o2_a_low normal -> active-unacknowledged: "
                    + "o2_a 17.5 %vol below 19.5 %vol, held for the on-delay of 10s",
            "23:10:00 o2_a_low active-unacknowledged -> returned-unacknowledged: "
                    + "o2_a 20.9 %vol back above 19.5 %vol by the deadband of 0.2 %vol",
            "23:10:00 o2_vote_evacuate active-unacknowledged -> returned-unacknowledged: "
                    + "2oo3 no longer met: 1 of 3 below 18 %vol or faulted (o2_c 17.5 %vol)",
            "23:10:00 o2_disagree active-unacknowledged -> returned-unacknowledged: "
                    + "spread back to 0 %vol, within the tolerance of 1 %vol",
            "23:15:00 o2_vote_evacuate returned-unacknowledged -> normal: acknowledged by dana",
            "23:15:00 o2_a_low returned-unacknowledged -> normal: acknowledged by dana",
            "23:15:00 o2_disagree returned-unacknowledged -> normal: acknowledged by dana",
            "23:15:00 hall_purge reset by dana",
            "23:15:00 purge_fan := 0",
            // The level meter is silent from 00:30:00 (last reading 00:29:59) and comes back at 01:00:00.
            "00:30:04 level_fault normal -> active-unacknowledged: "
                    + "level_d1 STALE (no reading for 5s, polled every 1s)",
            "01:00:00 level_fault active-unacknowledged -> returned-unacknowledged: level_d1 GOOD again",
            // From 01:00:00 the level falls along a straight line of 10 %/h; the fit may judge once it covers
            // half its 30 min window, at 01:15:00, and then sees exactly 10 %/h.
            "01:15:00 level_fast_fall normal -> active-unacknowledged: level_d1 falling at 10 %/h, faster than 3 %/h",
            "01:20:00 level_fast_fall active-unacknowledged -> active-acknowledged: acknowledged by dana",
            // 1.35 bar for two minutes, then 60 s of off-delay.
            "03:00:00 p_bath_high normal -> active-unacknowledged: p_bath 1350 mbar above 1300 mbar",
            "03:03:00 p_bath_high active-unacknowledged -> returned-unacknowledged: "
                    + "p_bath 1050 mbar back below 1300 mbar by the deadband of 20 mbar, clear for the off-delay of 1min",
            // 60 % - 10 %/h * 4 h = 20 % exactly at 05:00:00, which is not below 20 %; one second later it is.
            "05:00:01 level_low normal -> active-unacknowledged: level_d1 19.9972 % below 20 %");

    @Test
    void wholeNightGivesExactlyTheEventsTheScriptImplies() {
        Night night = new Night();
        List<EngineEvent> events = night.run();

        assertThat(Site.describe(events)).containsExactlyElementsOf(EXPECTED);
        assertThat(night.readings).isEqualTo(5 * NIGHT_SECONDS - 60 - 1800);
        assertThat(night.refusals).containsExactly("interlock hall_purge cannot be reset while its cause persists: "
                + "alarm o2_vote_evacuate is still active (2oo3 met: 2 of 3 below 18 %vol or faulted "
                + "(o2_a 17.5 %vol, o2_c 17.5 %vol)); clear the cause first, then reset");
        assertThat(night.engine.alarm("level_low").orElseThrow().state()).isEqualTo(AlarmState.UNACKNOWLEDGED);
        assertThat(night.engine.interlocks().get(0).tripped()).isFalse();
    }

    @Test
    void secondRunOfTheSameNightGivesTheIdenticalEventList() {
        List<EngineEvent> first = new Night().run();
        List<EngineEvent> second = new Night().run();

        assertThat(second).isEqualTo(first);
        assertThat(first).hasSize(EXPECTED.size());
    }

    /** One run of the script against a fresh engine and clock. */
    private static final class Night {

        final VirtualTimeSource clock = new VirtualTimeSource(Site.START);
        final Engine engine = new Engine(hallB(), clock);
        final List<EngineEvent> events = new ArrayList<>();
        final List<String> refusals = new ArrayList<>();
        int readings;

        List<EngineEvent> run() {
            for (int t = 0; t < NIGHT_SECONDS; t++) {
                events.addAll(engine.tick());
                read("o2_a", Unit.PERCENT_VOLUME, oxygenA(t));
                if (t < O2_B_SILENT || t >= O2_B_BACK) {
                    read("o2_b", Unit.PERCENT_VOLUME, 20.9);
                }
                read("o2_c", Unit.PERCENT_VOLUME, t >= RELEASE && t < RELEASE_END ? 17.5 : 20.9);
                if (t < LEVEL_SILENT) {
                    read("level_d1", Unit.PERCENT, 62);
                } else if (t >= LEVEL_BACK) {
                    read("level_d1", Unit.PERCENT, 60 - 10.0 * (t - LEVEL_BACK) / 3600);
                }
                read("p_bath", Unit.MILLIBAR, t >= PRESSURE_PEAK && t < PRESSURE_PEAK_END ? 1350 : 1050);
                operator(t);
                clock.advance(Duration.ofSeconds(1));
            }
            return events;
        }

        private void operator(int t) {
            if (t == hms(19, 6, 40)) {
                command(engine.acknowledge("o2_a_low", "dana", "cell check gas done"));
                command(engine.acknowledge("o2_disagree", "dana", ""));
            } else if (t == hms(21, 5, 0)) {
                command(engine.shelve("o2_b_fault", "erik", Duration.ofHours(1), "sensor head replaced, watching it"));
            } else if (t == hms(23, 5, 0)) {
                command(engine.reset("hall_purge", "dana"));
            } else if (t == hms(23, 15, 0)) {
                command(engine.acknowledge("o2_vote_evacuate", "dana", "release from the transfer line, valve shut"));
                command(engine.acknowledge("o2_a_low", "dana", ""));
                command(engine.acknowledge("o2_disagree", "dana", ""));
                command(engine.reset("hall_purge", "dana"));
            } else if (t == hms(1, 20, 0)) {
                command(engine.acknowledge("level_fast_fall", "dana", "vacuum problem suspected, refill at 06:00"));
            }
        }

        private void command(CommandResult result) {
            events.addAll(result.events());
            result.refusal().ifPresent(refusals::add);
        }

        private void read(String channel, Unit unit, double value) {
            readings++;
            events.addAll(engine.onReading(Reading.good(channel, value, unit, clock.wallNow())));
        }

        private static double oxygenA(int t) {
            if (t >= O2_A_DIP && t < O2_A_DIP_END) {
                return 19.3;
            }
            return t >= RELEASE && t < RELEASE_END ? 17.5 : 20.9;
        }
    }

    private static EngineConfig hallB() {
        Site site = new Site()
                .channel("o2_a", Unit.PERCENT_VOLUME).channel("o2_b", Unit.PERCENT_VOLUME)
                .channel("o2_c", Unit.PERCENT_VOLUME).channel("level_d1", Unit.PERCENT)
                .channel("p_bath", Unit.MILLIBAR)
                .output("purge_fan", 0)
                .rule(new LimitRule("o2_a_low", "o2_a", Direction.LOW, q("19.5 %vol"), q("0.2 %vol"),
                        alarm(Priority.HIGH, "Oxygen low at cell A", Duration.ofSeconds(10), Duration.ZERO, false,
                                List.of(), Optional.empty()), at("o2_a_low")))
                .rule(new VoteRule("o2_vote_evacuate", List.of("o2_a", "o2_b", "o2_c"), 2, Direction.LOW, q("18 %vol"),
                        q("0.5 %vol"), true, alarm(Priority.CRITICAL, "Evacuate hall B", Duration.ZERO, Duration.ZERO,
                                false, List.of(), Optional.of("hall_purge")), at("o2_vote_evacuate")))
                .rule(new DeviationRule("o2_disagree", List.of("o2_a", "o2_b", "o2_c"), q("1 %vol"),
                        alarm(Priority.LOW, "Oxygen cells disagree"), at("o2_disagree")))
                .rule(new StaleRule("o2_b_fault", "o2_b", Optional.of(Duration.ofSeconds(10)),
                        alarm(Priority.HIGH, "Oxygen cell B not delivering"), at("o2_b_fault")))
                .rule(new StaleRule("level_fault", "level_d1", Optional.of(Duration.ofSeconds(10)),
                        alarm(Priority.MEDIUM, "Dewar D1 level meter not delivering"), at("level_fault")))
                .rule(new RateRule("level_fast_fall", "level_d1", Direction.LOW, q("3 %"), Duration.ofHours(1),
                        Duration.ofMinutes(30), alarm(Priority.MEDIUM, "Dewar D1 losing liquid fast"),
                        at("level_fast_fall")))
                .rule(new LimitRule("level_low", "level_d1", Direction.LOW, q("20 %"), q("2 %"),
                        alarm(Priority.MEDIUM, "Dewar D1 level low", Duration.ZERO, Duration.ZERO, true, List.of(),
                                Optional.empty()), at("level_low")))
                .rule(new LimitRule("p_bath_high", "p_bath", Direction.HIGH, q("1300 mbar"), q("20 mbar"),
                        alarm(Priority.HIGH, "Bath pressure high", Duration.ZERO, Duration.ofMinutes(1), false,
                                List.of(), Optional.empty()), at("p_bath_high")))
                .interlock(new InterlockDef("hall_purge", "Purge fan on",
                        List.of(new OutputAction("purge_fan", 1)), at("hall_purge")));
        return site.config();
    }

    /** Seconds from 18:00:00 to the given wall time of this night (times before 18:00 are the next morning). */
    private static int hms(int hour, int minute, int second) {
        int fromMidnight = hour * 3600 + minute * 60 + second;
        int start = 18 * 3600;
        return fromMidnight >= start ? fromMidnight - start : fromMidnight + 24 * 3600 - start;
    }
}
