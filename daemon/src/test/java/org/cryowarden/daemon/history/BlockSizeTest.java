package org.cryowarden.daemon.history;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;
import org.cryowarden.rules.Reading;
import org.junit.jupiter.api.Test;

/** The stored size of a night of 1 Hz readings stays within the project's goal of 2 bytes per reading. */
class BlockSizeTest {

    @Test
    void typicalNightCostsAtMostTwoBytesPerReading() {
        long bytes = 0;
        long readings = 0;
        for (List<Reading> series : List.of(Series.driftingLevel(1), Series.oxygenCell(2), Series.constant(),
                Series.stepped())) {
            for (int from = 0; from < series.size(); from += 3600) {
                bytes += Series.encode(series.subList(from, from + 3600)).byteSize();
                readings += 3600;
            }
        }

        // Goal set for cryowarden's raw history (common practice for a compact time-series store, from memory:
        // Pelkonen et al. 2015 report 1.37 bytes per point on their production data).
        assertThat((double) bytes / readings).isLessThanOrEqualTo(2.0);
    }

    @Test
    void decimalValuesCostLessThanXorAlone() {
        List<Reading> oxygen = Series.oxygenCell(2).subList(0, 3600);
        BlockEncoder xor = BlockEncoder.xorOnly("o2_a", oxygen.get(0).unit());
        oxygen.forEach(xor::append);

        int decimal = Series.encode(oxygen).byteSize();

        // A step of 0.01 %vol changes most mantissa bits of a binary64, so XOR keeps ~40 of them; the scaled integer
        // moves by a few units (IEEE 754-2019 binary64; Pelkonen et al. 2015 section 4.1.2 on XOR of similar values).
        assertThat(decimal).isLessThan(xor.snapshot().byteSize() / 3);
    }
}
