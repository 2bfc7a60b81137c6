package org.cryowarden.daemon.replay;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.cryowarden.daemon.replay.RecordedNight.config;
import static org.cryowarden.daemon.replay.RecordedNight.q;
import static org.cryowarden.daemon.replay.RecordedNight.time;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.cryowarden.daemon.replay.AlarmDifference.Kind;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.engine.AlarmTransition;
import org.cryowarden.rules.engine.EngineConfig;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/** A recorded night, stored as history blocks, replayed through a fresh engine with the same or changed rules. */
class ReplayTest {

    private static RecordedNight night;

    @BeforeAll
    static void recordTheNight() {
        night = RecordedNight.record();
    }

    @Test
    void replayWithTheSameRulesReproducesTheRecordedEventsExactly() {
        ReplayResult replay = replay(config(q("0 %vol"), q("19.5 %vol")));

        assertThat(replay.events()).isEqualTo(night.events);
        assertThat(replay.refusals()).isEmpty();
        // Three channels every second, less the two silent minutes of o2_b.
        assertThat(replay.readings()).isEqualTo(3L * RecordedNight.SECONDS - 120);
        assertThat(replay.ticks()).isEqualTo(RecordedNight.SECONDS);
        assertThat(night.events).hasSizeGreaterThan(20);
    }

    @Test
    void ditheringWithoutDeadbandIsChatteringAndADeadbandRemovesIt() {
        Instant end = RecordedNight.LAST_SECOND;
        AlarmAnalysis recorded = AlarmAnalysis.of(AlarmChange.of(night.events), RecordedNight.START, end,
                AnalysisSettings.defaults());
        ReplayResult replay = replay(config(q("0.2 %vol"), q("19.5 %vol")));
        AlarmAnalysis tuned = AlarmAnalysis.of(replay.alarmChanges(), RecordedNight.START, end,
                AnalysisSettings.defaults());

        // 19.45 %vol in every other 10 s slot of 3 minutes: below 19.5 %vol at 0, 20, ..., 160 s, each a new
        // activation without a deadband: 9 activations, 3 within one minute (ANSI/ISA-18.2, EEMUA 191 chattering).
        AlarmStatistics before = recorded.alarm("o2_a_low").orElseThrow();
        assertThat(before.activationCount()).isEqualTo(9);
        assertThat(before.chattering()).isTrue();
        // With 0.2 %vol of deadband 19.55 %vol is no clear: one activation until 20.9 %vol returns at 19:03:00.
        AlarmStatistics after = tuned.alarm("o2_a_low").orElseThrow();
        assertThat(after.activationCount()).isEqualTo(1);
        assertThat(after.chattering()).isFalse();
        assertThat(after.totalActive()).isEqualTo(Duration.ofMinutes(3));
        assertThat(tuned.anyChattering()).isFalse();

        ReplayComparison comparison = ReplayComparison.of(AlarmChange.of(night.events), replay.alarmChanges(), end);
        List<AlarmDifference> expected = new ArrayList<>();
        for (int k = 1; k < 9; k++) {
            expected.add(new AlarmDifference(Kind.GONE, "o2_a_low", Optional.of(time(19, 0, 20 * k % 60)
                    .plusSeconds(60L * (20 * k / 60))), Optional.empty()));
        }
        assertThat(comparison.differences()).containsExactlyElementsOf(expected);
        assertThat(replay.refusals()).isEmpty();
    }

    @Test
    void lowerSetpointMovesTheOxygenAlarmByTheTimeTheFallTakes() {
        ReplayResult replay = replay(config(q("0 %vol"), q("19.0 %vol")));

        ReplayComparison comparison = ReplayComparison.of(AlarmChange.of(night.events), replay.alarmChanges(),
                RecordedNight.LAST_SECOND);

        // o2_b = (2090 - s) / 100 %vol, s seconds after 22:00:00. Below 19.5 first at s = 141, alarm after the
        // 10 s on-delay at 22:02:31; below 19.0 first at s = 191, alarm at 22:03:21: 50 s later.
        assertThat(comparison.differences()).containsExactly(new AlarmDifference(Kind.MOVED, "o2_b_low",
                Optional.of(time(22, 2, 31)), Optional.of(time(22, 3, 21))));
        assertThat(comparison.differences().get(0).shift()).contains(Duration.ofSeconds(50));
        // The transition carries the reading that first crossed, (2090 - 141) / 100 %vol.
        assertThat(firstRaise(night.events, "o2_b_low").reading().orElseThrow().value()).isEqualTo(19.49);
    }

    @Test
    void refusedOperatorActionIsReportedAndTheReplayGoesOn() {
        List<OperatorAction> actions = new ArrayList<>(night.actions);
        actions.add(new OperatorAction.Acknowledge(time(20, 0, 0), "o2_c_low", "dana", ""));

        ReplayResult replay = new Replay(config(q("0 %vol"), q("19.5 %vol")), RecordedNight.START,
                Duration.ofSeconds(1)).run(night.storedReadings(), actions, RecordedNight.LAST_SECOND);

        assertThat(replay.refusals()).containsExactly("2025-01-15T20:00:00Z acknowledge o2_c_low by dana: "
                + "there is no alarm 'o2_c_low': did you mean 'o2_a_low'?");
        assertThat(replay.events()).isEqualTo(night.events);
    }

    @Test
    void readingBeforeTheReplayStartIsRefused() {
        Replay replay = new Replay(config(q("0 %vol"), q("19.5 %vol")), RecordedNight.START, Duration.ofSeconds(1));
        List<Reading> early = List.of(Reading.good("o2_a", 20.9, Unit.PERCENT_VOLUME,
                RecordedNight.START.minusSeconds(1)));

        assertThatThrownBy(() -> replay.run(early.iterator(), List.of(), RecordedNight.LAST_SECOND))
                .isInstanceOf(IllegalArgumentException.class)
                .hasMessage("reading of o2_a at 2025-01-15T17:59:59Z is earlier than the replay's clock at "
                        + "2025-01-15T18:00:00Z: a replay needs its readings in time order, from its start");
    }

    private static ReplayResult replay(EngineConfig config) {
        return new Replay(config, RecordedNight.START, Duration.ofSeconds(1))
                .run(night.storedReadings(), night.actions, RecordedNight.LAST_SECOND);
    }

    private static AlarmTransition firstRaise(List<? extends Object> events, String alarm) {
        return events.stream().filter(AlarmTransition.class::isInstance).map(AlarmTransition.class::cast)
                .filter(t -> t.alarmId().equals(alarm)).findFirst().orElseThrow();
    }
}
