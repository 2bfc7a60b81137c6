package org.cryowarden.daemon.journal;

/**
 * The journal could not be opened or could not record something. The message names the file, what was not
 * recorded, the cause in plain words and what to do next. Checked, because a full disk or a read-only folder is
 * a fact of the machine the caller must handle (keep the entry and try again, or stop), not a programming error.
 */
public final class JournalException extends Exception {

    JournalException(String message, Throwable cause) {
        super(message, cause);
    }

    JournalException(String message) {
        super(message);
    }
}
