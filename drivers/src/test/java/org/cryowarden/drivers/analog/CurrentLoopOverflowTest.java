package org.cryowarden.drivers.analog;

import static org.assertj.core.api.Assertions.assertThat;

import org.cryowarden.rules.Quality;
import org.junit.jupiter.api.Test;

/**
 * A range whose span overflows a double scaled an in-range current to an infinite GOOD value. Found by
 * {@link CurrentLoopFuzzTest}.
 */
class CurrentLoopOverflowTest {

    @Test
    void currentThatScalesBeyondDoubleRangeIsBad() {
        CurrentLoop loop = new CurrentLoop(-Double.MAX_VALUE, Double.MAX_VALUE);

        assertThat(loop.convert(20.0)).isEqualTo(new CurrentLoop.Value(Double.NaN, Quality.BAD,
                "loop current 20.00 mA scales to a value too large to represent on the range "
                        + "[-1.7976931348623157E308, 1.7976931348623157E308]"));
        assertThat(loop.convert(4.0).quality()).isEqualTo(Quality.BAD);
    }
}
