package org.cryowarden.rules.engine;

import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.function.Function;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.TimeSource;

/**
 * The deterministic rule engine: the same configuration, readings, commands and clock give the same events.
 *
 * <p>Time comes only from the injected {@link TimeSource}: timers (on- and off-delays, stale timeouts, shelving
 * and bypass expiry) run on its monotonic side and fire at the first {@link #tick()}, reading or command at or
 * after their due time, so a wall-clock step neither fires nor stalls them; event timestamps are its wall side.
 * Cost per reading depends on the rules of that channel only. Not thread-safe: the daemon calls it from its one
 * engine thread. No threads, no I/O, no sleeping inside.
 *
 * <p>cryowarden is a supervisory layer, not a certified safety system: its interlocks never replace hardwired
 * oxygen monitoring, relief devices or what local codes require.
 */
public final class Engine {

    private final Core core;

    /**
     * Builds an engine with the built-in derived functions.
     *
     * @throws IllegalArgumentException naming the rule, channel or interlock and its position when the configuration
     *                                  is inconsistent (unknown channel, unit mismatch, cycle, duplicate id, ...)
     */
    public Engine(EngineConfig config, TimeSource time) {
        this(config, time, DerivedFunctions.builtIn());
    }

    /** Builds an engine whose derived channels may use the functions of {@code functions}. */
    public Engine(EngineConfig config, TimeSource time, DerivedFunctions functions) {
        Objects.requireNonNull(config, "config");
        Objects.requireNonNull(time, "time");
        Objects.requireNonNull(functions, "functions");
        this.core = Wiring.build(config, time, functions);
    }

    /**
     * Evaluates one reading of a measured channel (and the derived channels computed from it), after expiring the
     * timers that fell due. The reading is converted into the channel's unit; a value outside the channel's valid
     * range is treated as BAD with a reason.
     *
     * @throws IllegalArgumentException when the channel is not a measured channel of the configuration (a
     *                                  programming error in the caller)
     */
    public List<EngineEvent> onReading(Reading reading) {
        MeasuredChannel channel = core.measuredIndex.get(reading.channel());
        if (channel == null) {
            String kind = core.channels.containsKey(reading.channel()) ? "is derived, not measured" : "is not configured";
            throw new IllegalArgumentException("channel '" + reading.channel() + "' " + kind
                    + Suggestion.didYouMean(reading.channel(), core.measured.keySet()));
        }
        core.begin();
        Reading admitted = channel.admit(reading);
        channel.arrived(core.now);
        core.deliver(channel, admitted);
        return core.finish();
    }

    /** Expires the timers that fell due: the daemon calls this regularly (e.g. every 100 ms) between readings. */
    public List<EngineEvent> tick() {
        core.begin();
        return core.finish();
    }

    /** Acknowledges an alarm that awaits it (active-unacknowledged or returned-unacknowledged). */
    public CommandResult acknowledge(String alarmId, String operator, String note) {
        Objects.requireNonNull(note, "note");
        return onAlarm(alarmId, operator, (alarm, who) -> alarm.acknowledge(who, note.strip()));
    }

    /** Shelves an alarm for a limited time; it returns by itself when the time is up. */
    public CommandResult shelve(String alarmId, String operator, Duration duration, String reason) {
        Objects.requireNonNull(duration, "duration");
        Objects.requireNonNull(reason, "reason");
        return onAlarm(alarmId, operator, (alarm, who) -> alarm.shelve(who, duration, reason));
    }

    public CommandResult unshelve(String alarmId, String operator) {
        return onAlarm(alarmId, operator, AlarmRuntime::unshelve);
    }

    /** Takes an alarm out of service (maintenance, a removed sensor) until {@link #returnToService}. */
    public CommandResult removeFromService(String alarmId, String operator, String reason) {
        Objects.requireNonNull(reason, "reason");
        return onAlarm(alarmId, operator, (alarm, who) -> alarm.removeFromService(who, reason));
    }

    public CommandResult returnToService(String alarmId, String operator) {
        return onAlarm(alarmId, operator, AlarmRuntime::returnToService);
    }

    /**
     * Resets a tripped interlock, returning its outputs to their safe values; refused while any alarm that trips it
     * is still active.
     */
    public CommandResult reset(String interlockId, String operator) {
        return onInterlock(interlockId, operator, InterlockRuntime::reset);
    }

