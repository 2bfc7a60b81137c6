package org.cryowarden.daemon.journal;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.OptionalDouble;
import java.util.OptionalLong;
import org.cryowarden.rules.Reading;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import org.sqlite.SQLiteConfig;

/**
 * The daemon's SQLite journal: the source of truth for the event sequence, alarm states and the outbox, plus
 * minute aggregates for reports. It survives {@code kill -9}: every write is one transaction, committed before
 * the caller publishes anything.
 *
 * <p>Three connections to one file in WAL mode. The <em>record</em> connection writes events, alarm states and
 * the outbox with {@code synchronous=FULL}, so a committed alarm, acknowledgement or trip survives a power
 * loss; the <em>aggregate</em> connection writes minute aggregates with {@code synchronous=NORMAL} (WAL stays
 * consistent, the last minutes may be lost on power loss), the <em>history</em> one raw history blocks
 * likewise ({@link HistoryTable}). Pragmas are set through the driver's connection
 * properties, write transactions start with {@code BEGIN IMMEDIATE} so they never fail half-way on a lock
 * upgrade, and the connections take turns to write ({@link WriteTurn}) rather than sleep in SQLite's busy
 * handler; the busy timeout covers other processes.
 *
 * <p>Thread-safe: each connection is used by one thread at a time. Open with {@link #open}, close once.
 */
