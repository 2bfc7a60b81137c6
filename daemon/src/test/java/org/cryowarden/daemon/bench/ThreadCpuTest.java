package org.cryowarden.daemon.bench;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Map;
import java.util.Set;
import org.junit.jupiter.api.Test;

class ThreadCpuTest {

    @Test
    void threadsOfOneRoleShareOneName() {
        assertThat(ThreadCpu.role("poller bus-2")).isEqualTo("poller");
        assertThat(ThreadCpu.role("poller magnet-hall")).isEqualTo("poller");
        assertThat(ThreadCpu.role("cryowarden-mqtt-site-1-paho-4")).isEqualTo("mqtt link paho");
        assertThat(ThreadCpu.role("cryowarden-mqtt-site-1-callbacks-1")).isEqualTo("mqtt link callbacks");
        assertThat(ThreadCpu.role("MQTT Rec: cryowarden-bench-6106cbd")).isEqualTo("MQTT Rec");
        assertThat(ThreadCpu.role("bench-device 35")).isEqualTo("bench-device");
        assertThat(ThreadCpu.role("engine")).isEqualTo("engine");
        assertThat(ThreadCpu.role("mqtt readings")).isEqualTo("mqtt readings");
    }

    @Test
    void sinceSumsEachRoleLargestFirstAndCountsANewThreadFromZero() {
        ThreadCpu before = new ThreadCpu(Map.of(1L, 100L, 2L, 200L, 3L, 50L),
                Map.of(1L, "poller", 2L, "poller", 3L, "engine"));
        ThreadCpu after = new ThreadCpu(Map.of(1L, 400L, 2L, 300L, 3L, 1_050L, 4L, 7L),
                Map.of(1L, "poller", 2L, "poller", 3L, "engine", 4L, "journal"));

        assertThat(after.since(before)).containsExactly(Map.entry("engine", 1_000L), Map.entry("poller", 400L),
                Map.entry("journal", 7L));
    }

    @Test
    void theWorkingThreadShowsUnderItsRoleUnlessExcluded() {
        Thread self = Thread.currentThread();
        String role = ThreadCpu.role(self.getName());
        ThreadCpu before = ThreadCpu.now(Set.of());
        long sum = 0;
        for (long i = 0; i < 50_000_000L; i++) {
            sum += i ^ (sum >>> 3);
        }

        assertThat(ThreadCpu.now(Set.of()).since(before).get(role)).as("after %d", sum).isPositive();
        assertThat(ThreadCpu.now(Set.of(self.getId())).since(before)).doesNotContainKey(role);
    }
}
