package org.cryowarden.daemon.replay;

import java.time.Duration;
import java.time.Instant;
import java.time.temporal.ChronoUnit;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Optional;
import java.util.Set;
import org.cryowarden.daemon.journal.HistoryTable;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.engine.EngineConfig;
import org.cryowarden.rules.model.BusDef;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.FillDef;
import org.cryowarden.rules.model.InstrumentDef;
import org.cryowarden.rules.model.PointDef;
import org.cryowarden.rules.model.RuleSet;
import org.cryowarden.rules.model.SiteDef;

/**
 * A past period of a journal run again through a (possibly changed) rule set: the stored readings and accepted
 * operator commands through a fresh engine on a virtual clock with the daemon's tick grid, compared with the alarm
 * transitions the journal recorded, and analysed for nuisance alarms.
 *
 * <p>The replay starts from a fresh engine, as the daemon does on a new journal: replaying from the start of a run
 * reproduces it exactly; a replay from the middle of a run ({@code since}) starts with every alarm normal. The
 * ticks lie on the recorded run's grid ({@code daemon.started} plus whole tick periods).
 */
public final class JournalReplay {

    /** Where and how to replay. Empty {@code since}/{@code until}: the start of the run, the end of the history. */
    public record Request(Optional<Instant> since, Optional<Instant> until, Optional<Duration> tick,
                          AnalysisSettings analysis) {
    }

    /**
     * What a replay found.
     *
     * @param identical  whether the replay produced the recorded alarm transitions exactly: same order, same instants
     * @param recorded   the journaled alarm transitions of the period
     * @param replayed   those of the replay
     * @param recordedActions how many journaled operator commands were given to the replay
 * @param elapsed    the real time the replay took
     */
    public record Report(Instant from, Instant until, Duration tick, ReplayResult result, List<AlarmChange> recorded,
                         List<AlarmChange> replayed, boolean identical, ReplayComparison comparison,
                         AlarmAnalysis analysis, AlarmAnalysis recordedAnalysis, int recordedActions,
                         Duration elapsed) {
    }

    private JournalReplay() {
    }

    /**
     * Runs the replay.
     *
     * @throws IllegalArgumentException with a message for the operator when the journal holds no history in the
     *                                  period, or the period is empty
     */
    public static Report run(Journal journal, SiteDef site, RuleSet rules, Request request) throws JournalException {
        HistoryTable.Span span = journal.history().span().orElseThrow(() -> new IllegalArgumentException(
                "journal " + journal.file() + " holds no raw history (it was written before raw history was kept,"
                        + " or all of it is older than the history retention)"));
        JournalHistory history = new JournalHistory(journal);
        Instant since = request.since().orElse(span.first());
        Optional<JournalHistory.Run> run = history.runAt(since);
        Duration tick = request.tick().orElse(run.map(JournalHistory.Run::tickPeriod).orElse(Duration.ofMillis(100)));
        Instant anchor = run.map(JournalHistory.Run::started).orElse(span.first());
        Instant start = request.since().isPresent() ? onGrid(anchor, tick, since)
                : (anchor.isAfter(span.first()) ? span.first() : anchor);
        Instant until = request.until().orElse(span.last());
        if (!until.isAfter(start)) {
            throw new IllegalArgumentException("nothing to replay: the period from " + start + " to " + until
                    + " is empty (the history runs from " + span.first() + " to " + span.last() + ")");
        }
        EngineConfig config = EngineConfig.of(site, rules);
        Set<String> fills = new LinkedHashSet<>();
        for (FillDef fill : rules.fills()) {
            fills.add(fill.id());
        }
        Iterator<Reading> readings = history.readings(pollOrder(site), start, until);
        List<OperatorAction> actions = history.actions(start, until, fills);
        List<AlarmChange> recorded = history.alarmChanges(start, until);
        long began = System.nanoTime();
        ReplayResult result = new Replay(config, start, tick, Replay.Order.TICK_LAST).run(readings, actions, until);
        Duration elapsed = Duration.ofNanos(System.nanoTime() - began);
        List<AlarmChange> replayed = new ArrayList<>();
        for (AlarmChange change : result.alarmChanges()) {
            // the journal keeps event instants in milliseconds
            replayed.add(new AlarmChange(change.instant().truncatedTo(ChronoUnit.MILLIS), change.alarmId(),
                    change.from(), change.to(), change.priority()));
        }
        return new Report(start, until, tick, result, recorded, replayed, recorded.equals(replayed),
                ReplayComparison.of(recorded, replayed, until),
                AlarmAnalysis.of(replayed, start, until, request.analysis()),
                AlarmAnalysis.of(recorded, start, until, request.analysis()), actions.size(), elapsed);
    }

    /** The measured channels in the order the daemon polls them: bus, instrument, point; then any others. */
    static List<String> pollOrder(SiteDef site) {
        Set<String> measured = new LinkedHashSet<>();
        site.channels().forEach(c -> measured.add(c.id()));
        Set<String> order = new LinkedHashSet<>();
        for (BusDef bus : site.buses()) {
            for (InstrumentDef instrument : bus.instruments()) {
                for (PointDef point : instrument.points()) {
                    if (!point.output() && measured.contains(point.channel())) {
                        order.add(point.channel());
                    }
                }
            }
        }
        for (ChannelDef channel : site.channels()) {
            order.add(channel.id());
        }
        return List.copyOf(order);
    }

    private static Instant onGrid(Instant anchor, Duration tick, Instant at) {
        if (!at.isAfter(anchor)) {
            return at;
        }
        long periods = (Duration.between(anchor, at).toNanos() + tick.toNanos() - 1) / tick.toNanos();
        return anchor.plus(tick.multipliedBy(periods));
    }
}
