package org.cryowarden.rules.engine;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.model.AlarmOptions;
import org.cryowarden.rules.model.Priority;

/**
 * One alarm: the on/off-delay filter between its rule's condition and the alarm, and the ISA-18.2 lifecycle.
 *
 * <p>The state is a function of a few facts: out of service, shelved, suppressed by design (any alarm named in
 * {@code suppressWhile} active), condition active, acknowledgement awaited, latching. Every change of the state
 * is emitted as an {@link AlarmTransition}. After shelving, suppression or out of service the alarm is judged
 * afresh: active means unacknowledged again, clear means normal. Shelving, suppression and out of service silence
 * the annunciation only: an interlock this alarm trips still trips (bypass the interlock to stop that).
 */
final class AlarmRuntime {

    private static final AlarmRuntime[] NONE = new AlarmRuntime[0];

    private final Core core;
    final String id;
    final Priority priority;
    final String message;
    final AlarmOptions options;
    private final boolean latching;
    private final long onDelayNanos;
    private final long offDelayNanos;
    /** The delay endings of causes, written at the first expiry of a delay. */
    private String heldText;
    private String clearText;
    InterlockRuntime trips;
    AlarmRuntime[] suppressors = NONE;
    final List<AlarmRuntime> suppresses = new ArrayList<>();
    /** Fill controllers that must not fill while this alarm is active. */
    final List<FillController> blocksFills = new ArrayList<>();
    RuleEvaluator evaluator;

    /** The condition after the on- and off-delays: the alarm is active. */
    boolean active;
    private Reading trigger;
    String rawCause = "";
    private final Timer delay = new Timer() {
        @Override
        void expire() {
            delayExpired();
        }
    };

    private boolean unacknowledged;
    private boolean overridden;
    private boolean outOfService;
    private String outOfServiceBy;
    private String outOfServiceReason = "";
    private boolean shelved;
    private long shelvedUntil;
    private Instant shelvedUntilWall;
    private String shelvedBy;
    private String shelveReason = "";
    private Duration shelveDuration;
    private final Timer shelveTimer = new Timer() {
        @Override
        void expire() {
            shelveExpired();
        }
    };
    private String acknowledgedBy;
    private String acknowledgeNote = "";

    AlarmState state = AlarmState.NORMAL;
    Instant since;

    AlarmRuntime(Core core, String id, AlarmOptions options) {
        this.core = core;
        this.id = id;
        this.options = options;
        this.priority = options.priority();
        this.message = options.message();
        this.latching = options.latching();
        this.onDelayNanos = options.onDelay().toNanos();
        this.offDelayNanos = options.offDelay().toNanos();
        this.since = core.wall;
    }

    /** The rule's condition now, as its evaluator holds it. */
    boolean raw() {
        return evaluator.raw;
    }

    /** The rule's condition changed; starts or cancels the delay that applies. */
    void conditionChanged(boolean value, Reading reading, String cause) {
        trigger = reading;
        rawCause = cause;
        if (value == active) {
            core.timers.cancel(delay);
            return;
        }
        long wait = value ? onDelayNanos : offDelayNanos;
        if (wait == 0) {
            setActive(value, reading, cause);
        } else {
            core.timers.schedule(delay, core.now + wait);
        }
    }

    private void delayExpired() {
        boolean raw = evaluator.raw;
        if (heldText == null) {
            heldText = ", held for the on-delay of " + Texts.nanos(onDelayNanos);
            clearText = ", clear for the off-delay of " + Texts.nanos(offDelayNanos);
        }
        setActive(raw, trigger, rawCause + (raw ? heldText : clearText));
    }

    private void setActive(boolean value, Reading reading, String cause) {
        active = value;
        if (value && !overridden) {
            unacknowledged = true;
            acknowledgedBy = null;
            acknowledgeNote = "";
        }
        refresh(reading, cause, null, "");
        if (value && !overridden) {
            core.flood.activated(this);
        }
        if (value && trips != null) {
            trips.causeActivated(this, cause);
        }
        if (value) {
            for (FillController fill : blocksFills) {
                fill.blockerActivated(this);
            }
        }
        for (AlarmRuntime dependent : suppresses) {
            dependent.refresh(null, value
                    ? "suppressed by design while " + id + " is active"
                    : "suppression by design ended: " + id + " is no longer active", null, "");
        }
    }

