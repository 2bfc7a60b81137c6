package org.cryowarden.daemon.history;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.ArrayList;
import java.util.List;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.junit.jupiter.api.Test;

/** The merge of per-channel streams is in time order, equal instants in stream order (what the engine saw). */
class MergedReadingsTest {

    @Test
    void readingsComeInTimeOrderAndEqualInstantsInStreamOrder() {
        List<Reading> a = List.of(at("a", 0), at("a", 2), at("a", 2), at("a", 5));
        List<Reading> b = List.of(at("b", 1), at("b", 2), at("b", 9));
        List<Reading> c = List.of();
        List<Reading> d = List.of(at("d", 0), at("d", 2));
        List<String> order = new ArrayList<>();

        MergedReadings.of(List.of(a.iterator(), b.iterator(), c.iterator(), d.iterator()))
                .forEachRemaining(r -> order.add(r.channel() + r.timestamp().getEpochSecond() % 60));

        // common practice: a stable k-way merge, ties broken by stream position, then by position within a stream
        assertThat(order).containsExactly("a0", "d0", "b1", "a2", "a2", "b2", "d2", "a5", "b9");
    }

    @Test
    void aStreamGoingBackInTimeIsRefusedWithBothInstants() {
        MergedReadings merged = MergedReadings.of(List.of(List.of(at("a", 5), at("a", 3)).iterator()));

        // the stream's next reading is read when its head is handed out
        assertThatThrownBy(merged::next).isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("readings of a go back in time from " + at("a", 5).timestamp() + " to "
                        + at("a", 3).timestamp());
    }

    private static Reading at(String channel, int second) {
        return Reading.good(channel, second, Unit.KELVIN, Series.DUSK.plusSeconds(second));
    }
}