public final class Journal implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(Journal.class);
    private static final String NOTHING_RECORDED =
            "; nothing can be recorded (no alarms, acknowledgements, trips or events) until this is fixed";
    private static final Duration PRUNE_EVERY = Duration.ofHours(1);

    private final Path file;
    private final JournalFiles files;
    /** Shared with the history table: the three connections take turns to write. */
    private final WriteTurn turn = new WriteTurn();
    private final JournalSettings settings;
    private final Connection records;
    private final Connection aggregatesConnection;
    private final HistoryTable history;
    private final Object recordLock = new Object();
    private final Object aggregateLock = new Object();
    private final Map<BucketKey, MinuteBucket> buckets = new LinkedHashMap<>();
    private long openMinuteMs = Long.MIN_VALUE;
    private long lastPruneMs = Long.MIN_VALUE;
    private volatile long lastCommitNanos;
    private boolean closed;

    private record BucketKey(String channel, long minuteMs) {
    }

    private Journal(Path file, JournalSettings settings, Connection records, Connection aggregates,
            Connection history) {
        this.file = file;
        this.files = new JournalFiles(file);
        this.settings = settings;
        this.records = records;
        this.aggregatesConnection = aggregates;
        this.history = new HistoryTable(file, history, turn);
    }

    /**
     * Opens (or creates) the journal at {@code file} and brings its schema up to date.
     *
     * @throws JournalException naming the file, the cause and what to do, when it cannot be opened
     */
    public static Journal open(Path file, JournalSettings settings) throws JournalException {
        Objects.requireNonNull(settings, "settings");
        Path path = file.toAbsolutePath().normalize();
        checkPath(path);
        Connection records = null;
        Connection aggregates = null;
        Connection history = null;
        try {
            records = connect(path, settings, SQLiteConfig.SynchronousMode.FULL);
            int version = Schema.currentVersion(records);
            if (version > Schema.latestVersion()) {
                throw new JournalException("cannot open the journal " + path + ": it was written by a newer"
                        + " cryowarden (schema version " + version + ", this one knows up to "
                        + Schema.latestVersion() + "); run that version, or choose another journal file"
                        + NOTHING_RECORDED);
            }
            checkWal(records, path);
            migrate(new JournalFiles(path), records, version);
            aggregates = connect(path, settings, SQLiteConfig.SynchronousMode.NORMAL);
            history = connect(path, settings, SQLiteConfig.SynchronousMode.NORMAL);
            return new Journal(path, settings, records, aggregates, history);
        } catch (SQLException e) {
            closeQuietly(records);
            closeQuietly(aggregates);
            closeQuietly(history);
            throw new JournalException("cannot open the journal " + path + ": " + SqliteProblems.explain(e, path)
                    + NOTHING_RECORDED, e);
        } catch (JournalException e) {
            closeQuietly(records);
            closeQuietly(aggregates);
            closeQuietly(history);
            throw e;
        }
    }

    /** The journal file, absolute. */
    public Path file() {
        return file;
    }

    /** The raw history blocks, on their own connection (see {@link HistoryTable}). */
    public HistoryTable history() {
        return history;
    }

    /** How long the last committed write took, for the journal commit-time metric. */
    public Duration lastCommitDuration() {
        return Duration.ofNanos(lastCommitNanos);
    }

    // ---- records (synchronous=FULL) --------------------------------------------------------------------------

    /**
     * Runs {@code work} as one write transaction ({@code BEGIN IMMEDIATE} ... {@code COMMIT}) on the record
     * connection. When anything fails, nothing of it is kept.
     *
     * @param what words for the error message, e.g. "event alarm.raised for o2-low"
     * @throws JournalException naming the file and {@code what}, when the transaction cannot be committed
     */
    public <T> T write(String what, JournalWork<T> work) throws JournalException {
        Objects.requireNonNull(work, "work");
        synchronized (recordLock) {
            ensureOpen(what);
            long start = System.nanoTime();
            try {
                T result = inTransaction(files, turn, records, () -> work.apply(new JournalTransaction(records)));
                lastCommitNanos = System.nanoTime() - start;
                return result;
            } catch (SQLException e) {
                throw notRecorded(what, e);
            }
        }
    }

    /**
     * Like {@link #write}, but the commit does not wait for the disk ({@code synchronous=NORMAL} for this one
     * transaction; WAL order keeps the file consistent): for delivery marks only. A mark that a power cut takes
     * back sends its message once more, which receivers drop by its sequence number, whereas waiting for the disk
     * here would hold the record connection, and with it the next event's commit, for a sync.
     */
    private <T> T writeUnsynced(String what, JournalWork<T> work) throws JournalException {
        synchronized (recordLock) {
            ensureOpen(what);
            try {
                synchronous(SQLiteConfig.SynchronousMode.NORMAL);
            } catch (SQLException e) {
                throw notRecorded(what, e);
            }
            try {
                return write(what, work);
            } finally {
                try {
                    synchronous(SQLiteConfig.SynchronousMode.FULL);
                } catch (SQLException e) {
                    LOG.error("journal {}: could not set synchronous=FULL again after {}: {}", file, what,
                            SqliteProblems.explain(e));
                }
            }
        }
    }

    private void synchronous(SQLiteConfig.SynchronousMode mode) throws SQLException {
        try (Statement statement = records.createStatement()) {
            statement.execute("PRAGMA synchronous = " + mode.name());
        }
    }

    /** Appends one event on its own; returns its sequence number. */
    public long append(NewEvent event) throws JournalException {
        return write(event.describe(), tx -> tx.appendEvent(event));
    }

    /** The sequence number of the last committed event, or empty for a new journal. */
    public OptionalLong lastSeq() throws JournalException {
        return read("the last event sequence number", () -> {
            try (Statement statement = records.createStatement();
                 ResultSet rows = statement.executeQuery("SELECT max(seq) FROM event")) {
                rows.next();
                long seq = rows.getLong(1);
                return rows.wasNull() ? OptionalLong.empty() : OptionalLong.of(seq);
            }
        });
    }

    /** Events with a sequence number above {@code afterSeq}, in order, at most {@code limit}. */
    public List<JournalEvent> eventsAfter(long afterSeq, int limit) throws JournalException {
        return read("events after " + afterSeq, () -> events(
                "SELECT seq, kind, at_ms, subject, operator, payload FROM event WHERE seq > ? ORDER BY seq LIMIT ?",
                afterSeq, limit));
    }

    /** Events at or after {@code since} (wall clock), in sequence order, at most {@code limit}. */
    public List<JournalEvent> eventsSince(Instant since, int limit) throws JournalException {
        return read("events since " + since, () -> events(
                "SELECT seq, kind, at_ms, subject, operator, payload FROM event WHERE at_ms >= ? ORDER BY seq LIMIT ?",
                since.toEpochMilli(), limit));
    }

    /** The recorded state of every alarm, by alarm id, to restore the engine before the first poll. */
    public Map<String, AlarmStateRecord> alarmStates() throws JournalException {
        return read("alarm states", () -> {
            Map<String, AlarmStateRecord> states = new LinkedHashMap<>();
            try (Statement statement = records.createStatement();
                 ResultSet rows = statement.executeQuery(
                         "SELECT alarm_id, state, seq, updated_ms FROM alarm_state ORDER BY alarm_id")) {
                while (rows.next()) {
                    states.put(rows.getString(1), new AlarmStateRecord(rows.getString(1), rows.getString(2),
                            rows.getLong(3), Instant.ofEpochMilli(rows.getLong(4))));
                }
            }
            return states;
        });
    }

    /** Undelivered outbox entries of {@code sink}, oldest first, at most {@code limit}. */
    public List<OutboxEntry> undelivered(String sink, int limit) throws JournalException {
        return read("the " + sink + " outbox", () -> {
            List<OutboxEntry> entries = new ArrayList<>();
            try (PreparedStatement query = records.prepareStatement("""
                    SELECT id, sink, target, payload, seq, created_ms, attempts FROM outbox
                    WHERE sink = ? AND delivered_ms IS NULL ORDER BY id LIMIT ?""")) {
                query.setString(1, sink);
                query.setInt(2, limit);
                try (ResultSet rows = query.executeQuery()) {
                    while (rows.next()) {
                        long seq = rows.getLong(5);
                        OptionalLong eventSeq = rows.wasNull() ? OptionalLong.empty() : OptionalLong.of(seq);
                        entries.add(new OutboxEntry(rows.getLong(1), rows.getString(2), rows.getString(3),
                                rows.getString(4), eventSeq, Instant.ofEpochMilli(rows.getLong(6)), rows.getInt(7)));
                    }
                }
            }
            return entries;
        });
    }

    /** How many entries of {@code sink} wait for delivery (the outbox-depth metric). */
    public long outboxDepth(String sink) throws JournalException {
        return read("the " + sink + " outbox depth", () -> {
            try (PreparedStatement query = records.prepareStatement(
                    "SELECT count(*) FROM outbox WHERE sink = ? AND delivered_ms IS NULL")) {
                query.setString(1, sink);
                try (ResultSet rows = query.executeQuery()) {
                    rows.next();
                    return rows.getLong(1);
                }
            }
        });
    }

    /** Marks an outbox entry delivered; call only after the sink confirmed delivery (MQTT: the PUBACK). */
    public void markDelivered(long outboxId, Instant at) throws JournalException {
        writeUnsynced("delivery of outbox entry " + outboxId, tx -> update(
                "UPDATE outbox SET delivered_ms = ?, attempts = attempts + 1, last_attempt_ms = ? WHERE id = ?",
                at.toEpochMilli(), at.toEpochMilli(), outboxId));
    }

    /**
     * Marks several outbox entries delivered in one transaction (one commit for a window of PUBACKs). Like every
     * delivery mark it commits without waiting for the disk ({@link #writeUnsynced}).
     */
    public void markDelivered(List<Long> outboxIds, Instant at) throws JournalException {
        if (outboxIds.isEmpty()) {
            return;
        }
        writeUnsynced("delivery of outbox entries " + outboxIds.get(0) + " to " + outboxIds.get(outboxIds.size() - 1),
                tx -> {
                    for (long id : outboxIds) {
                        update("UPDATE outbox SET delivered_ms = ?, attempts = attempts + 1, last_attempt_ms = ?"
                                + " WHERE id = ?", at.toEpochMilli(), at.toEpochMilli(), id);
                    }
                    return null;
                });
    }

    /** Counts a failed delivery attempt of an outbox entry. */
    public void recordAttempt(long outboxId, Instant at) throws JournalException {
        write("a delivery attempt of outbox entry " + outboxId, tx -> update(
                "UPDATE outbox SET attempts = attempts + 1, last_attempt_ms = ? WHERE id = ?",
                at.toEpochMilli(), outboxId));
    }

    /** Deletes delivered outbox entries delivered before {@code before}; returns how many. */
    public int pruneDelivered(Instant before) throws JournalException {
        return write("pruning of delivered outbox entries", tx -> update(
                "DELETE FROM outbox WHERE delivered_ms IS NOT NULL AND delivered_ms < ?", before.toEpochMilli()));
    }

    // ---- minute aggregates (synchronous=NORMAL) --------------------------------------------------------------

    /**
     * Adds a reading to its channel's minute. When a reading opens a later minute, the earlier minutes are
     * written (and, once an hour, minutes older than the retention are pruned).
     */
    public void recordReading(Reading reading) throws JournalException {
        long minuteMs = Math.floorDiv(reading.timestamp().toEpochMilli(), 60_000L) * 60_000L;
        synchronized (aggregateLock) {
            if (minuteMs > openMinuteMs) {
                if (openMinuteMs != Long.MIN_VALUE) {
                    flushBefore(minuteMs);
                }
                openMinuteMs = minuteMs;
            }
            buckets.computeIfAbsent(new BucketKey(reading.channel(), minuteMs), k -> new MinuteBucket())
                    .add(reading);
        }
    }

    /** Writes every minute held in memory, the open one included (later readings of it merge in). */
    public void flushAggregates() throws JournalException {
        synchronized (aggregateLock) {
            flushBefore(Long.MAX_VALUE);
        }
    }

    /** Deletes aggregates older than the retention before {@code now}; returns how many minutes went. */
    public int pruneAggregates(Instant now) throws JournalException {
        long cutoff = now.minus(settings.aggregateRetention()).toEpochMilli();
        synchronized (aggregateLock) {
            try {
                int deleted = inTransaction(files, turn, aggregatesConnection, () -> {
                    try (PreparedStatement delete = aggregatesConnection.prepareStatement(
                            "DELETE FROM minute_aggregate WHERE minute_ms < ?")) {
                        delete.setLong(1, cutoff);
                        return delete.executeUpdate();
                    }
                });
                lastPruneMs = now.toEpochMilli();
                return deleted;
            } catch (SQLException e) {
                throw notRecorded("pruning of minute aggregates", e);
            }
        }
    }

    /** The recorded minutes of {@code channel} in {@code [from, to)}, oldest first. */
    public List<MinuteAggregate> aggregates(String channel, Instant from, Instant to) throws JournalException {
        synchronized (aggregateLock) {
            checkReadable();
            try (PreparedStatement query = aggregatesConnection.prepareStatement("""
                    SELECT minute_ms, min_value, sum_value, max_value, good_count, total_count FROM minute_aggregate
                    WHERE channel = ? AND minute_ms >= ? AND minute_ms < ? ORDER BY minute_ms""")) {
                query.setString(1, channel);
                query.setLong(2, from.toEpochMilli());
                query.setLong(3, to.toEpochMilli());
                List<MinuteAggregate> result = new ArrayList<>();
                try (ResultSet rows = query.executeQuery()) {
                    while (rows.next()) {
                        long good = rows.getLong(5);
                        OptionalDouble min = good == 0 ? OptionalDouble.empty() : OptionalDouble.of(rows.getDouble(2));
                        OptionalDouble mean = good == 0 ? OptionalDouble.empty()
                                : OptionalDouble.of(rows.getDouble(3) / good);
                        OptionalDouble max = good == 0 ? OptionalDouble.empty() : OptionalDouble.of(rows.getDouble(4));
                        result.add(new MinuteAggregate(channel, Instant.ofEpochMilli(rows.getLong(1)), min, mean, max,
                                good, rows.getLong(6)));
                    }
                }
                return result;
            } catch (SQLException e) {
                throw new JournalException("journal " + file + ": could not read the minute aggregates of " + channel
                        + ": " + SqliteProblems.explain(e, file), e);
            }
        }
    }

    /** Every channel with recorded minutes, by id: what the morning report plots when no site file is given. */
    public List<String> aggregateChannels() throws JournalException {
        synchronized (aggregateLock) {
            checkReadable();
            try (Statement statement = aggregatesConnection.createStatement();
                 ResultSet rows = statement.executeQuery(
                         "SELECT DISTINCT channel FROM minute_aggregate ORDER BY channel")) {
                List<String> channels = new ArrayList<>();
                while (rows.next()) {
                    channels.add(rows.getString(1));
                }
                return channels;
            } catch (SQLException e) {
                throw new JournalException("journal " + file + ": could not read the channels of the minute aggregates: "
                        + SqliteProblems.explain(e, file), e);
            }
        }
    }

    /** Writes the aggregates held in memory and closes both connections. Idempotent. */
    @Override
    public void close() throws JournalException {
        JournalException flushFailure = null;
        synchronized (aggregateLock) {
            synchronized (recordLock) {
                if (closed) {
                    return;
                }
                try {
                    flushBefore(Long.MAX_VALUE);
                } catch (JournalException e) {
                    flushFailure = e;
                }
                closed = true;
                Optional<String> stuck = files.stuck();
                if (stuck.isPresent()) {
                    // Closing the last connection checkpoints, which writes the memory-mapped -shm: on a file
                    // that cannot be written the kernel answers that with SIGBUS, and the process dies.
                    LOG.warn("journal {}: its files cannot be written ({}); its connections are left open rather"
                            + " than checkpointed, and SQLite recovers the write-ahead log at the next open", file,
                            stuck.get());
                    if (flushFailure != null) {
                        throw flushFailure;
                    }
                    return;
                }
                try {
                    history.close();
                } catch (SQLException e) {
                    LOG.debug("closing the history connection: {}", e.getMessage());
                }
                closeQuietly(aggregatesConnection);
                closeQuietly(records);
            }
        }
        if (flushFailure != null) {
            throw flushFailure;
        }
    }

    /** Test hook: caps the file size so that a write fails as on a full disk (SQLite's max_page_count). */
    void limitPages(long pages) throws SQLException {
        synchronized (recordLock) {
            try (Statement statement = records.createStatement()) {
                statement.execute("PRAGMA max_page_count = " + pages);
            }
        }
    }

    /** Test hook: the file's current size in pages. */
    long pageCount() throws SQLException {
        return Long.parseLong(pragma("page_count", false));
    }

    /** Test hook: a pragma's value as one connection sees it. */
    String pragma(String name, boolean aggregateConnection) throws SQLException {
        Connection connection = aggregateConnection ? aggregatesConnection : records;
        synchronized (aggregateConnection ? aggregateLock : recordLock) {
            try (Statement statement = connection.createStatement();
                 ResultSet rows = statement.executeQuery("PRAGMA " + name)) {
                return rows.next() ? rows.getString(1) : "";
            }
        }
    }

    // ---- helpers -----------------------------------------------------------------------------------------------

    @FunctionalInterface
    interface SqlWork<T> {
        T run() throws SQLException;
    }

    private void flushBefore(long beforeMinuteMs) throws JournalException {
        List<Map.Entry<BucketKey, MinuteBucket>> due = new ArrayList<>();
        for (Map.Entry<BucketKey, MinuteBucket> entry : buckets.entrySet()) {
            if (entry.getKey().minuteMs() < beforeMinuteMs) {
                due.add(entry);
            }
        }
        if (due.isEmpty()) {
            return;
        }
        try {
            inTransaction(files, turn, aggregatesConnection, () -> {
                try (PreparedStatement upsert = aggregatesConnection.prepareStatement("""
                        INSERT INTO minute_aggregate
                            (channel, minute_ms, good_count, total_count, min_value, max_value, sum_value)
                        VALUES (?, ?, ?, ?, ?, ?, ?)
                        ON CONFLICT (channel, minute_ms) DO UPDATE SET
                            good_count  = good_count + excluded.good_count,
                            total_count = total_count + excluded.total_count,
                            min_value   = coalesce(min(min_value, excluded.min_value), min_value, excluded.min_value),
                            max_value   = coalesce(max(max_value, excluded.max_value), max_value, excluded.max_value),
                            sum_value   = coalesce(sum_value, 0) + coalesce(excluded.sum_value, 0)""")) {
                    for (Map.Entry<BucketKey, MinuteBucket> entry : due) {
                        entry.getValue().bind(upsert, entry.getKey().channel(), entry.getKey().minuteMs());
                        upsert.addBatch();
                    }
                    upsert.executeBatch();
                }
                return null;
            });
        } catch (SQLException e) {
            throw notRecorded("minute aggregates of " + due.size() + " channel-minutes", e);
        }
        for (Map.Entry<BucketKey, MinuteBucket> entry : due) {
            buckets.remove(entry.getKey());
        }
        long newest = due.get(due.size() - 1).getKey().minuteMs();
        if (lastPruneMs == Long.MIN_VALUE || newest - lastPruneMs >= PRUNE_EVERY.toMillis()) {
            pruneAggregates(Instant.ofEpochMilli(newest));
        }
    }

    /**
     * Runs {@code work} between {@code BEGIN IMMEDIATE} and {@code COMMIT}, rolled back on failure; refused before
     * SQLite is asked when the journal's files cannot be written (see {@link JournalFiles}).
     */
    static <T> T inTransaction(JournalFiles files, WriteTurn turn, Connection connection, SqlWork<T> work)
            throws SQLException {
        files.checkWritable();
        turn.take();
        try {
            try (Statement statement = connection.createStatement()) {
                statement.execute("BEGIN IMMEDIATE");
            }
            try {
                T result = work.run();
                try (Statement statement = connection.createStatement()) {
                    statement.execute("COMMIT");
                }
                return result;
            } catch (SQLException | RuntimeException e) {
                rollbackQuietly(connection);
                throw e;
            }
        } finally {
            turn.give();
        }
    }

    /** As {@link JournalFiles#checkWritable}, for the aggregate reads that do not go through {@link #read}. */
    private void checkReadable() throws JournalException {
        try {
            files.checkWritable();
        } catch (SQLException e) {
            throw new JournalException("journal " + file + ": cannot read: " + SqliteProblems.explain(e, file), e);
        }
    }

    private <T> T read(String what, SqlWork<T> work) throws JournalException {
        synchronized (recordLock) {
            ensureOpen(what);
            try {
                // A read in WAL mode writes its read mark into the memory-mapped -shm: on a file that can no
                // longer be written that is a SIGBUS, not an error, so it is asked first like a write.
                files.checkWritable();
                return work.run();
            } catch (SQLException e) {
                throw new JournalException("journal " + file + ": could not read " + what + ": "
                        + SqliteProblems.explain(e, file), e);
            }
        }
    }

    private List<JournalEvent> events(String sql, long first, int limit) throws SQLException {
        List<JournalEvent> events = new ArrayList<>();
        try (PreparedStatement query = records.prepareStatement(sql)) {
            query.setLong(1, first);
            query.setInt(2, limit);
            try (ResultSet rows = query.executeQuery()) {
                while (rows.next()) {
                    events.add(new JournalEvent(rows.getLong(1), rows.getString(2),
                            Instant.ofEpochMilli(rows.getLong(3)), Optional.ofNullable(rows.getString(4)),
                            Optional.ofNullable(rows.getString(5)), rows.getString(6)));
                }
            }
        }
        return events;
    }

    private int update(String sql, long... values) throws SQLException {
        try (PreparedStatement statement = records.prepareStatement(sql)) {
            for (int i = 0; i < values.length; i++) {
                statement.setLong(i + 1, values[i]);
            }
            return statement.executeUpdate();
        }
    }

    private void ensureOpen(String what) throws JournalException {
        if (closed) {
            throw new JournalException("journal " + file + " is closed; could not record " + what);
        }
    }

    private JournalException notRecorded(String what, SQLException e) {
        return new JournalException("journal " + file + ": could not record " + what + ": "
                + SqliteProblems.explain(e, file) + "; it is not in the journal", e);
    }

    private static void checkPath(Path path) throws JournalException {
        Path folder = path.getParent();
        if (folder != null && !Files.isDirectory(folder)) {
            throw new JournalException("cannot open the journal " + path + ": the folder " + folder
                    + (Files.exists(folder) ? " is not a folder" : " does not exist")
                    + "; create it or choose another journal file" + NOTHING_RECORDED);
        }
        if (Files.isDirectory(path)) {
            throw new JournalException("cannot open the journal " + path + ": it is a folder, not a file;"
                    + " name a file inside it, e.g. " + path.resolve("journal.db") + NOTHING_RECORDED);
        }
    }

    private static Connection connect(Path path, JournalSettings settings, SQLiteConfig.SynchronousMode mode)
            throws SQLException {
        SQLiteConfig config = new SQLiteConfig();
        config.setJournalMode(SQLiteConfig.JournalMode.WAL);
        config.setSynchronous(mode);
        config.setBusyTimeout((int) settings.busyTimeout().toMillis());
        config.enforceForeignKeys(true);
        Connection connection = DriverManager.getConnection("jdbc:sqlite:" + path, config.toProperties());
        connection.setAutoCommit(true);
        return connection;
    }

    private static void checkWal(Connection connection, Path path) throws SQLException {
        try (Statement statement = connection.createStatement();
             ResultSet rows = statement.executeQuery("PRAGMA journal_mode")) {
            String mode = rows.next() ? rows.getString(1) : "";
            if (!"wal".equalsIgnoreCase(mode)) {
                LOG.warn("journal {} runs in {} mode, not WAL (a network or unusual file system?);"
                        + " writes are safe but slower", path, mode);
            }
        }
    }

    private static void migrate(JournalFiles files, Connection connection, int from) throws SQLException {
        for (Migration migration : Schema.MIGRATIONS) {
            if (migration.version() <= from) {
                continue;
            }
            inTransaction(files, new WriteTurn(), connection, () -> {
                try (Statement statement = connection.createStatement()) {
                    for (String sql : migration.statements()) {
                        statement.execute(sql);
                    }
                    statement.execute("PRAGMA user_version = " + migration.version());
                }
                return null;
            });
            LOG.info("journal schema at version {}: {}", migration.version(), migration.description());
        }
    }

    private static void rollbackQuietly(Connection connection) {
        try (Statement statement = connection.createStatement()) {
            statement.execute("ROLLBACK");
        } catch (SQLException e) {
            // no transaction was open
        }
    }

    private static void closeQuietly(Connection connection) {
        if (connection != null) {
            try {
                connection.close();
            } catch (SQLException e) {
                LOG.debug("closing a journal connection: {}", e.getMessage());
            }
        }
    }
}
