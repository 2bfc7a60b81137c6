package org.cryowarden.daemon.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

class SimulateCommandTest {

    private final StringWriter out = new StringWriter();
    private final StringWriter err = new StringWriter();

    @Test
    void fastQuenchNightPrintsEndpointsEventsAndTheLowestOxygen(@TempDir Path dir) throws Exception {
        Path trace = dir.resolve("trace.csv");
        int code = run("simulate", "--scenario", "../config-examples/harbour-hall-quench-scenario.yaml", "--fast",
                "--hours", "0.5", "--trace", trace.toString());
        assertThat(code).as(err.toString()).isZero();
        assertThat(out.toString()).contains("rack-a-rs485  modbus-rtu  tcp 127.0.0.1:", "00:20:00 quench magnet-a",
                "room magnet-hall: lowest oxygen 16.");
        List<String> lines = Files.readAllLines(trace);
        assertThat(lines).hasSize(1 + 1800);
        assertThat(lines.get(0)).startsWith("time,elapsed_s,magnet-cryostat.liquid_L,magnet-cryostat.height_m");
    }

    @Test
    void badScenarioExitsTwoWithThePositionedError(@TempDir Path dir) throws Exception {
        Path file = dir.resolve("bad-scenario.yaml");
        Files.writeString(file, "scenario: {name: t}\nrooms:\n  - {id: hall, volume: 100 kg}\n");
        int code = run("simulate", "--scenario", file.toString(), "--fast");
        assertThat(code).isEqualTo(2);
        assertThat(err.toString().strip()).isEqualTo(file + ":3:24: volume: expected a volume (mL, L, m3), got "
                + "'100 kg' which is a mass (g, kg)");
    }

    @Test
    void speedAndFastTogetherAreRefused() {
        int code = run("simulate", "--scenario", "x.yaml", "--fast", "--speed", "10");
        assertThat(code).isEqualTo(2);
        assertThat(err.toString().strip()).isEqualTo("simulate: give either --speed N or --fast, not both");
    }

    private int run(String... args) {
        CommandLine line = Main.commandLine();
        line.setOut(new PrintWriter(out, true));
        line.setErr(new PrintWriter(err, true));
        return line.execute(args);
    }
}
