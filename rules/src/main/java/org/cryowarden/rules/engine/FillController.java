package org.cryowarden.rules.engine;

import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.FillDef;

/**
 * One automatic fill (a nitrogen dewar or cold trap): opens the valve below the start level, closes it at the stop
 * level. Fail-safe on everything else: the valve closes when a blocking alarm activates, when the level reading is
 * not GOOD, when the level rose less than the minimum within a rise window (supply dewar empty, valve stuck), and
 * when it has been open for the maximum time; the last two lock the fill out and raise its fault alarm (the
 * condition of this evaluator) until an operator resets it. Rise windows run back to back from the opening, on
 * the monotonic clock; the first one also has to cover the cool-down of the transfer line.
 */
final class FillController extends RuleEvaluator {

    private final Core core;
    final FillDef def;
    final String id;
    private final Unit unit;
    private final double startBelow;
    private final double stopAbove;
    private final double minRise;
    private final double closedValue;
    private final long maxOpenNanos;
    private final long riseWindowNanos;
    AlarmRuntime[] blockers = new AlarmRuntime[0];

    FillState state = FillState.IDLE;
    private Instant since;
    private String lockout;
    private Reading latestGood;
    private long openedAt;
    private double windowStartLevel;
    private final Timer maxOpen = new Timer() {
        @Override
        void expire() {
            if (state == FillState.FILLING) {
                close(FillStopReason.MAX_OPEN_TIME, "open for the maximum of " + Texts.nanos(maxOpenNanos)
                        + " without reaching " + Texts.quantity(stopAbove, unit) + "; check the supply and the valve");
            }
        }
    };
    private final Timer riseCheck = new Timer() {
        @Override
        void expire() {
            checkRise();
        }
    };

    FillController(AlarmRuntime alarm, Core core, FillDef def, Unit unit, double startBelow, double stopAbove,
            double minRise, double closedValue) {
        super(alarm);
        this.core = core;
        this.def = def;
        this.id = def.id();
        this.unit = unit;
        this.startBelow = startBelow;
        this.stopAbove = stopAbove;
        this.minRise = minRise;
        this.closedValue = closedValue;
        this.maxOpenNanos = def.maxOpen().toNanos();
        this.riseWindowNanos = def.riseWindow().toNanos();
        this.since = core.wall;
    }

    @Override
    void onReading(ChannelNode node, Reading reading) {
        if (reading.quality() != Quality.GOOD) {
            if (state == FillState.FILLING) {
                close(FillStopReason.LEVEL_UNUSABLE, "level reading not GOOD: " + Texts.reading(reading));
            }
            return;
        }
        latestGood = reading;
        double level = reading.value();
        if (state == FillState.FILLING) {
            if (level >= stopAbove) {
                close(FillStopReason.STOP_LEVEL, Texts.reading(reading) + " reached the stop level of "
                        + Texts.quantity(stopAbove, unit));
            }
        } else if (state == FillState.IDLE && level < startBelow && activeBlocker() == null) {
            open(reading);
        }
    }

    /** A blocking alarm became active: a running fill stops at once. */
    void blockerActivated(AlarmRuntime blocker) {
        if (state == FillState.FILLING) {
            close(FillStopReason.BLOCKED, "alarm " + blocker.id + " is active (" + blocker.rawCause + ")");
        }
    }

    private void open(Reading level) {
        state = FillState.FILLING;
        since = core.wall;
        openedAt = core.now;
        windowStartLevel = level.value();
        core.timers.schedule(maxOpen, openedAt + maxOpenNanos);
        core.timers.schedule(riseCheck, openedAt + riseWindowNanos);
        OutputCommand command = new OutputCommand(core.wall, def.valve(), def.openValue(), id,
                "fill " + id + " opened: " + Texts.reading(level) + " below " + Texts.quantity(startBelow, unit));
        core.emit(new FillStarted(core.wall, id, def.valve(), level, command, "fill started: " + Texts.reading(level)
                + " below the start level of " + Texts.quantity(startBelow, unit)));
        core.emit(command);
    }

