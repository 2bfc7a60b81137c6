package org.cryowarden.daemon.demo;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.cryowarden.daemon.cli.Main;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

/**
 * The README's first command, shortened: half an hour of the quench night as fast as the machine goes, with the
 * embedded broker on a free port, printing progress lines (no terminal) and the summary.
 */
class DemoCommandTest {

    @TempDir
    Path folder;

    @Test
    void shortQuenchNightTripsTheVentilationAndPrintsTheSummary() throws Exception {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        CommandLine line = Main.commandLine();
        line.setOut(new PrintWriter(out));
        line.setErr(new PrintWriter(err));
        Path journal = folder.resolve("night.db");

        int port;
        try (java.net.ServerSocket probe = new java.net.ServerSocket(0, 1, java.net.InetAddress.getLoopbackAddress())) {
            port = probe.getLocalPort();
        }

        int exit = line.execute("demo", "--fast", "--duration", "30min", "--plain", "--mqtt-port", Integer.toString(port),
                "--journal", journal.toString());

        String text = out.toString();
        assertThat(exit).as(err.toString()).isZero();
        assertThat(text).contains("not a certified safety system");
        assertThat(text).contains("Watch it:    mosquitto_sub -h 127.0.0.1 -p " + port + " -t 'cryowarden/#' -v");
        assertThat(text).contains("alarm.raised o2-magnet-hall-low", "interlock.tripped magnet-hall-ventilation");
        assertThat(text).contains("Night summary (30min simulated");
        assertThat(text).containsPattern("interlock trips +1\\n");
        // The 2oo3 oxygen alarm, the evacuation alarm and the quench's pressure alarms at least.
        assertThat(text).containsPattern("alarms raised +([4-9]|\\d\\d)\\n");
        assertThat(text).containsPattern("lowest oxygen seen +1[0-9]\\.\\d %vol");
        assertThat(Files.size(journal)).isPositive();
    }
}
