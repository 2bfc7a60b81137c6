package org.cryowarden.daemon.journal;

import java.nio.file.Path;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;

/**
 * The journal's raw history: one row per history block of a channel. It has its own connection with
 * {@code synchronous=NORMAL} (WAL stays consistent; a power loss can cost the last flushes, a {@code kill -9}
 * cannot), so the frequent block writes are not synced to disk one by one; the connections take turns to write
 * ({@link WriteTurn}). Thread-safe; meant for one writer thread (the history writer) plus readers.
 */
public final class HistoryTable {

    /** What the previous run left open: blocks that were never sealed because the daemon did not stop cleanly. */
    public record Unsealed(int blocks, int channels, Instant lastFlushed) {
    }

    /** The first and last instant of the stored readings. */
    public record Span(Instant first, Instant last) {
    }

    private final Path file;
    private final JournalFiles files;
    private final Connection connection;
    private final Object lock = new Object();
    private final WriteTurn turn;

    HistoryTable(Path file, Connection connection, WriteTurn turn) {
        this.file = file;
        this.files = new JournalFiles(file);
        this.connection = connection;
        this.turn = turn;
    }

    /**
     * Inserts new blocks (id 0) and rewrites stored ones (by id), in one transaction; returns the row ids in the
     * order given.
     */
    public List<Long> write(List<BlockRow> rows, Instant now) throws JournalException {
        synchronized (lock) {
            try {
                return Journal.inTransaction(files, turn, connection, () -> {
                    List<Long> ids = new ArrayList<>(rows.size());
                    try (PreparedStatement insert = connection.prepareStatement("""
                            INSERT INTO history_block (channel, first_ns, last_ns, count, sealed, data, written_ms)
                            VALUES (?, ?, ?, ?, ?, ?, ?) RETURNING id""");
                         PreparedStatement update = connection.prepareStatement("""
                                 UPDATE history_block SET last_ns = ?, count = ?, sealed = ?, data = ?, written_ms = ?
                                 WHERE id = ?""")) {
                        for (BlockRow row : rows) {
                            if (row.id() == 0) {
                                insert.setString(1, row.channel());
                                insert.setLong(2, nanos(row.first()));
                                insert.setLong(3, nanos(row.last()));
                                insert.setInt(4, row.count());
                                insert.setInt(5, row.sealed() ? 1 : 0);
                                insert.setBytes(6, row.data());
                                insert.setLong(7, now.toEpochMilli());
                                try (ResultSet result = insert.executeQuery()) {
                                    result.next();
                                    ids.add(result.getLong(1));
                                }
                            } else {
                                update.setLong(1, nanos(row.last()));
                                update.setInt(2, row.count());
                                update.setInt(3, row.sealed() ? 1 : 0);
                                update.setBytes(4, row.data());
                                update.setLong(5, now.toEpochMilli());
                                update.setLong(6, row.id());
                                update.executeUpdate();
                                ids.add(row.id());
                            }
                        }
                    }
                    return ids;
                });
            } catch (SQLException e) {
                throw new JournalException("journal " + file + ": could not record " + rows.size()
                        + " history blocks: " + SqliteProblems.explain(e, file) + "; those readings are not in the history",
                        e);
            }
        }
    }

    /** Deletes the blocks whose last reading is before {@code cutoff}; returns how many. */
    public int pruneBefore(Instant cutoff) throws JournalException {
        synchronized (lock) {
            try {
                return Journal.inTransaction(files, turn, connection, () -> {
                    try (PreparedStatement delete = connection.prepareStatement(
                            "DELETE FROM history_block WHERE last_ns < ?")) {
                        delete.setLong(1, nanos(cutoff));
                        return delete.executeUpdate();
                    }
                });
            } catch (SQLException e) {
                throw new JournalException("journal " + file + ": could not prune history blocks before " + cutoff
                        + ": " + SqliteProblems.explain(e, file), e);
            }
        }
    }

