package org.cryowarden.daemon.run;

import static org.assertj.core.api.Assertions.assertThat;

import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.engine.AlarmState;
import org.cryowarden.rules.engine.Bypass;
import org.cryowarden.rules.engine.EngineSnapshot;
import org.cryowarden.rules.engine.Shelving;
import org.junit.jupiter.api.Test;

/** The restart facts kept in the journal's state table: what is written is read back unchanged, every field. */
class SnapshotJsonTest {

    private static final Instant AT = Instant.parse("2025-11-14T22:20:05Z");

    @Test
    void acknowledgedAlarmRoundTripsWithOperatorAndNote() {
        EngineSnapshot.AlarmRecord record = new EngineSnapshot.AlarmRecord("o2-low", AlarmState.ACKNOWLEDGED, AT,
                true, false, Optional.of("Ada"), "fan running, room closed", Optional.empty(), Optional.empty(), "");

        String json = SnapshotJson.alarm(record);

        assertThat(json).isEqualTo("{\"id\":\"o2-low\",\"state\":\"active-acknowledged\","
                + "\"since\":\"2025-11-14T22:20:05Z\",\"condition_active\":true,\"unacknowledged\":false,"
                + "\"acknowledged_by\":\"Ada\",\"acknowledge_note\":\"fan running, room closed\","
                + "\"out_of_service_by\":null,\"out_of_service_reason\":\"\"}");
        assertThat(SnapshotJson.parseAlarm(json)).contains(record);
    }

    @Test
    void unacknowledgedShelvedAndOutOfServiceAlarmsRoundTrip() {
        EngineSnapshot.AlarmRecord unacknowledged = new EngineSnapshot.AlarmRecord("o2-evacuate",
                AlarmState.RETURNED_UNACKNOWLEDGED, AT, false, true, Optional.empty(), "", Optional.empty(),
                Optional.empty(), "");
        EngineSnapshot.AlarmRecord shelved = new EngineSnapshot.AlarmRecord("o2-east-stale", AlarmState.SHELVED, AT,
                true, false, Optional.empty(), "", Optional.of(new Shelving("Grace", "sensor replaced tomorrow",
                AT.plus(Duration.ofHours(1)), Duration.ofMinutes(42))), Optional.empty(), "");
        EngineSnapshot.AlarmRecord removed = new EngineSnapshot.AlarmRecord("ovc-high", AlarmState.OUT_OF_SERVICE,
                AT, false, false, Optional.empty(), "", Optional.empty(), Optional.of("Grace"), "gauge removed");

        for (EngineSnapshot.AlarmRecord record : List.of(unacknowledged, shelved, removed)) {
            assertThat(SnapshotJson.parseAlarm(SnapshotJson.alarm(record))).contains(record);
        }
        assertThat(SnapshotJson.alarm(shelved)).contains("\"shelving\":{\"operator\":\"Grace\","
                + "\"reason\":\"sensor replaced tomorrow\",\"until\":\"2025-11-14T23:20:05Z\",\"remaining\":\"PT42M\"}");
    }

    @Test
    void latchedTripAndBypassedInterlockRoundTrip() {
        EngineSnapshot.InterlockRecord tripped = new EngineSnapshot.InterlockRecord("ventilation", true,
                Optional.of(AT), List.of("o2-low", "o2-evacuate"), Optional.empty());
        EngineSnapshot.InterlockRecord bypassed = new EngineSnapshot.InterlockRecord("ventilation", false,
                Optional.empty(), List.of(), Optional.of(new Bypass("Grace", "fan service",
                AT.plus(Duration.ofHours(2)), Duration.ofMinutes(90))));

        assertThat(SnapshotJson.interlock(tripped)).isEqualTo("{\"id\":\"ventilation\",\"tripped\":true,"
                + "\"tripped_at\":\"2025-11-14T22:20:05Z\",\"causes\":[\"o2-low\",\"o2-evacuate\"]}");
        assertThat(SnapshotJson.parseInterlock(SnapshotJson.interlock(tripped))).contains(tripped);
        assertThat(SnapshotJson.parseInterlock(SnapshotJson.interlock(bypassed))).contains(bypassed);
    }

    @Test
    void lockedOutAndIdleFillsRoundTrip() {
        EngineSnapshot.FillRecord locked = new EngineSnapshot.FillRecord("trap-fill", true, AT,
                Optional.of("no-rise"), false);
        EngineSnapshot.FillRecord filling = new EngineSnapshot.FillRecord("trap-fill", false, AT, Optional.empty(),
                true);

        assertThat(SnapshotJson.fill(locked)).isEqualTo("{\"id\":\"trap-fill\",\"locked_out\":true,"
                + "\"since\":\"2025-11-14T22:20:05Z\",\"lockout\":\"no-rise\",\"valve_open\":false}");
        assertThat(SnapshotJson.parseFill(SnapshotJson.fill(locked))).contains(locked);
        assertThat(SnapshotJson.parseFill(SnapshotJson.fill(filling))).contains(filling);
        assertThat(SnapshotJson.FILL_KEY + "trap-fill").isEqualTo("fill:trap-fill");
        assertThat(SnapshotJson.INTERLOCK_KEY + "ventilation").isEqualTo("interlock:ventilation");
    }

    @Test
    void unreadableRecordsParseToEmptyInsteadOfFailingTheStart() {
        assertThat(SnapshotJson.parseAlarm("{\"id\":\"o2-low\",\"state\":\"on-fire\"}")).isEmpty();
        assertThat(SnapshotJson.parseAlarm("{\"id\":\"o2-low\",\"state\":\"normal\",\"since\":\"yesterday\"}"))
                .isEmpty();
        assertThat(SnapshotJson.parseAlarm("not json")).isEmpty();
        assertThat(SnapshotJson.parseInterlock("{\"tripped\":true,\"tripped_at\":\"soon\"}")).isEmpty();
        assertThat(SnapshotJson.parseFill("{\"id\":\"trap-fill\"}")).isEmpty();
    }
}