    /** Recomputes the state and emits a transition when it changed. */
    void refresh(Reading reading, String cause, String operator, String note) {
        boolean nowOverridden = outOfService || shelved || suppressed();
        if (overridden && !nowOverridden) {
            unacknowledged = active;
            acknowledgedBy = null;
            acknowledgeNote = "";
        }
        overridden = nowOverridden;
        AlarmState next = computeState();
        if (next == state) {
            return;
        }
        AlarmState from = state;
        state = next;
        since = core.wall;
        core.emit(new AlarmTransition(core.wall, id, from, next, priority, message, Optional.ofNullable(reading),
                Optional.ofNullable(operator), note, cause));
    }

    private AlarmState computeState() {
        if (outOfService) {
            return AlarmState.OUT_OF_SERVICE;
        }
        if (shelved) {
            return AlarmState.SHELVED;
        }
        if (suppressed()) {
            return AlarmState.SUPPRESSED;
        }
        if (active) {
            return unacknowledged ? AlarmState.UNACKNOWLEDGED : AlarmState.ACKNOWLEDGED;
        }
        if (unacknowledged) {
            return latching ? AlarmState.UNACKNOWLEDGED : AlarmState.RETURNED_UNACKNOWLEDGED;
        }
        return AlarmState.NORMAL;
    }

    private boolean suppressed() {
        for (AlarmRuntime suppressor : suppressors) {
            if (suppressor.active) {
                return true;
            }
        }
        return false;
    }

    private String activeSuppressor() {
        for (AlarmRuntime suppressor : suppressors) {
            if (suppressor.active) {
                return suppressor.id;
            }
        }
        return "?";
    }

    // Operator commands: each returns null when done, else the refusal an operator reads.

    String acknowledge(String operator, String note) {
        if (!state.awaitsAcknowledgement()) {
            switch (state) {
                case NORMAL:
                    return "alarm " + id + " is normal: there is nothing to acknowledge";
                case ACKNOWLEDGED:
                    return "alarm " + id + " is already acknowledged by " + acknowledgedBy;
                case SHELVED:
                    return "alarm " + id + " is shelved until " + shelvedUntilWall + ": unshelve it first";
                case SUPPRESSED:
                    return "alarm " + id + " is suppressed by design while " + activeSuppressor()
                            + " is active: there is nothing to acknowledge";
                default:
                    return "alarm " + id + " is out of service: return it to service first";
            }
        }
        unacknowledged = false;
        acknowledgedBy = operator;
        acknowledgeNote = note;
        refresh(null, "acknowledged by " + operator, operator, note);
        return null;
    }

    String shelve(String operator, Duration duration, String reason) {
        if (outOfService) {
            return "alarm " + id + " is out of service: only an alarm in service can be shelved";
        }
        if (shelved) {
            return "alarm " + id + " is already shelved by " + shelvedBy + " until " + shelvedUntilWall
                    + ": unshelve it first to shelve it again";
        }
        if (duration.isZero() || duration.isNegative()) {
            return "shelving needs a positive duration, got " + Texts.duration(duration);
        }
        if (reason.isBlank()) {
            return "shelving needs a reason the next operator can read";
        }
        startShelving(operator, reason.strip(), duration, duration);
        refresh(null, "shelved by " + operator + " for " + Texts.duration(duration) + " until " + shelvedUntilWall,
                operator, shelveReason);
        return null;
    }

    private void startShelving(String operator, String reason, Duration duration, Duration remaining) {
        shelved = true;
        shelvedBy = operator;
        shelveReason = reason;
        shelveDuration = duration;
        shelvedUntil = core.now + remaining.toNanos();
        shelvedUntilWall = core.wall.plus(remaining);
        core.timers.schedule(shelveTimer, shelvedUntil);
    }

