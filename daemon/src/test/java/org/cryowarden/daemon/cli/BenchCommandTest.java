package org.cryowarden.daemon.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import picocli.CommandLine;

/**
 * Keeps every bench suite working: a one-second run of each through the command, checking the JSON's shape and
 * that each figure is a positive number (or, for a figure that can be zero over one second, not negative). Whether a target is met depends on the machine and is not asserted.
 */
class BenchCommandTest {

    /**
     * Figures that may honestly be zero in one second: the journal file grows by whole pages, and its readings
     * reach it in history blocks flushed minutes apart.
     */
    private static final java.util.Set<String> GROWS_SLOWLY = java.util.Set.of("journal_bytes_per_channel_hour",
            // what the process spent beyond its Java threads: in a one-second run it may round to nothing
            "cpu_percent_jvm_own_threads");

    @ParameterizedTest
    @ValueSource(strings = {"engine", "bus", "latency", "publish", "footprint", "simulate"})
    @Timeout(value = 3, unit = TimeUnit.MINUTES)
    void oneSecondRunPrintsOneJsonObjectWithPositiveFigures(String suite) throws Exception {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        CommandLine line = commandLine(out, err);

        int exit = line.execute("bench", suite, "--json", "--seconds", "1");

        assertThat(exit).as(err.toString()).isZero();
        JsonNode result = new ObjectMapper().readTree(out.toString());
        assertThat(fieldNames(result)).containsExactly("suite", "figures", "reference", "ratio", "target",
                "meets_target");
        assertThat(result.get("suite").asText()).isEqualTo(suite);
        assertThat(result.get("target").isTextual()).isTrue();
        assertThat(result.get("meets_target").isBoolean()).isTrue();
        for (String section : List.of("figures", "reference", "ratio")) {
            assertThat(result.get(section).isObject()).as(section).isTrue();
            assertThat(result.get(section).size()).as(section).isPositive();
        }
        result.get("figures").fields().forEachRemaining(figure -> {
            if (GROWS_SLOWLY.contains(figure.getKey())) {
                assertThat(figure.getValue().asDouble()).as(figure.getKey()).isNotNegative();
            } else {
                assertThat(figure.getValue().asDouble()).as(figure.getKey()).isPositive();
            }
        });
        result.get("reference").fields().forEachRemaining(figure ->
                assertThat(figure.getValue().asDouble()).as(figure.getKey()).isPositive());
    }

    @Test
    @Timeout(value = 3, unit = TimeUnit.MINUTES)
    void latencyWithStagesSplitsEveryLoadIntoItsHandOffs() {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();

        int exit = commandLine(out, err).execute("bench", "latency", "--seconds", "1", "--stages");

        assertThat(exit).as(err.toString()).isZero();
        List<String> splits = out.toString().lines().filter(l -> l.strip().startsWith("hand-offs over")).toList();
        assertThat(splits).hasSize(2);
        for (String split : splits) {
            // "hand-offs over N of M crossings": at least one crossing was followed through every stage.
            assertThat(split).matches("\\s*hand-offs over [1-9]\\d* of \\d+ crossings.*");
        }
        assertThat(out.toString()).contains("took -> committed", "link -> subscriber");
    }

    @Test
    @Timeout(value = 3, unit = TimeUnit.MINUTES)
    void footprintTogetherPollsEachBusAllAtOnceAndSaysSo() {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();

        int exit = commandLine(out, err).execute("bench", "footprint", "--seconds", "1", "--together");

        assertThat(exit).as(err.toString()).isZero();
        assertThat(out.toString()).contains("Modbus TCP buses polled each all at once");
        // 200 channels at 1 Hz (the suite's own load): a second of it takes readings of every bus
        assertThat(out.toString()).containsPattern("readings: +[1-9][\\d,.]* per second");
        // the pollers of the four buses did the polling, so they spent CPU, summed under one name
        assertThat(out.toString()).containsPattern("by thread: .*poller \\d+\\.\\d\\d %");
    }

    @Test
    void unknownSuiteIsRefusedWithTheListOfSuites() {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();

        int exit = commandLine(out, err).execute("bench", "engines");

        assertThat(exit).isEqualTo(2);
        assertThat(err.toString()).isEqualTo("bench: unknown suite 'engines'; expected one of engine, bus, latency,"
                + " publish, footprint, simulate" + System.lineSeparator());
        assertThat(out.toString()).isEmpty();
    }

    @Test
    void secondsBelowOneIsRefused() {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();

        int exit = commandLine(out, err).execute("bench", "engine", "--seconds", "0");

        assertThat(exit).isEqualTo(2);
        assertThat(err.toString()).isEqualTo("bench: --seconds must be at least 1, got 0" + System.lineSeparator());
    }

    @Test
    void brokerThatIsNotATcpAddressIsRefused() {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();

        int exit = commandLine(out, err).execute("bench", "publish", "--broker", "ssl://127.0.0.1:8883");

        assertThat(exit).isEqualTo(2);
        assertThat(err.toString()).isEqualTo("bench: --broker must look like tcp://HOST:PORT, got"
                + " 'ssl://127.0.0.1:8883'" + System.lineSeparator());
    }

    private static CommandLine commandLine(StringWriter out, StringWriter err) {
        CommandLine line = Main.commandLine();
        line.setOut(new PrintWriter(out, true));
        line.setErr(new PrintWriter(err, true));
        return line;
    }

    private static List<String> fieldNames(JsonNode node) {
        List<String> names = new ArrayList<>();
        node.fieldNames().forEachRemaining(names::add);
        return names;
    }
}
