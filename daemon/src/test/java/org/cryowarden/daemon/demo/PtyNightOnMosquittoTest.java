package org.cryowarden.daemon.demo;

import static org.cryowarden.daemon.demo.Subscriber.json;
import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import org.cryowarden.simulator.Endpoint;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The quench night with the RS-485 rack and the vacuum gauge's RS-232 line reached over pseudo-terminals (socat),
 * as a USB serial adapter would be, instead of TCP: Modbus RTU and the streaming line protocol cross a real tty.
 */
class PtyNightOnMosquittoTest {

    @TempDir
    Path folder;

    @BeforeAll
    static void mosquittoRuns() throws Exception {
        Night.mosquittoRuns();
    }

    @Test
    void busesOverPseudoTerminalsPublishGoodReadings() throws Exception {
        try (Night night = Night.start(folder, Night.MOSQUITTO, true);
             Subscriber dashboard = new Subscriber(Night.MOSQUITTO, night.prefix + "/reading/#")) {
            assertThat(night.endpoints).filteredOn(e -> e.pty().isPresent()).extracting(Endpoint::portId)
                    .containsExactlyInAnyOrder("rack-a-rs485", "ovc-gauge-serial");
            assertThat(night.endpoints).filteredOn(e -> e.pty().isPresent())
                    .allMatch(e -> Files.exists(e.pty().orElseThrow()));
            String east = night.prefix + "/reading/o2-magnet-hall-east";
            String ovc = night.prefix + "/reading/ovc-pressure";
            String fan = night.prefix + "/reading/exhaust-fan-running";
            night.stepUntil(() -> good(dashboard, east) && good(dashboard, ovc) && good(dashboard, fan), 120,
                    () -> dashboard.received.toString());

            JsonNode oxygen = json(dashboard.last(east, Duration.ofSeconds(5)));
            // Fresh air: 20.9 %vol oxygen (common practice), the scenario's start.
            assertThat(oxygen.path("value").asDouble()).isBetween(20.5, 21.2);
            assertThat(oxygen.path("unit").asText()).isEqualTo("%vol");
            JsonNode vacuum = json(dashboard.last(ovc, Duration.ofSeconds(5)));
            assertThat(vacuum.path("unit").asText()).isEqualTo("mbar");
            // The scenario's insulating vacuum is 2e-6 mbar; the gauge's noise is 5 %.
            assertThat(vacuum.path("value").asDouble()).isBetween(1e-6, 4e-6);
        }
    }

    // ---- helpers ----

    private static boolean good(Subscriber subscriber, String topic) {
        return subscriber.on(topic).stream().anyMatch(m -> m.text().contains("\"quality\":\"good\""));
    }
}
