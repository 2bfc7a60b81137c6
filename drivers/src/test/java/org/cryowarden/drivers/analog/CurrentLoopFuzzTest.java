package org.cryowarden.drivers.analog;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import com.code_intelligence.jazzer.api.FuzzedDataProvider;
import com.code_intelligence.jazzer.junit.FuzzTest;
import org.cryowarden.rules.Quality;

/**
 * Coverage-guided fuzzing of 4-20 mA scaling with Jazzer: any configured range either is refused with a
 * message or scales every loop current to a finite value with a reason for anything not GOOD; a BAD value is
 * never a number that could pass a limit check.
 */
class CurrentLoopFuzzTest {

    @FuzzTest(maxDuration = "10s")
    void anyRangeAndCurrentGiveAFiniteValueOrABadReading(FuzzedDataProvider data) {
        double low = data.consumeDouble();
        double high = data.consumeDouble();
        double milliamps = data.consumeBoolean() ? data.consumeRegularDouble(0, 25) : data.consumeDouble();

        if (!Double.isFinite(low) || !Double.isFinite(high) || low == high) {
            assertThatThrownBy(() -> new CurrentLoop(low, high)).isInstanceOf(IllegalArgumentException.class)
                    .hasMessageStartingWith("a 4-20 mA range needs two different finite ends");
            return;
        }
        CurrentLoop.Value value = new CurrentLoop(low, high).convert(milliamps);

        if (value.quality() == Quality.BAD) {
            assertThat(value.value()).isNaN();
            assertThat(value.reason()).isNotBlank();
        } else {
            assertThat(Double.isFinite(value.value())).as("%s for %s mA on [%s, %s]", value, milliamps, low, high)
                    .isTrue();
            assertThat(value.quality() == Quality.GOOD).isEqualTo(value.reason().isEmpty());
        }
    }
}
