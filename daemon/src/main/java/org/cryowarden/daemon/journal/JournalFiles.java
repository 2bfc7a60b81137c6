package org.cryowarden.daemon.journal;

import java.io.IOException;
import java.nio.file.AccessDeniedException;
import java.nio.file.AccessMode;
import java.nio.file.FileSystemException;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.List;
import java.util.Optional;
import org.sqlite.SQLiteErrorCode;
import org.sqlite.SQLiteException;

/**
 * The journal file and the two files SQLite keeps beside it in WAL mode ({@code -wal}, and {@code -shm}, the
 * wal-index it maps into memory), asked whether the system still lets them be written.
 *
 * <p>Why ask before SQLite writes: when a file becomes immutable ({@code chattr +i}) or its file system is
 * remounted read-only, a write through a descriptor SQLite already holds fails with {@code EPERM} or
 * {@code EROFS}, which it reports as a bare I/O error; but a write to a page of the memory-mapped {@code -shm}
 * (a checkpoint does one, and closing the last connection checkpoints) is refused by the kernel with
 * {@code SIGBUS}, which ends the whole daemon. Plain permission bits ({@code EACCES}) are not asked about: a
 * descriptor opened for writing before a {@code chmod} keeps writing.
 */
record JournalFiles(Path database) {

    List<Path> all() {
        return List.of(database, Path.of(database + "-wal"), Path.of(database + "-shm"));
    }

    /** The first file that exists and cannot be written, and the system's reason, e.g. "x-wal: Read-only file system". */
    Optional<String> stuck() {
        for (Path path : all()) {
            try {
                path.getFileSystem().provider().checkAccess(path, AccessMode.WRITE);
            } catch (NoSuchFileException | AccessDeniedException fine) {
                // absent (SQLite creates it when needed), or only permission bits: open descriptors still write
            } catch (FileSystemException e) {
                return Optional.of(path.getFileName() + ": " + (e.getReason() == null ? e.getMessage() : e.getReason()));
            } catch (IOException e) {
                return Optional.of(path.getFileName() + ": " + e.getMessage());
            }
        }
        return Optional.empty();
    }

    /** Refuses a write that SQLite could not make, before SQLite touches its wal-index. */
    void checkWritable() throws SQLiteException {
        Optional<String> stuck = stuck();
        if (stuck.isPresent()) {
            throw new SQLiteException(stuck.get(), SQLiteErrorCode.SQLITE_READONLY);
        }
    }
}
