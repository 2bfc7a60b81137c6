package org.cryowarden.daemon.journal;

import java.util.concurrent.locks.ReentrantLock;

/**
 * Whose turn it is to write to the journal file, among the daemon's connections to it (records, aggregates,
 * history blocks). SQLite lets one connection write at a time; a connection that finds another writing waits in
 * its busy handler, which sleeps 1, 2, 5, 10, 15, 20, 25 ms and more between tries, so an alarm's commit behind a
 * block write of a millisecond waited several. Taking turns here, first come first served, wakes the next writer
 * the moment the previous one commits. The busy timeout still covers other processes.
 */
final class WriteTurn {

    private final ReentrantLock turn = new ReentrantLock(true);

    void take() {
        turn.lock();
    }

    void give() {
        turn.unlock();
    }
}