    private void shelveExpired() {
        shelved = false;
        refresh(null, "shelving by " + shelvedBy + " expired after " + Texts.duration(shelveDuration), null, "");
    }

    String unshelve(String operator) {
        if (!shelved) {
            return "alarm " + id + " is not shelved";
        }
        core.timers.cancel(shelveTimer);
        shelved = false;
        refresh(null, "unshelved by " + operator, operator, "");
        return null;
    }

    String removeFromService(String operator, String reason) {
        if (outOfService) {
            return "alarm " + id + " is already out of service (removed by " + outOfServiceBy + ")";
        }
        if (reason.isBlank()) {
            return "removing an alarm from service needs a reason the next operator can read";
        }
        if (shelved) {
            core.timers.cancel(shelveTimer);
            shelved = false;
        }
        outOfService = true;
        outOfServiceBy = operator;
        outOfServiceReason = reason.strip();
        refresh(null, "removed from service by " + operator, operator, outOfServiceReason);
        return null;
    }

    String returnToService(String operator) {
        if (!outOfService) {
            return "alarm " + id + " is in service";
        }
        outOfService = false;
        outOfServiceBy = null;
        outOfServiceReason = "";
        refresh(null, "returned to service by " + operator, operator, "");
        return null;
    }

    // Status, snapshot and restore.

    Optional<Shelving> shelving() {
        if (!shelved) {
            return Optional.empty();
        }
        long remaining = Math.max(0, shelvedUntil - core.time.monotonicNanos());
        return Optional.of(new Shelving(shelvedBy, shelveReason, shelvedUntilWall, Duration.ofNanos(remaining)));
    }

    private Optional<Reading> lastReading() {
        ChannelNode node = evaluator.lastNode();
        return node == null ? Optional.empty() : Optional.ofNullable(node.latest);
    }

    AlarmStatus status() {
        return new AlarmStatus(id, state, priority, message, since, active, lastReading(),
                Optional.ofNullable(acknowledgedBy), shelving());
    }

    EngineSnapshot.AlarmRecord record() {
        return new EngineSnapshot.AlarmRecord(id, state, since, active, unacknowledged,
                Optional.ofNullable(acknowledgedBy), acknowledgeNote, shelving(), Optional.ofNullable(outOfServiceBy),
                outOfServiceReason);
    }

    /** Takes the facts back from a snapshot; the state is recomputed by {@link #settleAfterRestore()}. */
    void restore(EngineSnapshot.AlarmRecord record) {
        evaluator.raw = record.conditionActive();
        evaluator.neverQuiet();
        active = record.conditionActive();
        rawCause = active ? "active before the restart" : "";
        unacknowledged = record.unacknowledged();
        acknowledgedBy = record.acknowledgedBy().orElse(null);
        acknowledgeNote = record.acknowledgeNote();
        outOfService = record.outOfServiceBy().isPresent();
        outOfServiceBy = record.outOfServiceBy().orElse(null);
        outOfServiceReason = record.outOfServiceReason();
        if (record.shelving().isPresent()) {
            Shelving shelving = record.shelving().get();
            // Never longer than intended: the smaller of the remaining time and what the wall clock says is left.
            Duration byWall = Duration.between(core.wall, shelving.until());
            Duration remaining = byWall.compareTo(shelving.remaining()) < 0 ? byWall : shelving.remaining();
            if (remaining.isNegative()) {
                remaining = Duration.ZERO;
            }
            startShelving(shelving.operator(), shelving.reason(), remaining, remaining);
            shelvedUntilWall = shelving.until().isBefore(shelvedUntilWall) ? shelving.until() : shelvedUntilWall;
        }
        since = record.since();
        if (active) {
            evaluator.restoredActive();
        }
    }

    /** After every alarm is restored (suppression depends on others), settles the state without emitting. */
    AlarmState settleAfterRestore(Instant restoredSince) {
        overridden = outOfService || shelved || suppressed();
        state = computeState();
        since = restoredSince;
        return state;
    }
}
