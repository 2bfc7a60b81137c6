package org.cryowarden.daemon.journal;

import java.time.Instant;

/**
 * The last recorded state of one alarm, as the engine's JSON snapshot.
 *
 * @param alarmId   the alarm id from the rule set
 * @param stateJson the engine's snapshot of the alarm
 * @param seq       sequence number of the event that set this state
 * @param updatedAt wall-clock instant of that event
 */
public record AlarmStateRecord(String alarmId, String stateJson, long seq, Instant updatedAt) {
}
