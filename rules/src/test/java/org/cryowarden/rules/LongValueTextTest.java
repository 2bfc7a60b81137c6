package org.cryowarden.rules;

import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;

/**
 * A long value in a configuration file (up to the 1 MiB a file may have) is refused at once, not after minutes
 * of regular-expression backtracking. Found by {@link QuantityFuzzTest}: a duration of 100,000 digits without a
 * unit took over a quarter of an hour, a quantity of 3,000 digits before a line separator about a minute.
 */
class LongValueTextTest {

    @Test
    @Timeout(value = 2, unit = TimeUnit.SECONDS, threadMode = Timeout.ThreadMode.SEPARATE_THREAD)
    void durationOfAMillionDigitsWithoutAUnitIsRefusedQuickly() {
        String text = "1".repeat(1_000_000) + "x";

        assertThatThrownBy(() -> DurationSyntax.parse(text)).isInstanceOf(IllegalArgumentException.class)
                .hasMessageEndingWith("' is not a duration: expected a number and one of ms, s, min, h, d, e.g. "
                        + "30s, 5min, 2h or 1h30min");
    }

    @Test
    @Timeout(value = 2, unit = TimeUnit.SECONDS, threadMode = Timeout.ThreadMode.SEPARATE_THREAD)
    void quantityOfAMillionDigitsBeforeALineSeparatorIsRefusedQuickly() {
        String text = "1".repeat(1_000_000) + "a\u2028b";

        assertThatThrownBy(() -> Quantity.parse(text)).isInstanceOf(IllegalArgumentException.class)
                .hasMessageEndingWith("' is not a quantity: expected a number followed by a unit, e.g. 101.325kPa "
                        + "or 4.2 K");
    }
}