    /** The blocks a previous run left unsealed, if any. */
    public Optional<Unsealed> unsealed() throws JournalException {
        return read("the unsealed history blocks", () -> {
            try (Statement statement = connection.createStatement();
                 ResultSet rows = statement.executeQuery(
                         "SELECT count(*), count(DISTINCT channel), max(last_ns) FROM history_block WHERE sealed = 0")) {
                rows.next();
                int blocks = rows.getInt(1);
                return blocks == 0 ? Optional.empty()
                        : Optional.of(new Unsealed(blocks, rows.getInt(2), instant(rows.getLong(3))));
            }
        });
    }

    /** Marks every block sealed: what a previous run left open is final. */
    public int sealAll() throws JournalException {
        synchronized (lock) {
            try {
                return Journal.inTransaction(files, turn, connection, () -> {
                    try (Statement statement = connection.createStatement()) {
                        return statement.executeUpdate("UPDATE history_block SET sealed = 1 WHERE sealed = 0");
                    }
                });
            } catch (SQLException e) {
                throw new JournalException("journal " + file + ": could not seal history blocks: "
                        + SqliteProblems.explain(e, file), e);
            }
        }
    }

    /** The channels that have history, in name order. */
    public List<String> channels() throws JournalException {
        return read("the channels of the history", () -> {
            List<String> channels = new ArrayList<>();
            try (Statement statement = connection.createStatement();
                 ResultSet rows = statement.executeQuery(
                         "SELECT DISTINCT channel FROM history_block ORDER BY channel")) {
                while (rows.next()) {
                    channels.add(rows.getString(1));
                }
            }
            return channels;
        });
    }

    /** The first and last instant of the whole history, if there is any. */
    public Optional<Span> span() throws JournalException {
        return read("the span of the history", () -> {
            try (Statement statement = connection.createStatement();
                 ResultSet rows = statement.executeQuery(
                         "SELECT min(first_ns), max(last_ns), count(*) FROM history_block")) {
                rows.next();
                return rows.getLong(3) == 0 ? Optional.empty()
                        : Optional.of(new Span(instant(rows.getLong(1)), instant(rows.getLong(2))));
            }
        });
    }

    /** The blocks of {@code channel} that hold readings in {@code [from, to]}, oldest first. */
    public List<BlockRow> blocks(String channel, Instant from, Instant to) throws JournalException {
        return read("the history blocks of " + channel, () -> {
            List<BlockRow> result = new ArrayList<>();
            try (PreparedStatement query = connection.prepareStatement("""
                    SELECT id, first_ns, last_ns, count, sealed, data FROM history_block
                    WHERE channel = ? AND last_ns >= ? AND first_ns <= ? ORDER BY first_ns, id""")) {
                query.setString(1, channel);
                query.setLong(2, nanos(from));
                query.setLong(3, nanos(to));
                try (ResultSet rows = query.executeQuery()) {
                    while (rows.next()) {
                        result.add(new BlockRow(rows.getLong(1), channel, instant(rows.getLong(2)),
                                instant(rows.getLong(3)), rows.getInt(4), rows.getInt(5) == 1, rows.getBytes(6)));
                    }
                }
            }
            return result;
        });
    }

    /** Total bytes and readings stored, for the size measure. */
    public long[] totals() throws JournalException {
        return read("the size of the history", () -> {
            try (Statement statement = connection.createStatement();
                 ResultSet rows = statement.executeQuery(
                         "SELECT coalesce(sum(length(data)), 0), coalesce(sum(count), 0) FROM history_block")) {
                rows.next();
                return new long[] {rows.getLong(1), rows.getLong(2)};
            }
        });
    }

    private <T> T read(String what, Journal.SqlWork<T> work) throws JournalException {
        synchronized (lock) {
            try {
                files.checkWritable(); // a WAL read writes its read mark into the mapped -shm (see JournalFiles)
                return work.run();
            } catch (SQLException e) {
                throw new JournalException("journal " + file + ": could not read " + what + ": "
                        + SqliteProblems.explain(e, file), e);
            }
        }
    }

    void close() throws SQLException {
        synchronized (lock) {
            connection.close();
        }
    }

    static long nanos(Instant instant) {
        return Math.addExact(Math.multiplyExact(instant.getEpochSecond(), 1_000_000_000L), instant.getNano());
    }

    static Instant instant(long nanos) {
        return Instant.ofEpochSecond(Math.floorDiv(nanos, 1_000_000_000L), Math.floorMod(nanos, 1_000_000_000L));
    }
}
