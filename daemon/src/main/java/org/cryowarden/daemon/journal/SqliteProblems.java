package org.cryowarden.daemon.journal;

import java.nio.file.Path;
import java.sql.SQLException;
import java.util.EnumSet;
import java.util.Optional;
import org.sqlite.SQLiteErrorCode;
import org.sqlite.SQLiteException;

/** Turns SQLite's result codes into words an operator can act on (codes from the SQLite C API's result list). */
final class SqliteProblems {

    private SqliteProblems() {
    }

    /** Codes SQLite gives when the system refused a write (EPERM, EROFS surface as a bare I/O error). */
    private static final EnumSet<SQLiteErrorCode> REFUSED_WRITE = EnumSet.of(SQLiteErrorCode.SQLITE_IOERR,
            SQLiteErrorCode.SQLITE_READONLY, SQLiteErrorCode.SQLITE_PERM, SQLiteErrorCode.SQLITE_CANTOPEN);

    /**
     * As {@link #explain(SQLException)}, but a refused write is checked against the journal's files: when one of
     * them became immutable or its file system read-only, that is what the operator is told, not an I/O error.
     */
    static String explain(SQLException e, Path file) {
        SQLiteErrorCode code = primary(code(e));
        if (REFUSED_WRITE.contains(code)) {
            Optional<String> stuck = new JournalFiles(file).stuck();
            if (stuck.isPresent()) {
                return "the journal's files are read-only (" + code.name() + "; " + stuck.get()
                        + "; an immutable file or a file system mounted read-only); make the file, its -wal and"
                        + " -shm and its folder writable for the user that runs cryowarden";
            }
        }
        return explain(e);
    }

    /** What went wrong and what to do, e.g. "the disk is full (SQLITE_FULL); free space ...". */
    static String explain(SQLException e) {
        SQLiteErrorCode code = code(e);
        String name = code == null ? "SQL error " + e.getErrorCode() : primaryName(code);
        return switch (primary(code)) {
            case SQLITE_FULL -> "the disk is full (" + name + "); free space on the disk that holds it";
            case SQLITE_READONLY -> "the file or its folder is read-only (" + name
                    + "); make both writable for the user that runs cryowarden";
            case SQLITE_PERM, SQLITE_AUTH -> "permission denied (" + name
                    + "); give the user that runs cryowarden write access to the file and its folder";
            case SQLITE_CANTOPEN -> "the file cannot be opened (" + name
                    + "); check that its folder exists and is writable for the user that runs cryowarden";
            case SQLITE_NOTADB -> "the file is not an SQLite database (" + name
                    + "); point the journal at another file, or move this one away";
            case SQLITE_CORRUPT -> "the file is damaged (" + name
                    + "); keep it for inspection and start a new journal file";
            case SQLITE_BUSY, SQLITE_LOCKED -> "another process holds the file locked (" + name
                    + "); is a second cryowarden running on the same journal?";
            case SQLITE_IOERR -> "the disk reported an I/O error (" + name + "); check the disk and the system log";
            default -> describeUnknown(e, name);
        };
    }

    private static String describeUnknown(SQLException e, String name) {
        String message = e.getMessage() == null ? "" : e.getMessage();
        return message.isBlank() ? name : message;
    }

    private static SQLiteErrorCode code(SQLException e) {
        if (e instanceof SQLiteException sqlite) {
            return sqlite.getResultCode();
        }
        return SQLiteErrorCode.getErrorCode(e.getErrorCode());
    }

    /** The primary code of an extended one (the low 8 bits), e.g. SQLITE_IOERR for SQLITE_IOERR_WRITE. */
    private static SQLiteErrorCode primary(SQLiteErrorCode code) {
        if (code == null) {
            return SQLiteErrorCode.UNKNOWN_ERROR;
        }
        SQLiteErrorCode primary = SQLiteErrorCode.getErrorCode(code.code & 0xff);
        return primary == null ? code : primary;
    }

    private static String primaryName(SQLiteErrorCode code) {
        return primary(code).name();
    }
}
