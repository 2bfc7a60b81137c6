package org.cryowarden.daemon.demo;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The soak run in miniature: three "days" of 5 simulated minutes with two faults each, so that the long run keeps working. */
class SoakSmokeTest {

    @TempDir
    Path folder;

    @Test
    void shortSoakReportsEachDayAndLosesNoEvent() throws Exception {
        List<SoakRun.Day> days = SoakRun.run(folder, 3, Duration.ofMinutes(5), Duration.ofSeconds(5), 2, 20251113L);

        assertThat(days).hasSize(3);
        assertThat(days).extracting(SoakRun.Day::lost).containsOnly(0L);
        assertThat(days).allSatisfy(d -> assertThat(d.events()).isPositive());
        assertThat(days).extracting(SoakRun.Day::faults).anyMatch(f -> f > 0);
        assertThat(days).allSatisfy(d -> assertThat(d.fds()).isNotZero());
        assertThat(SoakRun.verdict(days)).startsWith("flat");
    }
}
