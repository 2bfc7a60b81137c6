package org.cryowarden.daemon.bench;

import java.time.Duration;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.CopyOnWriteArrayList;
import jdk.jfr.consumer.RecordingStream;
import org.cryowarden.daemon.run.PathStage;

/**
 * Where the time of each measured crossing goes: listens to the daemon's {@link PathStage} events in this
 * process (a Flight Recorder stream) and, once the load is over, splits every crossing's latency into its
 * hand-offs, from the device's last byte to the subscriber. Costs the stream's CPU, so it runs only when asked.
 */
final class AlarmPathStages implements AutoCloseable {

    /** The hand-offs, in path order: the name of each interval and the stage that ends it. */
    private static final List<String> STAGES = List.of(PathStage.OFFERED, PathStage.EVALUATED, PathStage.QUEUED,
            PathStage.TAKEN, PathStage.COMMITTED, PathStage.SENT, "arrived");
    private static final List<String> INTERVALS = List.of("transport -> engine inbox (poller, driver)",
            "inbox -> engine evaluated", "evaluated -> queued for the journal", "queued -> journal thread took it",
            "took -> committed", "committed -> outbox handed it to the link", "link -> subscriber (link, broker)");

    /** How far the poller's hand-over may come before the device's send time (both ends of one loopback write). */
    private static final long SEND_SLACK_NANOS = 20_000_000;

    /** One measured crossing: when the device sent it, which alarm it raised, when the subscriber had it. */
    record Crossing(String channel, String alarm, long sentNanos, long arrivedNanos) {
    }

    private final RecordingStream stream = new RecordingStream();
    private final Map<String, List<Long>> marks = new ConcurrentHashMap<>();
    private final Map<Long, Long> sentBySeq = new ConcurrentHashMap<>();
    private final Map<Long, String> seqOf = new ConcurrentHashMap<>();
    private final List<Crossing> crossings = new CopyOnWriteArrayList<>();
    private volatile long newestOffer;

    AlarmPathStages() {
        stream.enable(PathStage.NAME).withoutThreshold().withoutStackTrace();
        stream.onEvent(PathStage.NAME, event -> {
            String stage = event.getString("stage");
            long nanos = event.getLong("nanos");
            long seq = event.getLong("seq");
            if (stage.equals(PathStage.SENT)) {
                sentBySeq.putIfAbsent(seq, nanos);
                return;
            }
            if (stage.equals(PathStage.OFFERED)) {
                newestOffer = Math.max(newestOffer, nanos);
            }
            marks.computeIfAbsent(stage + '|' + event.getString("key"),
                    k -> Collections.synchronizedList(new ArrayList<>())).add(nanos);
            if (stage.equals(PathStage.COMMITTED)) {
                seqOf.put(nanos, event.getString("key") + '|' + seq);
            }
        });
        stream.startAsync();
    }

    void crossing(Crossing crossing) {
        crossings.add(crossing);
    }

    /**
     * Waits (at most {@code bound}) until the stream has delivered the events up to the last crossing, then gives
     * p50 and p99 of each hand-off over the crossings whose stages were all seen.
     */
    List<String> report(Duration bound) throws InterruptedException {
        long last = crossings.stream().mapToLong(Crossing::arrivedNanos).max().orElse(0);
        long end = System.nanoTime() + bound.toNanos();
        while (newestOffer < last && System.nanoTime() < end) {
            Thread.sleep(50);
        }
        List<List<Double>> spans = new ArrayList<>();
        for (int i = 0; i < INTERVALS.size(); i++) {
            spans.add(new ArrayList<>());
        }
        int complete = 0;
        for (Crossing c : crossings) {
            long[] at = new long[STAGES.size() + 1];
            at[0] = c.sentNanos();
            long seq = -1;
            boolean whole = true;
            for (int s = 0; s < STAGES.size() && whole; s++) {
                String stage = STAGES.get(s);
                long t;
                if (stage.equals("arrived")) {
                    t = c.arrivedNanos();
                } else if (stage.equals(PathStage.SENT)) {
                    Long sent = seq < 0 ? null : sentBySeq.get(seq);
                    t = sent == null ? -1 : sent;
                } else {
                    String key = stage.equals(PathStage.OFFERED) || stage.equals(PathStage.EVALUATED)
                            ? c.channel() : c.alarm();
                    // The device takes its send time after the write returns, which the daemon's poller can beat.
                    long from = stage.equals(PathStage.OFFERED) ? at[s] - SEND_SLACK_NANOS : at[s];
                    t = firstAtOrAfter(marks.get(stage + '|' + key), from);
                    if (stage.equals(PathStage.COMMITTED) && t >= 0) {
                        String keyed = seqOf.get(t);
                        seq = keyed == null ? -1 : Long.parseLong(keyed.substring(keyed.lastIndexOf('|') + 1));
                    }
                }
                whole = t >= 0;
                at[s + 1] = t;
            }
            if (!whole) {
                continue;
            }
            complete++;
            for (int s = 0; s < INTERVALS.size(); s++) {
                spans.get(s).add((at[s + 1] - at[s]) / 1e6);
            }
        }
        List<String> lines = new ArrayList<>();
        lines.add(String.format(Locale.ROOT, "         hand-offs over %d of %d crossings (p50 / p99 ms):", complete,
                crossings.size()));
        for (int s = 0; s < INTERVALS.size(); s++) {
            Percentiles p = Percentiles.of(spans.get(s).stream().mapToDouble(Double::doubleValue).toArray());
            lines.add(String.format(Locale.ROOT, "           %-46s %8.2f / %8.2f", INTERVALS.get(s), p.p50(), p.p99()));
        }
        return lines;
    }

    private static long firstAtOrAfter(List<Long> times, long from) {
        if (times == null) {
            return -1;
        }
        long best = -1;
        synchronized (times) {
            for (long t : times) {
                if (t >= from && (best < 0 || t < best)) {
                    best = t;
                }
            }
        }
        return best;
    }

    @Override
    public void close() {
        stream.close();
    }
}
