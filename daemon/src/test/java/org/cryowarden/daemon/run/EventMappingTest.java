package org.cryowarden.daemon.run;

import static org.assertj.core.api.Assertions.assertThat;

import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.engine.AlarmState;
import org.cryowarden.rules.engine.AlarmTransition;
import org.cryowarden.rules.engine.BypassEnded;
import org.cryowarden.rules.engine.BypassStarted;
import org.cryowarden.rules.engine.FillReset;
import org.cryowarden.rules.engine.FillStarted;
import org.cryowarden.rules.engine.FillStopReason;
import org.cryowarden.rules.engine.FillStopped;
import org.cryowarden.rules.engine.FloodEnded;
import org.cryowarden.rules.engine.FloodStarted;
import org.cryowarden.rules.engine.InterlockReset;
import org.cryowarden.rules.engine.InterlockTripped;
import org.cryowarden.rules.engine.OutputCommand;
import org.cryowarden.rules.model.Priority;
import org.junit.jupiter.api.Test;

/**
 * Each engine event as the journal keeps it and the event topic carries it: the kind, the subject, the operator
 * and the exact fields. The alarm kinds follow the ANSI/ISA-18.2-2016 lifecycle (clause 11, state diagram); the
 * ids and values are invented.
 */
class EventMappingTest {

    private static final Instant AT = Instant.parse("2025-11-14T22:20:05Z");
    private static final Reading O2 = Reading.good("o2-east", 18.7, Unit.PERCENT_VOLUME, AT);
    private static final String O2_JSON = "{\"channel\":\"o2-east\",\"value\":18.7,\"unit\":\"%vol\","
            + "\"quality\":\"good\",\"reason\":\"\",\"time\":\"2025-11-14T22:20:05Z\"}";

    @Test
    void raisedAlarmCarriesStatesPriorityMessageAndTriggeringReading() {
        DaemonEvent event = EventMapping.of(transition(AlarmState.NORMAL, AlarmState.UNACKNOWLEDGED,
                Optional.of(O2), Optional.empty(), ""));

        assertThat(event.kind()).isEqualTo("alarm.raised");
        assertThat(event.at()).isEqualTo(AT);
        assertThat(event.subject()).contains("o2-low");
        assertThat(event.operator()).isEmpty();
        assertThat(Payloads.text(event.payload())).isEqualTo("{\"cause\":\"o2-east 18.7 %vol below 19.5 %vol\","
                + "\"from\":\"normal\",\"to\":\"active-unacknowledged\",\"priority\":\"critical\","
                + "\"message\":\"Oxygen low\",\"reading\":" + O2_JSON + ",\"note\":\"\"}");
    }

    @Test
    void publishedEventAddsSequenceKindTimeSubjectAndOperatorAheadOfTheFields() {
        DaemonEvent event = EventMapping.of(transition(AlarmState.UNACKNOWLEDGED, AlarmState.ACKNOWLEDGED,
                Optional.empty(), Optional.of("Ada"), "fan running"));

        assertThat(Payloads.text(event.published(42))).isEqualTo("{\"seq\":42,\"kind\":\"alarm.acknowledged\","
                + "\"time\":\"2025-11-14T22:20:05Z\",\"subject\":\"o2-low\",\"operator\":\"Ada\","
                + "\"cause\":\"o2-east 18.7 %vol below 19.5 %vol\",\"from\":\"active-unacknowledged\","
                + "\"to\":\"active-acknowledged\",\"priority\":\"critical\",\"message\":\"Oxygen low\","
                + "\"note\":\"fan running\"}");
        assertThat(event.logLine(42)).isEqualTo("event 42 alarm.acknowledged o2-low by Ada: Oxygen low");
    }

