package org.cryowarden.daemon.run;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.atomic.AtomicLong;
import org.cryowarden.rules.DurationSyntax;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.model.Priority;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Notices a stalled engine (a probe task it submits stays unanswered longer than the engine limit) or a poller
 * that stopped polling (no round for longer than the poller limit), and says so as {@code watchdog.stalled} and
 * {@code watchdog.recovered} events (critical, so the notifiers page at once). It publishes the heartbeat and, only
 * while everything is healthy, tells systemd {@code WATCHDOG=1}: a daemon that cannot notice its own stall is then
 * restarted by systemd.
 *
 * <p>All timing on the monotonic side of the {@link TimeSource}; {@link #runDue} runs on the watchdog's own
 * thread ({@link #start}) or on a test's or the driven night's thread.
 */
final class Watchdog implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(Watchdog.class);
    private static final long NONE = Long.MIN_VALUE;
    private static final Duration CHECK_EVERY = Duration.ofSeconds(1);

    /** Where the watchdog looks and what it tells. */
    interface Parts {
        /** Runs {@code probe} on the engine thread, in order with everything else. */
        void submitToEngine(Runnable probe);

        /** Each bus poller's last round (monotonic ns), by bus id. */
        Map<String, Long> pollerRounds();

        /** Records and publishes watchdog events; must not go through the engine, which may be stuck. */
        void record(List<DaemonEvent> events);

        /** The daemon's progress counters for the heartbeat. */
        ObjectNode counters();

        /** Publishes the heartbeat document. */
        void heartbeat(ObjectNode document);

        /** Told after every check whether everything is healthy (the common-alarm contact follows it). */
        void health(boolean healthy);
    }

    private final TimeSource time;
    private final Parts parts;
    private final SystemdNotify systemd;
    private final Duration heartbeatEvery;
    private final Duration engineLimit;
    private final Duration pollerLimit;
    private final Duration pingEvery;
    private final AtomicLong probeSince = new AtomicLong(NONE);
    private final Set<String> stalled = new LinkedHashSet<>();
    private long lastHeartbeat = NONE;
    private long lastPing = NONE;
    private long lastCheck = NONE;
    private volatile boolean healthy = true;
    private volatile boolean running;
    private Thread thread;

    Watchdog(TimeSource time, NightSettings settings, SystemdNotify systemd, Parts parts) {
        this.time = time;
        this.parts = parts;
        this.systemd = systemd;
        this.heartbeatEvery = settings.heartbeat();
        this.engineLimit = settings.engineStall();
        this.pollerLimit = settings.pollerStall();
        this.pingEvery = systemd.watchdogEvery().orElse(settings.heartbeat());
    }

    boolean healthy() {
        return healthy;
    }

    /** Checks, records changes, publishes the heartbeat and pings systemd when due. */
    synchronized void runDue() {
        long now = time.monotonicNanos();
        if (lastCheck != NONE && now - lastCheck < CHECK_EVERY.toNanos() / 2) {
            return;
        }
        lastCheck = now;
        Map<String, Duration> stalls = new LinkedHashMap<>();
        long since = probeSince.get();
        if (since == NONE) {
            if (probeSince.compareAndSet(NONE, now)) {
                parts.submitToEngine(() -> probeSince.set(NONE));
            }
        } else if (now - since > engineLimit.toNanos()) {
            stalls.put("engine", Duration.ofNanos(now - since));
        }
        for (Map.Entry<String, Long> poller : parts.pollerRounds().entrySet()) {
            long age = now - poller.getValue();
            if (age > pollerLimit.toNanos()) {
                stalls.put("poller-" + poller.getKey(), Duration.ofNanos(age));
            }
        }
        List<DaemonEvent> events = new ArrayList<>();
        for (Map.Entry<String, Duration> stall : stalls.entrySet()) {
            if (stalled.add(stall.getKey())) {
                events.add(stalledEvent(stall.getKey(), stall.getValue()));
            }
        }
        for (String what : List.copyOf(stalled)) {
            if (!stalls.containsKey(what)) {
                stalled.remove(what);
                events.add(recoveredEvent(what));
            }
        }
        healthy = stalled.isEmpty();
        if (!events.isEmpty()) {
            events.forEach(e -> LOG.error("watchdog: {}", e.payload().path("message").asText()));
            parts.record(events);
        }
        parts.health(healthy);
        if (lastHeartbeat == NONE || now - lastHeartbeat >= heartbeatEvery.toNanos()) {
            lastHeartbeat = now;
            parts.heartbeat(heartbeat(now));
        }
        if (healthy && (lastPing == NONE || now - lastPing >= pingEvery.toNanos())) {
            lastPing = now;
            systemd.send("WATCHDOG=1");
        }
    }

    private DaemonEvent stalledEvent(String what, Duration age) {
        ObjectNode payload = Payloads.object();
        String limit = DurationSyntax.format(what.equals("engine") ? engineLimit : pollerLimit);
        String message = what.equals("engine")
                ? "the engine has not answered for " + DurationSyntax.format(age) + " (limit " + limit
                        + "): readings are not evaluated"
                : "bus " + what.substring("poller-".length()) + " has not been polled for "
                        + DurationSyntax.format(age) + " (limit " + limit + ")";
        payload.put("cause", message);
        payload.put("message", message);
        payload.put("priority", Priority.CRITICAL.word());
        payload.put("stalled_for", age.toString());
        payload.put("limit", (what.equals("engine") ? engineLimit : pollerLimit).toString());
        return new DaemonEvent("watchdog.stalled", time.wallNow(), Optional.of(what), Optional.empty(), payload);
    }

    private DaemonEvent recoveredEvent(String what) {
        ObjectNode payload = Payloads.object();
        String message = what.equals("engine") ? "the engine answers again"
                : "bus " + what.substring("poller-".length()) + " is polled again";
        payload.put("cause", message);
        payload.put("message", message);
        payload.put("priority", Priority.CRITICAL.word());
        return new DaemonEvent("watchdog.recovered", time.wallNow(), Optional.of(what), Optional.empty(), payload);
    }

    private ObjectNode heartbeat(long now) {
        ObjectNode node = Payloads.object();
        node.put("time", time.wallNow().toString());
        node.put("healthy", healthy);
        node.setAll(parts.counters());
        long since = probeSince.get();
        node.put("engine_probe_wait_s", since == NONE ? 0 : seconds(now - since));
        ArrayNode pollers = node.putArray("pollers");
        for (Map.Entry<String, Long> poller : parts.pollerRounds().entrySet()) {
            ObjectNode p = pollers.addObject();
            p.put("bus", poller.getKey());
            p.put("last_poll_age_s", seconds(now - poller.getValue()));
            p.put("stalled", stalled.contains("poller-" + poller.getKey()));
        }
        node.set("stalled", Payloads.JSON.valueToTree(List.copyOf(stalled)));
        return node;
    }

    private static double seconds(long nanos) {
        return Math.round(Math.max(0, nanos) / 1e6) / 1e3;
    }

    void start() {
        running = true;
        thread = new Thread(this::loop, "watchdog");
        thread.setDaemon(true);
        thread.start();
    }

    private void loop() {
        while (running) {
            try {
                runDue();
            } catch (RuntimeException e) {
                LOG.error("watchdog round failed; carrying on", e);
            }
            try {
                Thread.sleep(CHECK_EVERY.toMillis());
            } catch (InterruptedException e) {
                return;
            }
        }
    }

    @Override
    public void close() {
        running = false;
        if (thread != null) {
            thread.interrupt();
            try {
                thread.join(5_000);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
    }
}
