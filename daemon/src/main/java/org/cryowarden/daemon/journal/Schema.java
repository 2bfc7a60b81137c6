package org.cryowarden.daemon.journal;

import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.List;

/**
 * The journal's schema as a list of migrations; the version applied is kept in SQLite's {@code user_version}
 * and {@link Journal} applies the missing ones at open. Add a migration at the end to change the schema; never
 * edit one that has been released.
 */
final class Schema {

    static final List<Migration> MIGRATIONS = List.of(
            new Migration(1, "event log, alarm states, outbox, minute aggregates", List.of(
                    """
                    CREATE TABLE event (
                        seq      INTEGER PRIMARY KEY AUTOINCREMENT,
                        kind     TEXT    NOT NULL CHECK (length(kind) > 0),
                        at_ms    INTEGER NOT NULL,
                        subject  TEXT,
                        operator TEXT,
                        payload  TEXT    NOT NULL CHECK (json_valid(payload))
                    )""",
                    "CREATE INDEX event_at ON event (at_ms)",
                    "CREATE INDEX event_subject ON event (subject, seq)",
                    """
                    CREATE TRIGGER event_is_append_only_update BEFORE UPDATE ON event
                    BEGIN SELECT RAISE(ABORT, 'the event log is append-only'); END""",
                    """
                    CREATE TRIGGER event_is_append_only_delete BEFORE DELETE ON event
                    BEGIN SELECT RAISE(ABORT, 'the event log is append-only'); END""",
                    """
                    CREATE TABLE alarm_state (
                        alarm_id   TEXT    PRIMARY KEY,
                        state      TEXT    NOT NULL CHECK (json_valid(state)),
                        seq        INTEGER NOT NULL REFERENCES event (seq),
                        updated_ms INTEGER NOT NULL
                    )""",
                    """
                    CREATE TABLE outbox (
                        id              INTEGER PRIMARY KEY AUTOINCREMENT,
                        sink            TEXT    NOT NULL,
                        target          TEXT    NOT NULL,
                        payload         TEXT    NOT NULL,
                        seq             INTEGER REFERENCES event (seq),
                        created_ms      INTEGER NOT NULL,
                        attempts        INTEGER NOT NULL DEFAULT 0,
                        last_attempt_ms INTEGER,
                        delivered_ms    INTEGER
                    )""",
                    "CREATE INDEX outbox_undelivered ON outbox (sink, id) WHERE delivered_ms IS NULL",
                    """
                    CREATE TABLE minute_aggregate (
                        channel     TEXT    NOT NULL,
                        minute_ms   INTEGER NOT NULL,
                        good_count  INTEGER NOT NULL,
                        total_count INTEGER NOT NULL,
                        min_value   REAL,
                        max_value   REAL,
                        sum_value   REAL,
                        PRIMARY KEY (channel, minute_ms)
                    ) WITHOUT ROWID""",
                    "CREATE INDEX minute_aggregate_minute ON minute_aggregate (minute_ms)",
                    """
                    CREATE VIEW event_readable AS
                    SELECT seq, kind, strftime('%Y-%m-%dT%H:%M:%fZ', at_ms / 1000.0, 'unixepoch') AS at_utc,
                           subject, operator, payload
                    FROM event""")),
            new Migration(2, "raw history blocks", List.of(
                    """
                    CREATE TABLE history_block (
                        id         INTEGER PRIMARY KEY AUTOINCREMENT,
                        channel    TEXT    NOT NULL CHECK (length(channel) > 0),
                        first_ns   INTEGER NOT NULL,
                        last_ns    INTEGER NOT NULL CHECK (last_ns >= first_ns),
                        count      INTEGER NOT NULL CHECK (count > 0),
                        sealed     INTEGER NOT NULL DEFAULT 0 CHECK (sealed IN (0, 1)),
                        data       BLOB    NOT NULL,
                        written_ms INTEGER NOT NULL
                    )""",
                    "CREATE INDEX history_block_channel ON history_block (channel, first_ns)",
                    "CREATE INDEX history_block_last ON history_block (last_ns)",
                    "CREATE INDEX history_block_open ON history_block (id) WHERE sealed = 0")));

    private Schema() {
    }

    /** The newest schema version this build knows. */
    static int latestVersion() {
        return MIGRATIONS.get(MIGRATIONS.size() - 1).version();
    }

    static int currentVersion(Connection connection) throws SQLException {
        try (Statement statement = connection.createStatement();
             ResultSet rows = statement.executeQuery("PRAGMA user_version")) {
            return rows.next() ? rows.getInt(1) : 0;
        }
    }
}