    @Test
    void everyLifecycleTransitionGetsTheKindOfTheStatesItJoins() {
        Optional<String> ada = Optional.of("Ada");
        Optional<String> none = Optional.empty();
        assertThat(kind(AlarmState.UNACKNOWLEDGED, AlarmState.ACKNOWLEDGED, ada)).isEqualTo("alarm.acknowledged");
        // Acknowledging a returned alarm takes it straight to normal.
        assertThat(kind(AlarmState.RETURNED_UNACKNOWLEDGED, AlarmState.NORMAL, ada)).isEqualTo("alarm.acknowledged");
        assertThat(kind(AlarmState.UNACKNOWLEDGED, AlarmState.RETURNED_UNACKNOWLEDGED, none))
                .isEqualTo("alarm.cleared");
        assertThat(kind(AlarmState.ACKNOWLEDGED, AlarmState.NORMAL, none)).isEqualTo("alarm.cleared");
        // A return that re-activates before the acknowledgement is raised again.
        assertThat(kind(AlarmState.RETURNED_UNACKNOWLEDGED, AlarmState.UNACKNOWLEDGED, none))
                .isEqualTo("alarm.raised");
        assertThat(kind(AlarmState.NORMAL, AlarmState.SHELVED, ada)).isEqualTo("alarm.shelved");
        assertThat(kind(AlarmState.SHELVED, AlarmState.NORMAL, none)).isEqualTo("alarm.unshelved");
        assertThat(kind(AlarmState.SHELVED, AlarmState.UNACKNOWLEDGED, none)).isEqualTo("alarm.unshelved");
        assertThat(kind(AlarmState.NORMAL, AlarmState.OUT_OF_SERVICE, ada)).isEqualTo("alarm.out-of-service");
        assertThat(kind(AlarmState.OUT_OF_SERVICE, AlarmState.NORMAL, ada)).isEqualTo("alarm.returned-to-service");
        assertThat(kind(AlarmState.NORMAL, AlarmState.SUPPRESSED, none)).isEqualTo("alarm.suppressed");
        assertThat(kind(AlarmState.SUPPRESSED, AlarmState.NORMAL, none)).isEqualTo("alarm.unsuppressed");
        // An acknowledged alarm that goes active-unacknowledged again without an operator.
        assertThat(kind(AlarmState.ACKNOWLEDGED, AlarmState.UNACKNOWLEDGED, none)).isEqualTo("alarm.raised");
    }

    @Test
    void tripNamesTheCausingAlarmAndTheOutputCommands() {
        DaemonEvent event = EventMapping.of(new InterlockTripped(AT, "ventilation", "o2-low",
                List.of(command("exhaust-fan", 1), command("beacon", 1)), "alarm o2-low is active"));

        assertThat(event.kind()).isEqualTo("interlock.tripped");
        assertThat(event.subject()).contains("ventilation");
        assertThat(event.operator()).isEmpty();
        assertThat(Payloads.text(event.payload())).isEqualTo("{\"cause\":\"alarm o2-low is active\","
                + "\"cause_alarm\":\"o2-low\",\"commands\":[{\"output\":\"exhaust-fan\",\"value\":1.0},"
                + "{\"output\":\"beacon\",\"value\":1.0}]}");
    }

    @Test
    void resetNamesTheOperatorAndTheOutputsReturnedToTheirSafeValues() {
        DaemonEvent event = EventMapping.of(new InterlockReset(AT, "ventilation", "Ada",
                List.of(command("exhaust-fan", 0)), "reset by Ada"));

        assertThat(event.kind()).isEqualTo("interlock.reset");
        assertThat(event.subject()).contains("ventilation");
        assertThat(event.operator()).contains("Ada");
        assertThat(Payloads.text(event.payload())).isEqualTo("{\"cause\":\"reset by Ada\","
                + "\"commands\":[{\"output\":\"exhaust-fan\",\"value\":0.0}]}");
    }

    @Test
    void bypassStartAndEndNameOwnerReasonAndExpiry() {
        DaemonEvent started = EventMapping.of(new BypassStarted(AT, "ventilation", "Grace", "fan service",
                AT.plus(Duration.ofHours(1)), Duration.ofHours(1), "bypassed by Grace"));
        assertThat(started.kind()).isEqualTo("interlock.bypassed");
        assertThat(started.operator()).contains("Grace");
        assertThat(Payloads.text(started.payload())).isEqualTo("{\"cause\":\"bypassed by Grace\","
                + "\"reason\":\"fan service\",\"until\":\"2025-11-14T23:20:05Z\",\"duration\":\"PT1H\"}");

        DaemonEvent expired = EventMapping.of(new BypassEnded(AT, "ventilation", "Grace", Optional.empty(),
                "bypass expired"));
        assertThat(expired.kind()).isEqualTo("interlock.bypass-ended");
        assertThat(expired.operator()).isEmpty();
        assertThat(Payloads.text(expired.payload())).isEqualTo("{\"cause\":\"bypass expired\",\"owner\":\"Grace\"}");

        DaemonEvent ended = EventMapping.of(new BypassEnded(AT, "ventilation", "Grace", Optional.of("Ada"),
                "bypass ended by Ada"));
        assertThat(ended.operator()).contains("Ada");
    }

    @Test
    void fillStartCarriesTheValveAndTheLevelThatStartedIt() {
        Reading level = Reading.good("trap-level", 29.5, Unit.PERCENT, AT);
        DaemonEvent event = EventMapping.of(new FillStarted(AT, "trap-fill", "trap-valve", level,
                command("trap-valve", 1), "fill started: trap-level 29.5 % below the start level of 30 %"));

        assertThat(event.kind()).isEqualTo("fill.started");
        assertThat(event.subject()).contains("trap-fill");
        assertThat(event.operator()).isEmpty();
        assertThat(Payloads.text(event.payload())).isEqualTo("{\"cause\":\"fill started: trap-level 29.5 % below"
                + " the start level of 30 %\",\"valve\":\"trap-valve\",\"level\":{\"channel\":\"trap-level\","
                + "\"value\":29.5,\"unit\":\"%\",\"quality\":\"good\",\"reason\":\"\","
                + "\"time\":\"2025-11-14T22:20:05Z\"}}");
    }

