package org.cryowarden.daemon.replay;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.Iterator;
import java.util.List;
import java.util.Objects;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.engine.CommandResult;
import org.cryowarden.rules.engine.Engine;
import org.cryowarden.rules.engine.EngineConfig;
import org.cryowarden.rules.engine.EngineEvent;

/**
 * Feeds recorded readings and operator actions through a fresh {@link Engine} on a {@link VirtualTimeSource}, so
 * that a past night can be run again, with the rules that ran or with changed ones, in a fraction of its time.
 *
 * <p>The clock starts at {@code start} and is moved to each input's instant. Ticks come every {@code tickPeriod}
 * from {@code start}, as the daemon's engine loop gives them, so on-delays, off-delays, stale timeouts and shelving
 * expiry fire at the tick where they fired live. At one instant the order is, by {@link Order}: the tick, then the
 * readings (in the order of the stream), then the operator actions (in the order given); or, as the daemon's engine
 * loop takes its work, the operator actions, then the readings, then the tick. The run ends at {@code until}: the last
 * tick is the last one at or before it, and readings or actions after it are not fed. Single-threaded; one run per
 * instance.
 */
public final class Replay {

    /** What comes first at one instant. */
    public enum Order {
        /** Tick, readings, actions. */
        TICK_FIRST,
        /** Actions, readings, tick: the daemon's engine loop (commands and readings waiting, then the timers). */
        TICK_LAST
    }

    private final EngineConfig config;
    private final Order order;
    private final Instant start;
    private final Duration tickPeriod;

    /**
     * @throws IllegalArgumentException when the tick period is not positive
     */
    public Replay(EngineConfig config, Instant start, Duration tickPeriod) {
        this(config, start, tickPeriod, Order.TICK_FIRST);
    }

    /**
     * @throws IllegalArgumentException when the tick period is not positive
     */
    public Replay(EngineConfig config, Instant start, Duration tickPeriod, Order order) {
        this.order = Objects.requireNonNull(order, "order");
        this.config = Objects.requireNonNull(config, "config");
        this.start = Objects.requireNonNull(start, "start");
        this.tickPeriod = Objects.requireNonNull(tickPeriod, "tickPeriod");
        if (tickPeriod.isNegative() || tickPeriod.isZero()) {
            throw new IllegalArgumentException("the tick period must be positive, got " + tickPeriod);
        }
    }

    /**
     * Runs the replay.
     *
     * @param readings in time order (e.g. {@link org.cryowarden.daemon.history.MergedReadings})
     * @param actions  any order; sorted by instant, keeping the given order at equal instants
     * @throws IllegalArgumentException when a reading is earlier than {@code start} or than the one before it, or
     *                                  is of a channel the configuration does not measure
     */
    public ReplayResult run(Iterator<Reading> readings, List<? extends OperatorAction> actions, Instant until) {
        VirtualTimeSource clock = new VirtualTimeSource(start);
        Engine engine = new Engine(config, clock);
        List<OperatorAction> pendingActions = new ArrayList<>(actions);
        pendingActions.sort(Comparator.comparing(OperatorAction::instant));
        List<EngineEvent> events = new ArrayList<>();
        List<String> refusals = new ArrayList<>();
        long fed = 0;
        long ticks = 0;
        int nextAction = 0;
        Instant nextTick = start;
        Reading reading = readings.hasNext() ? readings.next() : null;
        Instant now = start;
        while (true) {
            Instant readingAt = reading == null || reading.timestamp().isAfter(until) ? null : reading.timestamp();
            Instant actionAt = nextAction < pendingActions.size()
                    && !pendingActions.get(nextAction).instant().isAfter(until)
                    ? pendingActions.get(nextAction).instant() : null;
            Instant tickAt = nextTick.isAfter(until) ? null : nextTick;
            boolean tickLast = order == Order.TICK_LAST;
            if (tickAt != null && (readingAt == null || (tickLast ? tickAt.isBefore(readingAt)
                    : !readingAt.isBefore(tickAt)))
                    && (actionAt == null || (tickLast ? tickAt.isBefore(actionAt) : !actionAt.isBefore(tickAt)))) {
                now = advance(clock, now, tickAt);
                events.addAll(engine.tick());
                ticks++;
                nextTick = nextTick.plus(tickPeriod);
            } else if (readingAt != null && (actionAt == null
                    || (tickLast ? actionAt.isAfter(readingAt) : !actionAt.isBefore(readingAt)))) {
                if (readingAt.isBefore(now)) {
                    throw new IllegalArgumentException("reading of " + reading.channel() + " at " + readingAt
                            + " is earlier than the replay's clock at " + now
                            + ": a replay needs its readings in time order, from its start");
                }
                now = advance(clock, now, readingAt);
                events.addAll(engine.onReading(reading));
                fed++;
                reading = readings.hasNext() ? readings.next() : null;
            } else if (actionAt != null) {
                OperatorAction action = pendingActions.get(nextAction++);
                if (actionAt.isBefore(now)) {
                    refusals.add(actionAt + " " + describe(action) + ": before the start of the replay at " + start);
                    continue;
                }
                now = advance(clock, now, actionAt);
                CommandResult result = action.applyTo(engine);
                events.addAll(result.events());
                result.refusal().ifPresent(reason -> refusals.add(actionAt + " " + describe(action) + ": " + reason));
            } else {
                break;
            }
        }
        return new ReplayResult(events, fed, ticks, refusals);
    }

    private static Instant advance(VirtualTimeSource clock, Instant now, Instant to) {
        if (to.isAfter(now)) {
            clock.advance(Duration.between(now, to));
            return to;
        }
        return now;
    }

    private static String describe(OperatorAction action) {
        String kind = action.getClass().getSimpleName();
        return kind.substring(0, 1).toLowerCase(java.util.Locale.ROOT) + kind.substring(1) + " " + action.target()
                + " by " + action.operator();
    }
}
