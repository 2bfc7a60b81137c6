package org.cryowarden.daemon.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Path;
import java.time.Instant;
import org.cryowarden.daemon.history.HistoryRecorder;
import org.cryowarden.daemon.history.HistorySettings;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalSettings;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

class ExportCommandTest {

    private static final Instant START = Instant.parse("2025-01-15T18:00:00Z");

    @TempDir
    Path folder;

    Path journal;

    @BeforeEach
    void recordTwoMinutesOfTwoChannels() throws Exception {
        journal = folder.resolve("journal.db");
        try (Journal opened = Journal.open(journal, JournalSettings.defaults())) {
            HistoryRecorder recorder = HistoryRecorder.open(opened.history(), HistorySettings.defaults());
            for (int t = 0; t < 120; t++) {
                Instant at = START.plusSeconds(t);
                recorder.record(Reading.good("o2_a", 20.9 - t * 0.01, Unit.PERCENT_VOLUME, at), at);
                recorder.record(t == 3 ? Reading.bad("p_bath", Unit.MILLIBAR, at, "CRC mismatch, frame \"x,y\"")
                        : new Reading("p_bath", 1050, Unit.MILLIBAR, at, Quality.GOOD, ""), at);
            }
            recorder.close();
        }
    }

    @Test
    void readingsComeOutInTimeOrderWithQuotedReasons() {
        Result result = run("export", "--journal", journal.toString(), "--channel", "o2_a", "p_bath", "--format",
                "csv", "--until", "2025-01-15T18:00:03Z");

        assertThat(result.exit).as(result.err).isZero();
        assertThat(result.out).isEqualTo("""
                time,channel,value,unit,quality,reason
                2025-01-15T18:00:00Z,o2_a,20.9,%vol,good,
                2025-01-15T18:00:00Z,p_bath,1050.0,mbar,good,
                2025-01-15T18:00:01Z,o2_a,20.889999999999997,%vol,good,
                2025-01-15T18:00:01Z,p_bath,1050.0,mbar,good,
                2025-01-15T18:00:02Z,o2_a,20.88,%vol,good,
                2025-01-15T18:00:02Z,p_bath,1050.0,mbar,good,
                2025-01-15T18:00:03Z,o2_a,20.869999999999997,%vol,good,
                2025-01-15T18:00:03Z,p_bath,,mbar,bad,"CRC mismatch, frame ""x,y""\"
                """);
    }

    @Test
    void minuteAggregatesCountGoodAndAllReadings() {
        Result result = run("export", "--journal", journal.toString(), "--channel", "p_bath", "--format", "csv",
                "--aggregate", "1min");

        assertThat(result.exit).as(result.err).isZero();
        // 60 readings a minute; the BAD one at 18:00:03 counts in total only
        assertThat(result.out).isEqualTo("""
                start,channel,unit,min,mean,max,good,total
                2025-01-15T18:00:00Z,p_bath,mbar,1050.0,1050.0,1050.0,59,60
                2025-01-15T18:01:00Z,p_bath,mbar,1050.0,1050.0,1050.0,60,60
                """);
    }

    @Test
    void unknownChannelIsBadInputNamingTheChannelsThatHaveHistory() {
        Result result = run("export", "--journal", journal.toString(), "--channel", "o2_b", "--format", "csv");

        assertThat(result.exit).isEqualTo(2);
        assertThat(result.err).isEqualTo("export: channel 'o2_b' has no history in " + journal
                + "; channels with history: o2_a, p_bath\n");
    }

    @Test
    void otherFormatIsBadInput() {
        Result result = run("export", "--journal", journal.toString(), "--channel", "o2_a", "--format", "xlsx");

        assertThat(result.exit).isEqualTo(2);
        assertThat(result.err).isEqualTo("export: --format must be csv, got 'xlsx'\n");
    }

    // ---- helpers -------------------------------------------------------------------------------------------------

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
