package org.cryowarden.daemon.cli;

import static org.cryowarden.daemon.LoopbackPort.freePort;
import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.HashMap;
import java.util.Iterator;
import java.util.List;
import java.util.Map;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalSettings;
import org.cryowarden.daemon.replay.JournalHistory;
import org.cryowarden.rules.Reading;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

/**
 * The quench night recorded by the real daemon (driven by the demo, journal on disk), replayed through the rules
 * that ran and through a changed limit.
 */
class ReplayCommandTest {

    private static final Path SITE = Path.of("..", "config-examples", "harbour-hall-site.yaml");
    private static final Path RULES = Path.of("..", "config-examples", "harbour-hall-rules.yaml");
    private static final String VOTE = "o2-magnet-hall-low";
    private static final List<String> CELLS = List.of("o2-magnet-hall-east", "o2-magnet-hall-west",
            "o2-magnet-hall-pit");

    @TempDir
    static Path folder;

    static Path journal;

    @BeforeAll
    static void recordTheQuenchNight() throws Exception {
        journal = folder.resolve("quench.db");
        Result demo = run("demo", "--fast", "--duration", "40min", "--plain", "--mqtt-port",
                Integer.toString(freePort()), "--journal", journal.toString());
        assertThat(demo.exit).as(demo.err).isZero();
        assertThat(demo.out).contains("alarm.raised " + VOTE);
    }

    @Test
    void replayWithTheRulesThatRanReproducesTheRecordedAlarmTransitionsExactly() throws Exception {
        Result replay = run("replay", "--journal", journal.toString(), "--site", SITE.toString(), "--rules",
                RULES.toString(), "--json");

        assertThat(replay.exit).as(replay.err).isZero();
        JsonNode report = new ObjectMapper().readTree(replay.out);
        assertThat(report.path("identical").asBoolean()).as(replay.out).isTrue();
        assertThat(report.path("recorded_transitions").asInt()).isGreaterThan(5);
        assertThat(report.path("differences")).isEmpty();
        assertThat(report.path("refused_commands")).as("the recorded acknowledgements and resets apply again").isEmpty();
        assertThat(report.path("operator_commands").asInt()).isPositive();
    }

    @Test
    void raisingTheVotingLimitMovesTheOxygenAlarmByTheTimeTheCellsTakeToFallFromOneLimitToTheOther()
            throws Exception {
        Path changed = folder.resolve("changed-rules.yaml");
        String rules = Files.readString(RULES);
        String vote = "      below: 19.5 %vol\n      deadband: 0.3 %vol\n      faults_count_as_tripped: true";
        assertThat(rules).contains(vote);
        Files.writeString(changed, rules.replace(vote, vote.replace("19.5", "20.2")));
        // The expectation comes from the stored cell readings alone: 2oo3 below the limit, held for the 5 s on-delay.
        Instant recordedStart = firstVote(19.5);
        Instant expectedStart = firstVote(20.2);
        assertThat(expectedStart).isBefore(recordedStart);

        Result replay = run("replay", "--journal", journal.toString(), "--site", SITE.toString(), "--rules",
                changed.toString(), "--json");

        assertThat(replay.exit).as(replay.err).isZero();
        JsonNode report = new ObjectMapper().readTree(replay.out);
        JsonNode moved = null;
        for (JsonNode difference : report.path("differences")) {
            if (difference.path("alarm").asText().equals(VOTE)) {
                moved = difference;
            }
        }
        assertThat(moved).as(replay.out).isNotNull();
        assertThat(moved.path("kind").asText()).isEqualTo("moved");
        assertThat(Instant.parse(moved.path("recorded_start").asText())).isEqualTo(recordedStart);
        assertThat(Instant.parse(moved.path("replayed_start").asText())).isEqualTo(expectedStart);
        assertThat(moved.path("shift_seconds").asDouble())
                .isEqualTo(-Duration.between(expectedStart, recordedStart).toNanos() / 1e9);
    }

    @Test
    void textReportShowsTheComparisonThePerAlarmTableTheRateAndTheFloods() {
        Result replay = run("replay", "--journal", journal.toString(), "--site", SITE.toString(), "--rules",
                RULES.toString());

        assertThat(replay.exit).as(replay.err).isZero();
        assertThat(replay.out).contains("ALARMS: RECORDED AGAINST REPLAYED", "  identical: the replay reproduces all",
                "PER ALARM (replayed rules; fleeting below 5s, chattering: 3 activations within 1min)",
                "ALARM RATE per 10min: ", "FLOODS (more than 10 in 10min): ");
        assertThat(replay.out).containsPattern("  " + VOTE + " +critical +1 +1 ");
    }

    @Test
    void missingJournalIsBadInputWithAClearMessage() {
        Result replay = run("replay", "--journal", folder.resolve("none.db").toString(), "--rules", RULES.toString());

        assertThat(replay.exit).isEqualTo(2);
        assertThat(replay.err).isEqualTo("replay: no journal at " + folder.resolve("none.db")
                + ": name the daemon's journal file (journal: path: in the site file)\n");
    }

    @Test
    void sinceThatIsNotATimeIsBadInput() {
        Result replay = run("replay", "--journal", journal.toString(), "--rules", RULES.toString(), "--since",
                "yesterday");

        assertThat(replay.exit).isEqualTo(2);
        assertThat(replay.err).isEqualTo(
                "replay: --since must be a UTC time such as 2025-01-15T22:00:00Z, got 'yesterday'\n");
    }

    // ---- helpers -------------------------------------------------------------------------------------------------

    /** The first instant at which two of the three cells have read below {@code limit} for 5 s (GOOD or not). */
    private static Instant firstVote(double limit) throws Exception {
        try (Journal opened = Journal.open(journal, JournalSettings.defaults())) {
            Iterator<Reading> readings = new JournalHistory(opened).readings(CELLS, Instant.EPOCH,
                    Instant.parse("2100-01-01T00:00:00Z"));
            Map<String, Reading> latest = new HashMap<>();
            Instant since = null;
            Instant at = null;
            while (readings.hasNext()) {
                Reading reading = readings.next();
                if (at != null && !reading.timestamp().equals(at)) {
                    since = evaluate(latest, limit, since, at);
                    if (since != null && !at.isBefore(since.plusSeconds(5))) {
                        return since.plusSeconds(5);
                    }
                }
                if (since != null && reading.timestamp().isAfter(since.plusSeconds(5))) {
                    return since.plusSeconds(5);
                }
                latest.put(reading.channel(), reading);
                at = reading.timestamp();
            }
            throw new AssertionError("the cells never voted below " + limit);
        }
    }

    private static Instant evaluate(Map<String, Reading> latest, double limit, Instant since, Instant at) {
        int tripped = 0;
        for (String cell : CELLS) {
            Reading r = latest.get(cell);
            if (r != null && (!r.quality().isGood() || r.value() < limit)) {
                tripped++;
            }
        }
        if (tripped >= 2) {
            return since == null ? at : since;
        }
        return null;
    }

    private record Result(int exit, String out, String err) {
    }

    private static Result run(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        CommandLine line = Main.commandLine();
        line.setOut(new PrintWriter(out));
        line.setErr(new PrintWriter(err));
        int exit = line.execute(args);
        return new Result(exit, out.toString(), err.toString());
    }
}
