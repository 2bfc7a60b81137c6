package org.cryowarden.daemon.journal;

import java.sql.SQLException;

/** What one write transaction does; see {@link Journal#write}. */
@FunctionalInterface
public interface JournalWork<T> {

    T apply(JournalTransaction transaction) throws SQLException;
}
