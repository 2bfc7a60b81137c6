package org.cryowarden.daemon.journal;

import java.nio.file.Path;
import java.time.Instant;
import java.util.OptionalLong;

/**
 * Child process for {@link JournalSurvivesKillTest}: writes events in a loop, each with its alarm state and
 * outbox entry in one transaction, and prints "committed SEQ" after each commit until it is killed.
 */
final class JournalWriterProcess {

    private JournalWriterProcess() {
    }

    public static void main(String[] args) throws Exception {
        Journal journal = Journal.open(Path.of(args[0]), JournalSettings.defaults());
        Instant at = Instant.parse("2026-03-14T02:00:00Z");
        for (long i = 0; ; i++) {
            Instant now = at.plusMillis(i);
            long seq = journal.write("event alarm.changed for o2-low", tx -> {
                long s = tx.appendEvent(NewEvent.about("alarm.changed", now, "o2-low", "{\"n\":1}"));
                tx.putAlarmState("o2-low", "{\"seq\":" + s + "}", s, now);
                tx.enqueue("mqtt", "site/event", "{\"seq\":" + s + "}", OptionalLong.of(s), now);
                return s;
            });
            System.out.println("committed " + seq);
            System.out.flush();
        }
    }
}
