package org.cryowarden.rules.engine;

import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.model.OutputDef;

/**
 * The engine's runtime graph and the state of the call in progress: the clock readings every part uses during one
 * call ({@link #now} monotonic, {@link #wall} for timestamps) and the events emitted so far. Single-threaded.
 */
final class Core {

    final TimeSource time;
    final double ambientPa;
    final TimerQueue timers = new TimerQueue();
    final Map<String, MeasuredChannel> measured = new LinkedHashMap<>();
    final Map<String, ChannelNode> channels = new LinkedHashMap<>();
    final Map<String, AlarmRuntime> alarms = new LinkedHashMap<>();
    final Map<String, InterlockRuntime> interlocks = new LinkedHashMap<>();
    final Map<String, OutputDef> outputs = new LinkedHashMap<>();
    final Map<String, FillController> fills = new LinkedHashMap<>();
    /** Channels published by forecast rules, in rule order (also in {@link #channels}). */
    final Map<String, ForecastChannel> forecasts = new LinkedHashMap<>();
    /** Set by {@link Wiring}. */
    FloodDetector flood;
    /** {@link #measured} for the reading path; set by {@link Wiring}. */
    MeasuredIndex measuredIndex;

    /** Monotonic nanoseconds of the call in progress. */
    long now;
    /** Wall-clock instant of the call in progress. */
    Instant wall;
    /** Whether a reading, tick or command has been processed (after which a restore is refused). */
    boolean started;
    private final ArrayList<EngineEvent> events = new ArrayList<>();
    /**
     * Whether rules are skipped inside their quiet bands; false only in tests that hold the bands against
     * evaluating every reading.
     */
    boolean skipQuiet = true;
    /** Readings delivered to channels so far, measured and derived: orders {@link ChannelNode#delivered}. */
    private long deliveries;

    Core(TimeSource time, double ambientPa) {
        this.time = time;
        this.ambientPa = ambientPa;
        this.now = time.monotonicNanos();
        this.wall = time.wallNow();
    }

    /** Starts a call: reads the clock, then expires every timer that fell due since the last call. */
    void begin() {
        now = time.monotonicNanos();
        wall = time.wallNow();
        events.clear();
        started = true;
        if (timers.anyDue(now)) {
            timers.runDue(now);
        }
    }

    /** Ends a call, handing back what it emitted. */
    List<EngineEvent> finish() {
        if (events.isEmpty()) {
            return List.of();
        }
        List<EngineEvent> result = List.copyOf(events);
        events.clear();
        return result;
    }

    void emit(EngineEvent event) {
        events.add(event);
    }

    /**
     * Hands a reading to the rules of its channel, skipping each rule whose quiet band holds a GOOD value, then to
     * the derived channels computed from it.
     */
    void deliver(ChannelNode node, Reading reading) {
        node.latest = reading;
        node.delivered = ++deliveries;
        boolean good = reading.quality() == Quality.GOOD;
        double value = reading.value();
        if (good) {
            node.lastGood = now;
        }
        RuleEvaluator[] rules = node.rules;
        int[] inputs = node.ruleInputs;
        double[] quiet = node.quiet;
        boolean skip = good && skipQuiet;
        for (int i = 0; i < rules.length; i++) {
            if (skip && value > quiet[2 * i] && value < quiet[2 * i + 1]) {
                continue;
            }
            rules[i].onInput(node, inputs[i], reading);
        }
        for (DerivedChannel derived : node.dependents) {
            Reading computed = derived.recompute(reading);
            if (computed != null) {
                deliver(derived, computed);
            }
        }
    }

    /** Whether a tripped interlock other than {@code except} currently drives {@code output}. */
    boolean heldByOtherTrip(String output, InterlockRuntime except) {
        for (InterlockRuntime interlock : interlocks.values()) {
            if (interlock != except && interlock.tripped && interlock.acts(output)) {
                return true;
            }
        }
        return false;
    }

    List<String> alarmIds() {
        return new ArrayList<>(alarms.keySet());
    }
}
