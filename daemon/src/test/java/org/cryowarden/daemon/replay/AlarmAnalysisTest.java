package org.cryowarden.daemon.replay;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.cryowarden.daemon.replay.Changes.at;

import java.time.Duration;
import java.util.List;
import org.cryowarden.rules.engine.AlarmState;
import org.junit.jupiter.api.Test;

/** The nuisance-alarm measures on hand-built change lists whose expected figures are worked out in the comments. */
class AlarmAnalysisTest {

    private static final AnalysisSettings DEFAULTS = AnalysisSettings.defaults();

    @Test
    void activationsTimeActiveChatteringAndFleetingPerAlarm() {
        List<AlarmChange> changes = hourOfChanges();

        AlarmAnalysis analysis = AlarmAnalysis.of(changes, at("00:00:00"), at("01:00:00"), DEFAULTS);

        AlarmStatistics o2 = analysis.alarm("o2_a_low").orElseThrow();
        assertThat(o2.activationCount()).isEqualTo(3);
        // Active 2 s + 30 s + 35 s.
        assertThat(o2.totalActive()).isEqualTo(Duration.ofSeconds(67));
        // Starts at 0 s, 20 s and 55 s: three within less than one minute (ANSI/ISA-18.2 and EEMUA 191 chattering).
        assertThat(o2.chattering()).isTrue();
        // Only the first, of 2 s, is shorter than the default 5 s.
        assertThat(o2.fleeting()).isEqualTo(1);

        AlarmStatistics pressure = analysis.alarm("p_bath_high").orElseThrow();
        // 00:05:00-00:06:00 (acknowledgement keeps it active), 00:20:00-00:20:30 (shelving ends it),
        // 00:50:00-01:00:00 (back from shelving, still active at the end).
        assertThat(pressure.activations()).extracting(AlarmActivation::start)
                .containsExactly(at("00:05:00"), at("00:20:00"), at("00:50:00"));
        assertThat(pressure.activations().get(2).end()).isEmpty();
        assertThat(pressure.totalActive()).isEqualTo(Duration.ofSeconds(60 + 30 + 600));
        assertThat(pressure.chattering()).isFalse();
        assertThat(pressure.fleeting()).isZero();

        AlarmStatistics level = analysis.alarm("level_low").orElseThrow();
        // Starts at 00:30:00, 00:30:30 and 00:31:00 span exactly one minute: not within it.
        assertThat(level.activationCount()).isEqualTo(3);
        assertThat(level.chattering()).isFalse();
        assertThat(analysis.alarms()).extracting(AlarmStatistics::alarmId)
                .containsExactly("level_low", "o2_a_low", "p_bath_high");
    }

    @Test
    void alarmRateIsCountedPerTenMinutes() {
        AlarmAnalysis analysis = AlarmAnalysis.of(hourOfChanges(), at("00:00:00"), at("01:00:00"), DEFAULTS);

        // [00:00, 00:10): three o2_a_low and one p_bath_high; [00:20, 00:30): p_bath_high; [00:30, 00:40): three
        // level_low; [00:50, 01:00): p_bath_high back from shelving.
        assertThat(analysis.rate()).extracting(RateInterval::activations).containsExactly(4, 0, 1, 3, 0, 1);
        assertThat(analysis.rate().get(5).start()).isEqualTo(at("00:50:00"));
        assertThat(analysis.rate().get(5).end()).isEqualTo(at("01:00:00"));
        assertThat(analysis.floods()).isEmpty();
    }

    @Test
    void moreThanTenAlarmsInLessThanTenMinutesIsAFlood() {
        Changes changes = new Changes();
        // Eleven alarms 59 s apart: the 1st and 11th are 590 s apart, under 10 minutes (EEMUA 191: more than 10 in
        // 10 minutes). A twelfth at 02:10:30 is 571 s after the second, so the flood runs on to it.
        for (int i = 0; i < 11; i++) {
            int seconds = i * 59;
            changes.raise(String.format("02:%02d:%02d", seconds / 60, seconds % 60), String.format("a%02d", i));
        }
        changes.raise("02:10:30", "a11");
        changes.raise("03:00:00", "a12");

        AlarmAnalysis analysis = AlarmAnalysis.of(changes.list(), at("02:00:00"), at("04:00:00"), DEFAULTS);

        assertThat(analysis.floods()).containsExactly(new FloodPeriod(at("02:00:00"), at("02:10:30"), 12));
    }

    @Test
    void elevenAlarmsSpanningExactlyTenMinutesAreNoFlood() {
        Changes changes = new Changes();
        for (int i = 0; i < 11; i++) {
            changes.raise(String.format("02:%02d:00", i), String.format("a%02d", i));
        }

        AlarmAnalysis analysis = AlarmAnalysis.of(changes.list(), at("02:00:00"), at("03:00:00"), DEFAULTS);

        assertThat(analysis.floods()).isEmpty();
        assertThat(analysis.rate()).extracting(RateInterval::activations).containsExactly(10, 1, 0, 0, 0, 0);
    }

    @Test
    void activationsOutsideThePeriodAreLeftOutAndTheFleetingThresholdIsConfigurable() {
        AlarmAnalysis analysis = AlarmAnalysis.of(hourOfChanges(), at("00:00:10"), at("00:10:00"),
                DEFAULTS.withFleetingBelow(Duration.ofSeconds(31)));

        AlarmStatistics o2 = analysis.alarm("o2_a_low").orElseThrow();
        // The activation at 00:00:00 is before the period; of 30 s and 35 s, the first is under 31 s.
        assertThat(o2.activationCount()).isEqualTo(2);
        assertThat(o2.fleeting()).isEqualTo(1);
        assertThat(o2.chattering()).isFalse();
        assertThat(analysis.alarm("level_low")).isEmpty();
    }

    @Test
    void emptyPeriodIsRefused() {
        assertThatThrownBy(() -> AlarmAnalysis.of(List.of(), at("01:00:00"), at("01:00:00"), DEFAULTS))
                .hasMessage("the analysed period must end after it starts, got 2025-01-15T01:00:00Z to "
                        + "2025-01-15T01:00:00Z");
    }

    private static List<AlarmChange> hourOfChanges() {
        return new Changes()
                .active("00:00:00", "00:00:02", "o2_a_low")
                .active("00:00:20", "00:00:50", "o2_a_low")
                .active("00:00:55", "00:01:30", "o2_a_low")
                .raise("00:05:00", "p_bath_high")
                .change("00:05:30", "p_bath_high", AlarmState.UNACKNOWLEDGED, AlarmState.ACKNOWLEDGED)
                .change("00:06:00", "p_bath_high", AlarmState.ACKNOWLEDGED, AlarmState.NORMAL)
                .raise("00:20:00", "p_bath_high")
                .change("00:20:30", "p_bath_high", AlarmState.UNACKNOWLEDGED, AlarmState.SHELVED)
                .raise("00:30:00", "level_low")
                .clear("00:30:10", "level_low")
                .change("00:30:30", "level_low", AlarmState.RETURNED_UNACKNOWLEDGED, AlarmState.UNACKNOWLEDGED)
                .clear("00:30:40", "level_low")
                .change("00:31:00", "level_low", AlarmState.RETURNED_UNACKNOWLEDGED, AlarmState.UNACKNOWLEDGED)
                .clear("00:31:10", "level_low")
                .change("00:50:00", "p_bath_high", AlarmState.SHELVED, AlarmState.UNACKNOWLEDGED)
                .list();
    }
}
