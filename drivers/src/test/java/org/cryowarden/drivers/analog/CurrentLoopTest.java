package org.cryowarden.drivers.analog;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.cryowarden.rules.Quality;
import org.junit.jupiter.api.Test;

class CurrentLoopTest {

    private final CurrentLoop level = new CurrentLoop(0, 100);

    @Test
    void loopScalesLinearlyFromFourToTwentyMilliamps() {
        // common practice: 4 mA is the low end, 20 mA the high end, linear between; 12 mA is mid-scale.
        assertThat(level.convert(4.0).value()).isEqualTo(0.0);
        assertThat(level.convert(12.0).value()).isEqualTo(50.0);
        assertThat(level.convert(20.0).value()).isEqualTo(100.0);
        assertThat(new CurrentLoop(-50, 150).convert(8.0).value()).isCloseTo(0.0, within(1e-12));
        assertThat(level.milliampsFor(25.0)).isEqualTo(8.0);
    }

    @Test
    void currentsBelowThreePointSixOrAboveTwentyOneSignalFailure() {
        // NAMUR NE 43 band limits as published summaries state them (instrunexus.com NE 43 guide): < 3.6 mA or > 21 mA is a failure signal.
        CurrentLoop.Value low = level.convert(3.59);
        CurrentLoop.Value high = level.convert(21.2);
        CurrentLoop.Value open = level.convert(0.0);

        assertThat(low.quality()).isEqualTo(Quality.BAD);
        assertThat(low.reason()).isEqualTo("sensor failure / wire break: loop current 3.59 mA is below 3.6 mA (NAMUR NE 43)");
        assertThat(high.reason()).isEqualTo("sensor failure / wire break: loop current 21.20 mA is above 21 mA (NAMUR NE 43)");
        assertThat(open.quality()).isEqualTo(Quality.BAD);
        assertThat(Double.isNaN(open.value())).isTrue();
    }

    @Test
    void measuringRangeIsGoodAndTheBandsBetweenAreUncertain() {
        // NAMUR NE 43 (instrunexus.com NE 43 guide): 3.8-20.5 mA measuring range; 3.6-3.8 and 20.5-21 neither valid nor failure.
        assertThat(level.convert(3.8).quality()).isEqualTo(Quality.GOOD);
        assertThat(level.convert(20.5).quality()).isEqualTo(Quality.GOOD);
        CurrentLoop.Value under = level.convert(3.7);
        assertThat(under.quality()).isEqualTo(Quality.UNCERTAIN);
        assertThat(under.value()).isCloseTo(-1.875, within(1e-9));
        assertThat(under.reason()).isEqualTo("loop current 3.70 mA is outside the measuring range 3.8-20.5 mA (NAMUR NE 43)");
        assertThat(level.convert(20.8).quality()).isEqualTo(Quality.UNCERTAIN);
        assertThat(level.convert(3.6).quality()).isEqualTo(Quality.UNCERTAIN);
        assertThat(level.convert(21.0).quality()).isEqualTo(Quality.UNCERTAIN);
    }
}
