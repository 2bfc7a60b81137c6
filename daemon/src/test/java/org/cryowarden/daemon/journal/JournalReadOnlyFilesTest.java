package org.cryowarden.daemon.journal;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sqlite.SQLiteErrorCode;
import org.sqlite.SQLiteException;

/**
 * The journal's files become read-only under a running journal (the immutable attribute, see
 * {@link ImmutableFiles}; skipped where it cannot be set). Writes are refused with words that say read-only,
 * closing does not take the process down, and the journal works again once the files are writable.
 */
class JournalReadOnlyFilesTest {

    private static final Instant T0 = Instant.parse("2026-03-14T02:00:00Z");

    @TempDir
    Path folder;

    private final ImmutableFiles immutable = new ImmutableFiles();

    @AfterEach
    void thaw() throws Exception {
        immutable.close();
    }

    @Test
    void writesToAnImmutableJournalAreRefusedAsReadOnlyAndWorkAgainOnceWritable() throws Exception {
        Path journalFolder = Files.createDirectories(folder.resolve("journal"));
        try (Journal journal = Journal.open(journalFolder.resolve("journal.db"), JournalSettings.defaults())) {
            journal.append(raised(T0));
            // WAL mode keeps the database, its -wal and its -shm (sqlite.org/wal.html, "Implementation")
            assertThat(immutable.freeze(journalFolder))
                    .containsExactlyInAnyOrder("journal.db", "journal.db-wal", "journal.db-shm");

            assertThatThrownBy(() -> journal.append(raised(T0.plusSeconds(1))))
                    .isInstanceOf(JournalException.class)
                    .hasMessageContaining("could not record event alarm.raised for o2-low: the journal's files are"
                            + " read-only (SQLITE_READONLY; journal.db: Operation not permitted;") // EPERM, errno(3)
                    .hasMessageContaining("make the file, its -wal and -shm and its folder writable")
                    .hasMessageNotContaining("full");
            assertThat(Files.list(journalFolder)).as("nothing created beside the journal").hasSize(3);

            immutable.close();
            assertThat(journal.append(raised(T0.plusSeconds(2)))).isEqualTo(2);
            assertThat(journal.eventsAfter(0, 10)).extracting(JournalEvent::at).containsExactly(T0, T0.plusSeconds(2));
        }
    }

    @Test
    void closingAJournalWhoseFilesBecameImmutableLeavesItWhole() throws Exception {
        Path journalFolder = Files.createDirectories(folder.resolve("journal"));
        Path file = journalFolder.resolve("journal.db");
        Journal journal = Journal.open(file, JournalSettings.defaults());
        journal.append(raised(T0));
        immutable.freeze(journalFolder);

        // Closing the last connection checkpoints into the memory-mapped -shm; on an immutable file the kernel
        // answers that write with SIGBUS (ext4 page_mkwrite refuses IS_IMMUTABLE inodes), which ends the JVM.
        journal.close();

        immutable.close();
        try (Journal reopened = Journal.open(file, JournalSettings.defaults())) {
            assertThat(reopened.eventsAfter(0, 10)).extracting(JournalEvent::at).containsExactly(T0);
            assertThat(reopened.append(raised(T0.plusSeconds(1)))).isEqualTo(2);
        }
    }

    @Test
    void aBareIoErrorOnAnImmutableJournalIsExplainedAsReadOnly() throws Exception {
        Path journalFolder = Files.createDirectories(folder.resolve("journal"));
        Path file = journalFolder.resolve("journal.db");
        Files.writeString(file, "");
        SQLiteException writeFailed = new SQLiteException("disk I/O error", SQLiteErrorCode.SQLITE_IOERR_WRITE);
        assertThat(SqliteProblems.explain(writeFailed, file))
                .isEqualTo("the disk reported an I/O error (SQLITE_IOERR); check the disk and the system log");

        immutable.freeze(journalFolder);

        // SQLite reports a write(2) failing with EPERM as SQLITE_IOERR_WRITE (sqlite.org/rescode.html)
        assertThat(SqliteProblems.explain(writeFailed, file)).startsWith("the journal's files are read-only"
                + " (SQLITE_IOERR; journal.db: Operation not permitted;");
    }

    private static NewEvent raised(Instant at) {
        return NewEvent.about("alarm.raised", at, "o2-low", "{\"priority\":\"HIGH\"}");
    }

}