    @Test
    void fillStopCarriesTheReasonWordAndWhetherItLockedOut() {
        DaemonEvent noRise = EventMapping.of(new FillStopped(AT, "trap-fill", "trap-valve", FillStopReason.NO_RISE,
                true, Optional.empty(), command("trap-valve", 0), "supply empty or valve stuck"));
        assertThat(noRise.kind()).isEqualTo("fill.stopped");
        assertThat(noRise.subject()).contains("trap-fill");
        assertThat(Payloads.text(noRise.payload())).isEqualTo("{\"cause\":\"supply empty or valve stuck\","
                + "\"valve\":\"trap-valve\",\"reason\":\"no-rise\",\"locked_out\":true}");

        Reading level = Reading.good("trap-level", 89.5, Unit.PERCENT, AT);
        DaemonEvent done = EventMapping.of(new FillStopped(AT, "trap-fill", "trap-valve", FillStopReason.STOP_LEVEL,
                false, Optional.of(level), command("trap-valve", 0), "reached the stop level"));
        assertThat(done.payload().path("reason").asText()).isEqualTo("stop-level");
        assertThat(done.payload().path("locked_out").asBoolean()).isFalse();
        assertThat(done.payload().path("level").path("value").asDouble()).isEqualTo(89.5);
    }

    @Test
    void fillResetNamesTheOperator() {
        DaemonEvent event = EventMapping.of(new FillReset(AT, "trap-fill", "night operator",
                "trap-fill reset by night operator"));

        assertThat(event.kind()).isEqualTo("fill.reset");
        assertThat(event.subject()).contains("trap-fill");
        assertThat(event.operator()).contains("night operator");
        assertThat(Payloads.text(event.payload())).isEqualTo("{\"cause\":\"trap-fill reset by night operator\"}");
    }

    @Test
    void floodStartAndEndCarryCountWindowAndFirstOutAlarm() {
        // More than 10 alarms in 10 minutes: the flood benchmark of EEMUA 191 (3rd edition, 2013).
        DaemonEvent started = EventMapping.of(new FloodStarted(AT, 11, Duration.ofMinutes(10), "o2-low",
                AT.minusSeconds(300), List.of("o2-low", "o2-evacuate"), "11 alarms in 10min"));
        assertThat(started.kind()).isEqualTo("flood.started");
        assertThat(started.subject()).contains("o2-low");
        assertThat(started.operator()).isEmpty();
        assertThat(Payloads.text(started.payload())).isEqualTo("{\"cause\":\"11 alarms in 10min\",\"count\":11,"
                + "\"window\":\"PT10M\",\"first_out\":\"o2-low\",\"first_out_at\":\"2025-11-14T22:15:05Z\","
                + "\"alarms\":[\"o2-low\",\"o2-evacuate\"]}");

        DaemonEvent ended = EventMapping.of(new FloodEnded(AT.plusSeconds(1200), AT, 23, "o2-low",
                Duration.ofMinutes(20), "fewer than 5 alarms in 10min"));
        assertThat(ended.kind()).isEqualTo("flood.ended");
        assertThat(ended.subject()).contains("o2-low");
        assertThat(Payloads.text(ended.payload())).isEqualTo("{\"cause\":\"fewer than 5 alarms in 10min\","
                + "\"started\":\"2025-11-14T22:20:05Z\",\"activations\":23,\"first_out\":\"o2-low\","
                + "\"duration\":\"PT20M\"}");
    }

    @Test
    void outputCommandNamesTheOutputValueAndInterlock() {
        DaemonEvent event = EventMapping.of(command("exhaust-fan", 1));

        assertThat(event.kind()).isEqualTo("output.command");
        assertThat(event.subject()).contains("exhaust-fan");
        assertThat(Payloads.text(event.payload())).isEqualTo("{\"cause\":\"interlock ventilation tripped\","
                + "\"value\":1.0,\"interlock\":\"ventilation\"}");
    }

    // ---- helpers ----

    private static String kind(AlarmState from, AlarmState to, Optional<String> operator) {
        return EventMapping.of(transition(from, to, Optional.empty(), operator, "")).kind();
    }

    private static AlarmTransition transition(AlarmState from, AlarmState to, Optional<Reading> reading,
            Optional<String> operator, String note) {
        return new AlarmTransition(AT, "o2-low", from, to, Priority.CRITICAL, "Oxygen low", reading, operator, note,
                "o2-east 18.7 %vol below 19.5 %vol");
    }

    private static OutputCommand command(String output, double value) {
        return new OutputCommand(AT, output, value, "ventilation", "interlock ventilation tripped");
    }
}