    private void checkRise() {
        if (state != FillState.FILLING) {
            return;
        }
        double now = latestGood == null ? windowStartLevel : latestGood.value();
        double rise = now - windowStartLevel;
        if (rise < minRise) {
            close(FillStopReason.NO_RISE, "level rose " + Texts.quantity(rise, unit) + " in "
                    + Texts.nanos(riseWindowNanos) + ", less than " + Texts.quantity(minRise, unit)
                    + ": supply empty or valve stuck");
            return;
        }
        windowStartLevel = now;
        core.timers.schedule(riseCheck, core.now + riseWindowNanos);
    }

    private void close(FillStopReason reason, String why) {
        core.timers.cancel(maxOpen);
        core.timers.cancel(riseCheck);
        boolean locks = reason.locksOut();
        state = locks ? FillState.LOCKED_OUT : FillState.IDLE;
        since = core.wall;
        OutputCommand command = new OutputCommand(core.wall, def.valve(), closedValue, id,
                "fill " + id + " closed (" + reason.wire() + ")");
        String cause = "fill stopped (" + reason.wire() + "): " + why + (locks ? "; locked out until reset" : "");
        core.emit(new FillStopped(core.wall, id, def.valve(), reason, locks, Optional.ofNullable(lastReading()),
                command, cause));
        core.emit(command);
        if (locks) {
            lockout = cause;
            change(true, null, cause);
        }
    }

    private Reading lastReading() {
        ChannelNode node = lastNode();
        return node == null ? null : node.latest;
    }

    String reset(String operator) {
        if (state != FillState.LOCKED_OUT) {
            return "fill " + id + " is " + state.wire() + ", not locked out: there is nothing to reset";
        }
        state = FillState.IDLE;
        since = core.wall;
        lockout = null;
        core.emit(new FillReset(core.wall, id, operator, "lockout of fill " + id + " reset by " + operator
                + "; the next level reading decides"));
        change(false, null, "fill " + id + " reset by " + operator);
        return null;
    }

    private AlarmRuntime activeBlocker() {
        for (AlarmRuntime blocker : blockers) {
            if (blocker.active) {
                return blocker;
            }
        }
        return null;
    }

    FillStatus status() {
        List<String> active = new ArrayList<>();
        for (AlarmRuntime blocker : blockers) {
            if (blocker.active) {
                active.add(blocker.id);
            }
        }
        return new FillStatus(id, def.channel(), def.valve(), state, since, Optional.ofNullable(lockout), active);
    }

    EngineSnapshot.FillRecord record() {
        return new EngineSnapshot.FillRecord(id, state == FillState.LOCKED_OUT, since, Optional.ofNullable(lockout),
                state == FillState.FILLING);
    }

    /**
     * Takes back a lockout. Whatever the valve was doing, it is closed now and stays closed until the controller
     * decides again from the next GOOD level reading: after a restart nobody knows how long it was open.
     */
    List<EngineEvent> restore(EngineSnapshot.FillRecord record) {
        List<EngineEvent> events = new ArrayList<>();
        if (record.lockedOut()) {
            state = FillState.LOCKED_OUT;
            since = record.since();
            lockout = record.lockout().orElse("locked out before the restart");
            raw = true;
        }
        OutputCommand command = new OutputCommand(core.wall, def.valve(), closedValue, id, "fill " + id
                + ": valve closed after the restart until the controller decides again");
        if (record.valveOpen()) {
            events.add(new FillStopped(core.wall, id, def.valve(), FillStopReason.RESTART, false, Optional.empty(),
                    command, "fill stopped (restart): the valve was open when the engine stopped; closed until "
                    + "the next level reading decides"));
        }
        events.add(command);
        return events;
    }

    @Override
    void restoredActive() {
        // The fault condition is the lockout, which FillController#restore takes back from its own record.
    }
}
