package org.cryowarden.daemon.journal;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Types;
import java.time.Instant;
import java.util.Objects;
import java.util.OptionalLong;

/**
 * The operations of one write transaction: everything done through it commits together or not at all, so an
 * event, the alarm state it changed and the outbox entry that announces it are never out of step.
 * Valid only inside {@link Journal#write}.
 */
public final class JournalTransaction {

    private final Connection connection;

    JournalTransaction(Connection connection) {
        this.connection = connection;
    }

    /** Appends an event and returns its sequence number: one more than the last, never reused. */
    public long appendEvent(NewEvent event) throws SQLException {
        Objects.requireNonNull(event, "event");
        try (PreparedStatement insert = connection.prepareStatement(
                "INSERT INTO event (kind, at_ms, subject, operator, payload) VALUES (?, ?, ?, ?, ?) RETURNING seq")) {
            insert.setString(1, event.kind());
            insert.setLong(2, event.at().toEpochMilli());
            insert.setString(3, event.subject().orElse(null));
            insert.setString(4, event.operator().orElse(null));
            insert.setString(5, event.payloadJson());
            try (ResultSet rows = insert.executeQuery()) {
                rows.next();
                return rows.getLong(1);
            }
        }
    }

    /** Sets the current state of {@code alarmId}, recording which event set it. */
    public void putAlarmState(String alarmId, String stateJson, long seq, Instant at) throws SQLException {
        try (PreparedStatement upsert = connection.prepareStatement("""
                INSERT INTO alarm_state (alarm_id, state, seq, updated_ms) VALUES (?, ?, ?, ?)
                ON CONFLICT (alarm_id) DO UPDATE SET state = excluded.state, seq = excluded.seq,
                                                     updated_ms = excluded.updated_ms""")) {
            upsert.setString(1, alarmId);
            upsert.setString(2, stateJson);
            upsert.setLong(3, seq);
            upsert.setLong(4, at.toEpochMilli());
            upsert.executeUpdate();
        }
    }

    /** Forgets the state of an alarm that the rule set no longer has. */
    public void removeAlarmState(String alarmId) throws SQLException {
        try (PreparedStatement delete = connection.prepareStatement("DELETE FROM alarm_state WHERE alarm_id = ?")) {
            delete.setString(1, alarmId);
            delete.executeUpdate();
        }
    }

    /** Queues a message for {@code sink}; returns its outbox id (delivery order within the sink). */
    public long enqueue(String sink, String target, String payload, OptionalLong seq, Instant at) throws SQLException {
        try (PreparedStatement insert = connection.prepareStatement(
                "INSERT INTO outbox (sink, target, payload, seq, created_ms) VALUES (?, ?, ?, ?, ?) RETURNING id")) {
            insert.setString(1, sink);
            insert.setString(2, target);
            insert.setString(3, payload);
            if (seq.isPresent()) {
                insert.setLong(4, seq.getAsLong());
            } else {
                insert.setNull(4, Types.INTEGER);
            }
            insert.setLong(5, at.toEpochMilli());
            try (ResultSet rows = insert.executeQuery()) {
                rows.next();
                return rows.getLong(1);
            }
        }
    }
}