    /**
     * Clears the lockout of a fill (after no rise or the maximum open time); the controller decides again from the
     * next level reading. Refused when the fill is not locked out.
     */
    public CommandResult resetFill(String fillId, String operator) {
        return command(operator, who -> {
            FillController fill = core.fills.get(fillId);
            if (fill == null) {
                return "there is no fill '" + fillId + "'" + Suggestion.didYouMean(fillId, core.fills.keySet());
            }
            return fill.reset(who);
        });
    }

    /** Bypasses an interlock until the bypass expires or is ended: its alarms still raise but do not trip it. */
    public CommandResult bypass(String interlockId, String owner, String reason, Duration duration) {
        Objects.requireNonNull(reason, "reason");
        Objects.requireNonNull(duration, "duration");
        return onInterlock(interlockId, owner, (interlock, who) -> interlock.bypass(who, reason, duration));
    }

    /** Ends a bypass early; the interlock trips at once if a cause alarm is still active. */
    public CommandResult endBypass(String interlockId, String operator) {
        return onInterlock(interlockId, operator, InterlockRuntime::endBypass);
    }

    /** Every alarm in rule order. */
    public List<AlarmStatus> alarms() {
        List<AlarmStatus> result = new ArrayList<>(core.alarms.size());
        for (AlarmRuntime alarm : core.alarms.values()) {
            result.add(alarm.status());
        }
        return result;
    }

    public Optional<AlarmStatus> alarm(String alarmId) {
        return Optional.ofNullable(core.alarms.get(alarmId)).map(AlarmRuntime::status);
    }

    /** Every interlock in rule-set order. */
    public List<InterlockStatus> interlocks() {
        List<InterlockStatus> result = new ArrayList<>(core.interlocks.size());
        for (InterlockRuntime interlock : core.interlocks.values()) {
            result.add(interlock.status());
        }
        return result;
    }

    /** Every fill controller in rule-set order. */
    public List<FillStatus> fills() {
        List<FillStatus> result = new ArrayList<>(core.fills.size());
        for (FillController fill : core.fills.values()) {
            result.add(fill.status());
        }
        return result;
    }

    public Optional<FillStatus> fill(String fillId) {
        return Optional.ofNullable(core.fills.get(fillId)).map(FillController::status);
    }

    /** The alarm flood in progress, if any: the event that started it. */
    public Optional<FloodStarted> flood() {
        return core.flood.current();
    }

    /**
     * The channels that forecast rules publish (hours until the forecast crossing, unit h), in rule order; read
     * their values with {@link #latest(String)} like any derived channel.
     */
    public List<String> forecastChannels() {
        return List.copyOf(core.forecasts.keySet());
    }

    /** The latest reading of a measured, derived or forecast channel, as the rules saw it. */
    public Optional<Reading> latest(String channelId) {
        return Optional.ofNullable(core.channels.get(channelId)).map(channel -> channel.latest);
    }

    /** One alarm's part of {@link #snapshot()}: what a journal keeps of it after it changed. */
    public Optional<EngineSnapshot.AlarmRecord> alarmRecord(String alarmId) {
        return Optional.ofNullable(core.alarms.get(alarmId)).map(AlarmRuntime::record);
    }

    /** One interlock's part of {@link #snapshot()}. */
    public Optional<EngineSnapshot.InterlockRecord> interlockRecord(String interlockId) {
        return Optional.ofNullable(core.interlocks.get(interlockId)).map(InterlockRuntime::record);
    }

    /** One fill controller's part of {@link #snapshot()}. */
    public Optional<EngineSnapshot.FillRecord> fillRecord(String fillId) {
        return Optional.ofNullable(core.fills.get(fillId)).map(FillController::record);
    }

    /**
     * What must survive a restart: every alarm's lifecycle facts, every interlock's trip and bypass, every fill's
     * lockout. An alarm flood in progress is not kept: after a restart the count starts afresh.
     */
    public EngineSnapshot snapshot() {
        List<EngineSnapshot.AlarmRecord> alarms = new ArrayList<>(core.alarms.size());
        for (AlarmRuntime alarm : core.alarms.values()) {
            alarms.add(alarm.record());
        }
        List<EngineSnapshot.InterlockRecord> interlocks = new ArrayList<>(core.interlocks.size());
        for (InterlockRuntime interlock : core.interlocks.values()) {
            interlocks.add(interlock.record());
        }
        List<EngineSnapshot.FillRecord> fills = new ArrayList<>(core.fills.size());
        for (FillController fill : core.fills.values()) {
            fills.add(fill.record());
        }
        return new EngineSnapshot(core.time.wallNow(), alarms, interlocks, fills);
    }

