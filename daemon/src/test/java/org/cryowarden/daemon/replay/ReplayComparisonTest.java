package org.cryowarden.daemon.replay;

import static org.assertj.core.api.Assertions.assertThat;
import static org.cryowarden.daemon.replay.Changes.at;

import java.time.Duration;
import java.util.List;
import java.util.Optional;
import org.cryowarden.daemon.replay.AlarmDifference.Kind;
import org.junit.jupiter.api.Test;

/** Recorded against replayed activations, on hand-built lists. */
class ReplayComparisonTest {

    @Test
    void newGoneAndMovedActivationsAreClassifiedInTimeOrder() {
        List<AlarmChange> recorded = new Changes()
                .active("10:00:00", "10:05:00", "A")
                .active("10:20:00", "10:21:00", "A")
                .raise("11:00:00", "B")
                .active("12:00:00", "12:10:00", "C")
                .list();
        List<AlarmChange> replayed = new Changes()
                .active("09:00:00", "09:01:00", "D")
                .active("10:01:00", "10:05:00", "A")
                .active("10:20:00", "10:21:00", "A")
                .active("10:30:00", "10:31:00", "A")
                .active("12:00:00", "12:10:00", "C")
                .list();

        ReplayComparison comparison = ReplayComparison.of(recorded, replayed, at("13:00:00"));

        assertThat(comparison.differences()).containsExactly(
                difference(Kind.NEW, "D", null, "09:00:00"),
                difference(Kind.MOVED, "A", "10:00:00", "10:01:00"),
                difference(Kind.NEW, "A", null, "10:30:00"),
                difference(Kind.GONE, "B", "11:00:00", null));
        assertThat(comparison.differences().get(1).shift()).contains(Duration.ofMinutes(1));
        assertThat(comparison.differences().get(0).shift()).isEmpty();
        assertThat(comparison.unchanged()).isEqualTo(2);
        assertThat(comparison.identical()).isFalse();
    }

    @Test
    void activationsThatOnlyTouchAreNotTheSame() {
        List<AlarmChange> recorded = new Changes().active("13:00:00", "13:01:00", "E").list();
        List<AlarmChange> replayed = new Changes().active("13:01:00", "13:02:00", "E").list();

        ReplayComparison comparison = ReplayComparison.of(recorded, replayed, at("14:00:00"));

        assertThat(comparison.differences()).containsExactly(
                difference(Kind.GONE, "E", "13:00:00", null),
                difference(Kind.NEW, "E", null, "13:01:00"));
    }

    @Test
    void anOpenActivationOverlapsALaterStartAndCountsAsMoved() {
        // Recorded active from 20:00 to the end; the replay raises it at 20:15 (a lower limit crossed later).
        List<AlarmChange> recorded = new Changes().raise("20:00:00", "o2_low").list();
        List<AlarmChange> replayed = new Changes().raise("20:15:00", "o2_low").list();

        ReplayComparison comparison = ReplayComparison.of(recorded, replayed, at("21:00:00"));

        assertThat(comparison.differences()).containsExactly(difference(Kind.MOVED, "o2_low", "20:00:00", "20:15:00"));
        assertThat(comparison.differences().get(0).shift()).contains(Duration.ofMinutes(15));
    }

    @Test
    void sameActivationsAreIdentical() {
        List<AlarmChange> night = new Changes().active("01:00:00", "01:00:30", "A").raise("02:00:00", "B").list();

        ReplayComparison comparison = ReplayComparison.of(night, night, at("03:00:00"));

        assertThat(comparison.identical()).isTrue();
        assertThat(comparison.unchanged()).isEqualTo(2);
    }

    private static AlarmDifference difference(Kind kind, String alarm, String recorded, String replayed) {
        return new AlarmDifference(kind, alarm, Optional.ofNullable(recorded).map(Changes::at),
                Optional.ofNullable(replayed).map(Changes::at));
    }
}
