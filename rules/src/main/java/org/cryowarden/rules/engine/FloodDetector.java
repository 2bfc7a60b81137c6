package org.cryowarden.rules.engine;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.model.FloodDef;

/**
 * Alarm flood detection over a sliding window on the engine's monotonic clock. The default criterion is the
 * EEMUA 191 benchmark (EEMUA Publication 191, Alarm systems: a guide to design, management and procurement):
 * more than 10 alarms in 10 minutes is more than one operator can handle; the flood ends, as ANSI/ISA-18.2-2016
 * guidance has it, when fewer than 5 activated in the last 10 minutes. An activation is an alarm becoming active
 * while annunciated (not shelved, suppressed by design or out of service): what an operator is shown.
 *
 * <p>Constant work per activation; the window's activations are kept in order, and while a flood lasts a timer
 * checks the end criterion as each activation ages out of the window.
 */
final class FloodDetector {

    private record Activation(long at, Instant wall, String alarm) {
    }

    private final Core core;
    private final FloodDef def;
    private final long windowNanos;
    private final ArrayDeque<Activation> window = new ArrayDeque<>();
    private final Timer ageOut = new Timer() {
        @Override
        void expire() {
            checkEnd();
        }
    };

    private FloodStarted flood;
    private long floodFirstAt;
    private int floodActivations;

    FloodDetector(Core core, FloodDef def) {
        this.core = core;
        this.def = def;
        this.windowNanos = def.within().toNanos();
    }

    /** An annunciated alarm activation, at the call's monotonic time. */
    void activated(AlarmRuntime alarm) {
        evict();
        window.addLast(new Activation(core.now, core.wall, alarm.id));
        if (flood != null) {
            floodActivations++;
            return;
        }
        if (window.size() > def.moreThan()) {
            Activation first = window.peekFirst();
            List<String> alarms = new ArrayList<>(window.size());
            for (Activation activation : window) {
                alarms.add(activation.alarm());
            }
            floodFirstAt = first.at();
            floodActivations = window.size();
            flood = new FloodStarted(core.wall, window.size(), def.within(), first.alarm(), first.wall(), alarms,
                    "alarm flood: " + window.size() + " alarms within " + Texts.duration(def.within())
                            + ", more than " + def.moreThan() + "; first out " + first.alarm());
            core.emit(flood);
            core.timers.schedule(ageOut, first.at() + windowNanos);
        }
    }

    /** The flood in progress, if any. */
    Optional<FloodStarted> current() {
        return Optional.ofNullable(flood);
    }

    private void evict() {
        long cutoff = core.now - windowNanos;
        while (!window.isEmpty() && window.peekFirst().at() - cutoff <= 0) {
            window.removeFirst();
        }
    }

    private void checkEnd() {
        if (flood == null) {
            return;
        }
        evict();
        if (window.size() < def.endsBelow()) {
            FloodStarted ended = flood;
            flood = null;
            core.emit(new FloodEnded(core.wall, ended.instant(), floodActivations, ended.firstOutAlarm(),
                    Duration.ofNanos(core.now - floodFirstAt), "alarm flood over: " + window.size()
                    + " alarms within the last " + Texts.duration(def.within()) + ", fewer than " + def.endsBelow()
                    + "; " + floodActivations + " alarms since " + ended.firstOutAlarm()));
            return;
        }
        core.timers.schedule(ageOut, window.peekFirst().at() + windowNanos);
    }
}
