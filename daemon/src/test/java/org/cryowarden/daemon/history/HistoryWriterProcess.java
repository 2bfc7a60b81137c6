package org.cryowarden.daemon.history;

import java.nio.file.Path;
import java.time.Instant;
import java.util.Random;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalSettings;
import org.cryowarden.drivers.analog.CurrentLoop;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;

/**
 * Child process for {@link HistorySurvivesKillTest}: records a 1 Hz oxygen channel (a 16-bit register through a
 * 4-20 mA loop) on a virtual clock with the default history settings, writes each hand-over on its own thread, and
 * prints "flushed SECOND" (the last second written) after each write until it is killed.
 */
final class HistoryWriterProcess {

    static final Instant START = Instant.parse("2025-01-15T18:00:00Z");
    static final String CHANNEL = "o2_loop";

    private HistoryWriterProcess() {
    }

    /** The reading of second {@code t}: the same in the child and in the test that checks what survived. */
    static Reading reading(int t) {
        CurrentLoop loop = new CurrentLoop(0, 25);
        double o2 = 20.9 + new Random(t).nextGaussian() * 0.03;
        long register = Math.round(loop.milliampsFor(o2) * 1000);
        return Reading.good(CHANNEL, loop.convert(register * 0.001).value(), Unit.PERCENT_VOLUME,
                START.plusSeconds(t));
    }

    public static void main(String[] args) throws Exception {
        Journal journal = Journal.open(Path.of(args[0]), JournalSettings.defaults());
        HistoryRecorder recorder = HistoryRecorder.open(journal.history(), HistorySettings.defaults());
        long written = 0;
        for (int t = 0; ; t++) {
            Reading reading = reading(t);
            recorder.record(reading, reading.timestamp());
            recorder.writePending();
            if (recorder.blocksWritten() > written) {
                written = recorder.blocksWritten();
                System.out.println("flushed " + t);
                System.out.flush();
            }
        }
    }
}