    /**
     * Brings back the state of a snapshot into a freshly built engine, before its first reading, tick or command:
     * alarm states (unacknowledged alarms stay unacknowledged), latched trips and bypasses. A shelving or bypass
     * never lasts longer than intended: the shorter of its remaining time and its wall-clock expiry is kept, and one
     * that ran out while the daemon was down expires at the first tick. A fill's lockout survives; every fill valve
     * is closed (its safe value) whatever it was doing, and stays closed until its controller decides again from
     * the next GOOD level reading, since nobody knows how long it was open while the daemon was down. Emits no
     * alarm transitions.
     *
     * @return the output commands that re-assert tripped interlocks and close every fill valve (with a
     *         {@link FillStopped} of reason {@link FillStopReason#RESTART} before the command of a valve that was
     *         open), and notes on snapshot entries that no longer match the configuration
     * @throws IllegalStateException after the engine has processed anything
     */
    public RestoreResult restore(EngineSnapshot snapshot) {
        if (core.started) {
            throw new IllegalStateException("restore must come before the engine's first reading, tick or command");
        }
        core.now = core.time.monotonicNanos();
        core.wall = core.time.wallNow();
        List<String> notes = new ArrayList<>();
        List<EngineEvent> events = new ArrayList<>();
        Map<String, EngineSnapshot.AlarmRecord> restored = new java.util.LinkedHashMap<>();
        for (EngineSnapshot.AlarmRecord record : snapshot.alarms()) {
            AlarmRuntime alarm = core.alarms.get(record.id());
            if (alarm == null) {
                notes.add("alarm " + record.id() + " is no longer in the rule set; its state ("
                        + record.state().wire() + ") was dropped");
                continue;
            }
            alarm.restore(record);
            restored.put(record.id(), record);
        }
        for (EngineSnapshot.AlarmRecord record : restored.values()) {
            AlarmState state = core.alarms.get(record.id()).settleAfterRestore(record.since());
            if (state != record.state()) {
                notes.add("alarm " + record.id() + " was " + record.state().wire() + " and is now " + state.wire());
            }
        }
        for (EngineSnapshot.InterlockRecord record : snapshot.interlocks()) {
            InterlockRuntime interlock = core.interlocks.get(record.id());
            if (interlock == null) {
                notes.add("interlock " + record.id() + " is no longer in the rule set"
                        + (record.tripped() ? "; it was tripped" : ""));
                continue;
            }
            events.addAll(interlock.restore(record));
        }
        Map<String, EngineSnapshot.FillRecord> fillRecords = new java.util.HashMap<>();
        for (EngineSnapshot.FillRecord record : snapshot.fills()) {
            if (!core.fills.containsKey(record.id())) {
                notes.add("fill " + record.id() + " is no longer in the rule set"
                        + (record.lockedOut() ? "; it was locked out" : ""));
                continue;
            }
            fillRecords.put(record.id(), record);
        }
        for (FillController fill : core.fills.values()) {
            EngineSnapshot.FillRecord record = fillRecords.getOrDefault(fill.id,
                    new EngineSnapshot.FillRecord(fill.id, false, core.wall, Optional.empty(), false));
            events.addAll(fill.restore(record));
        }
        return new RestoreResult(events, notes);
    }

    private CommandResult onAlarm(String alarmId, String operator, Command<AlarmRuntime> action) {
        return command(operator, who -> {
            AlarmRuntime alarm = core.alarms.get(alarmId);
            if (alarm == null) {
                return "there is no alarm '" + alarmId + "'" + Suggestion.didYouMean(alarmId, core.alarms.keySet());
            }
            return action.apply(alarm, who);
        });
    }

    private CommandResult onInterlock(String interlockId, String operator, Command<InterlockRuntime> action) {
        return command(operator, who -> {
            InterlockRuntime interlock = core.interlocks.get(interlockId);
            if (interlock == null) {
                return "there is no interlock '" + interlockId + "'"
                        + Suggestion.didYouMean(interlockId, core.interlocks.keySet());
            }
            return action.apply(interlock, who);
        });
    }

    private CommandResult command(String operator, Function<String, String> action) {
        core.begin();
        String refusal;
        if (operator == null || operator.isBlank()) {
            refusal = "an operator name is required: say who is acting";
        } else {
            refusal = action.apply(operator.strip());
        }
        List<EngineEvent> events = core.finish();
        return refusal == null ? CommandResult.ok(events) : CommandResult.refused(refusal, events);
    }

    @FunctionalInterface
    private interface Command<T> {
        /** Null when done, else the refusal. */
        String apply(T target, String operator);
    }
}
