package org.cryowarden.daemon.run;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.util.Optional;
import org.cryowarden.rules.engine.AlarmState;
import org.cryowarden.rules.engine.AlarmTransition;
import org.cryowarden.rules.engine.BypassEnded;
import org.cryowarden.rules.engine.BypassStarted;
import org.cryowarden.rules.engine.EngineEvent;
import org.cryowarden.rules.engine.FillReset;
import org.cryowarden.rules.engine.FillStarted;
import org.cryowarden.rules.engine.FillStopped;
import org.cryowarden.rules.engine.FloodEnded;
import org.cryowarden.rules.engine.FloodStarted;
import org.cryowarden.rules.engine.InterlockReset;
import org.cryowarden.rules.engine.InterlockTripped;
import org.cryowarden.rules.engine.OutputCommand;

/** Names each engine event for the journal and the event topic, and writes its fields. */
final class EventMapping {

    private EventMapping() {
    }

    static DaemonEvent of(EngineEvent event) {
        ObjectNode payload = Payloads.object();
        payload.put("cause", event.cause());
        if (event instanceof AlarmTransition t) {
            payload.put("from", t.from().wire());
            payload.put("to", t.to().wire());
            payload.put("priority", t.priority().word());
            payload.put("message", t.message());
            t.reading().ifPresent(r -> payload.set("reading", Payloads.reading(r)));
            payload.put("note", t.note());
            return new DaemonEvent(alarmKind(t), t.instant(), Optional.of(t.alarmId()), t.operator(), payload);
        }
        if (event instanceof InterlockTripped t) {
            payload.put("cause_alarm", t.causeAlarm());
            payload.set("commands", commands(t.commands()));
            return new DaemonEvent("interlock.tripped", t.instant(), Optional.of(t.interlockId()), Optional.empty(),
                    payload);
        }
        if (event instanceof InterlockReset r) {
            payload.set("commands", commands(r.commands()));
            return new DaemonEvent("interlock.reset", r.instant(), Optional.of(r.interlockId()),
                    Optional.of(r.operator()), payload);
        }
        if (event instanceof BypassStarted b) {
            payload.put("reason", b.reason());
            payload.put("until", b.until().toString());
            payload.put("duration", b.duration().toString());
            return new DaemonEvent("interlock.bypassed", b.instant(), Optional.of(b.interlockId()),
                    Optional.of(b.owner()), payload);
        }
        if (event instanceof BypassEnded b) {
            payload.put("owner", b.owner());
            return new DaemonEvent("interlock.bypass-ended", b.instant(), Optional.of(b.interlockId()), b.endedBy(),
                    payload);
        }
        if (event instanceof FillStarted f) {
            payload.put("valve", f.valve());
            payload.set("level", Payloads.reading(f.level()));
            return new DaemonEvent("fill.started", f.instant(), Optional.of(f.fillId()), Optional.empty(), payload);
        }
        if (event instanceof FillStopped f) {
            payload.put("valve", f.valve());
            payload.put("reason", f.reason().wire());
            payload.put("locked_out", f.lockedOut());
            f.level().ifPresent(r -> payload.set("level", Payloads.reading(r)));
            return new DaemonEvent("fill.stopped", f.instant(), Optional.of(f.fillId()), Optional.empty(), payload);
        }
        if (event instanceof FillReset f) {
            return new DaemonEvent("fill.reset", f.instant(), Optional.of(f.fillId()), Optional.of(f.operator()),
                    payload);
        }
        if (event instanceof FloodStarted f) {
            payload.put("count", f.count());
            payload.put("window", f.window().toString());
            payload.put("first_out", f.firstOutAlarm());
            payload.put("first_out_at", f.firstOutAt().toString());
            ArrayNode alarms = payload.putArray("alarms");
            f.alarms().forEach(alarms::add);
            return new DaemonEvent("flood.started", f.instant(), Optional.of(f.firstOutAlarm()), Optional.empty(),
                    payload);
        }
        if (event instanceof FloodEnded f) {
            payload.put("started", f.startedAt().toString());
            payload.put("activations", f.activations());
            payload.put("first_out", f.firstOutAlarm());
            payload.put("duration", f.duration().toString());
            return new DaemonEvent("flood.ended", f.instant(), Optional.of(f.firstOutAlarm()), Optional.empty(),
                    payload);
        }
        if (event instanceof OutputCommand c) {
            payload.put("value", c.value());
            payload.put("interlock", c.interlockId());
            return new DaemonEvent("output.command", c.instant(), Optional.of(c.outputId()), Optional.empty(),
                    payload);
        }
        // EngineEvent is sealed; reaching here means a new event type was added without a mapping.
        throw new IllegalStateException("no journal mapping for engine event " + event.getClass().getSimpleName());
    }

    /** The event kind of an alarm transition, from the states it joins (ANSI/ISA-18.2 lifecycle). */
    static String alarmKind(AlarmTransition t) {
        AlarmState from = t.from();
        AlarmState to = t.to();
        if (to == AlarmState.SHELVED) {
            return "alarm.shelved";
        }
        if (from == AlarmState.SHELVED) {
            return "alarm.unshelved";
        }
        if (to == AlarmState.OUT_OF_SERVICE) {
            return "alarm.out-of-service";
        }
        if (from == AlarmState.OUT_OF_SERVICE) {
            return "alarm.returned-to-service";
        }
        if (to == AlarmState.SUPPRESSED) {
            return "alarm.suppressed";
        }
        if (from == AlarmState.SUPPRESSED) {
            return "alarm.unsuppressed";
        }
        if (from.awaitsAcknowledgement() && t.operator().isPresent()
                && (to == AlarmState.ACKNOWLEDGED || to == AlarmState.NORMAL)) {
            return "alarm.acknowledged";
        }
        if (to == AlarmState.UNACKNOWLEDGED) {
            return "alarm.raised";
        }
        if (to == AlarmState.RETURNED_UNACKNOWLEDGED || to == AlarmState.NORMAL) {
            return "alarm.cleared";
        }
        return "alarm.changed";
    }

    private static ArrayNode commands(java.util.List<OutputCommand> commands) {
        ArrayNode array = Payloads.JSON.createArrayNode();
        for (OutputCommand c : commands) {
            ObjectNode node = array.addObject();
            node.put("output", c.outputId());
            node.put("value", c.value());
        }
        return array;
    }
}
