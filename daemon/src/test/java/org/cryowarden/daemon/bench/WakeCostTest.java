package org.cryowarden.daemon.bench;

import static org.assertj.core.api.Assertions.assertThat;

import java.time.Duration;
import org.junit.jupiter.api.Test;

class WakeCostTest {

    @Test
    void costPerWakeUpScalesToAShareOfOneCore() {
        // 50 wake-ups that cost 5 ms of CPU in all: 100 us each; 200 of them a second are 20 ms/s, 2 % of a core
        WakeCost cost = new WakeCost(Duration.ofMillis(20), 50, 5_000_000L);

        assertThat(cost.microsPerWakeUp()).isEqualTo(100.0);
        assertThat(cost.percentOfOneCoreAt(200)).isCloseTo(2.0, org.assertj.core.api.Assertions.within(1e-9));
    }

    @Test
    void measuringWakesTheGivenNumberOfTimesAndIsChargedSomeCpu() throws Exception {
        // a real (short) wait: the thing measured is the machine's own cost of waking up
        long start = System.nanoTime();
        WakeCost cost = WakeCost.measure(Duration.ofMillis(1), 5);

        assertThat(System.nanoTime() - start).isGreaterThanOrEqualTo(Duration.ofMillis(5).toNanos());
        assertThat(cost.wakeUps()).isEqualTo(5);
        assertThat(cost.cpuNanos()).isPositive();
    }
}
