package org.cryowarden.daemon.run;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.node.ObjectNode;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.engine.OutputCommand;
import org.cryowarden.rules.model.Priority;
import org.junit.jupiter.api.Test;

class WatchdogTest {

    private final VirtualTimeSource time = new VirtualTimeSource(Instant.parse("2025-11-14T23:00:00Z"));
    private final List<Runnable> engineInbox = new ArrayList<>();
    private final Map<String, Long> rounds = new LinkedHashMap<>();
    private final List<DaemonEvent> events = new ArrayList<>();
    private final List<ObjectNode> heartbeats = new ArrayList<>();
    private final List<String> systemd = new ArrayList<>();
    private final List<Double> coil = new ArrayList<>();
    private boolean engineRuns = true;
    private final CommonAlarmContact contact = new CommonAlarmContact(
            new NightSettings.CommonAlarm("common-alarm", Priority.HIGH), time,
            (OutputCommand c) -> coil.add(c.value()));

    private final Watchdog watchdog = new Watchdog(time, new NightSettings(Optional.empty(), Duration.ofSeconds(10),
            Duration.ofSeconds(30), Duration.ofMinutes(2), Optional.empty()), systemd::add, new Watchdog.Parts() {
                @Override
                public void submitToEngine(Runnable probe) {
                    engineInbox.add(probe);
                }

                @Override
                public Map<String, Long> pollerRounds() {
                    return Map.copyOf(rounds);
                }

                @Override
                public void record(List<DaemonEvent> recorded) {
                    events.addAll(recorded);
                }

                @Override
                public ObjectNode counters() {
                    ObjectNode node = Payloads.object();
                    node.put("readings_processed", 42);
                    return node;
                }

                @Override
                public void heartbeat(ObjectNode document) {
                    heartbeats.add(document);
                }

                @Override
                public void health(boolean healthy) {
                    contact.health(healthy);
                }
            });

    /** One simulated second: the engine (if it runs) takes its inbox, the poller polls, the watchdog checks. */
    private void second(boolean pollerPolls) {
        time.advance(Duration.ofSeconds(1));
        if (engineRuns) {
            engineInbox.forEach(Runnable::run);
            engineInbox.clear();
        }
        if (pollerPolls) {
            rounds.put("rack-a-rs485", time.monotonicNanos());
        }
        watchdog.runDue();
    }

    @Test
    void stalledEngineRaisesACriticalEventDropsTheContactAndStopsTheSystemdPings() {
        rounds.put("rack-a-rs485", time.monotonicNanos());
        contact.summary(summary(0));
        for (int i = 0; i < 60; i++) {
            second(true);
        }
        assertThat(events).isEmpty();
        int pingsWhileHealthy = systemd.size();
        // Without WATCHDOG_USEC the ping follows the 10 s heartbeat: 60 s give 6 (the first at the first check).
        assertThat(pingsWhileHealthy).isEqualTo(6);
        assertThat(coil).containsExactly(1.0);

        engineRuns = false; // an injected stall: the engine thread takes nothing any more
        for (int i = 0; i < 40; i++) {
            second(true);
        }
        assertThat(events).extracting(DaemonEvent::kind).containsExactly("watchdog.stalled");
        assertThat(events.get(0).subject()).contains("engine");
        assertThat(events.get(0).payload().path("priority").asText()).isEqualTo("critical");
        // Stalled after more than the 30 s limit: the probe went in at the first stalled second.
        assertThat(Duration.parse(events.get(0).payload().path("stalled_for").asText()))
                .isGreaterThan(Duration.ofSeconds(30)).isLessThanOrEqualTo(Duration.ofSeconds(32));
        assertThat(coil).containsExactly(1.0, 0.0);
        // WATCHDOG=1 stops once the stall is seen: only the pings of the first 30 s of the stall went out.
        assertThat(systemd).hasSizeLessThanOrEqualTo(pingsWhileHealthy + 4).allMatch("WATCHDOG=1"::equals);
        int pingsAtStall = systemd.size();
        for (int i = 0; i < 60; i++) {
            second(true);
        }
        assertThat(systemd).hasSize(pingsAtStall);
        ObjectNode last = heartbeats.get(heartbeats.size() - 1);
        assertThat(last.path("healthy").asBoolean()).isFalse();
        assertThat(last.path("stalled").toString()).contains("engine");
        assertThat(last.path("readings_processed").asInt()).isEqualTo(42);

        engineRuns = true;
        second(true);
        second(true);
        assertThat(events).extracting(DaemonEvent::kind).containsExactly("watchdog.stalled", "watchdog.recovered");
        assertThat(coil).containsExactly(1.0, 0.0, 1.0);
        assertThat(systemd).hasSizeGreaterThan(pingsAtStall);
    }

    @Test
    void pollerWithoutRoundsForLongerThanItsLimitIsAStall() {
        rounds.put("rack-a-rs485", time.monotonicNanos());
        contact.summary(summary(0));
        for (int i = 0; i < 119; i++) {
            second(false);
        }
        assertThat(events).isEmpty();
        second(false);
        second(false);
        assertThat(events).extracting(DaemonEvent::kind).containsExactly("watchdog.stalled");
        assertThat(events.get(0).subject()).contains("poller-rack-a-rs485");
        assertThat(events.get(0).payload().path("message").asText()).contains("bus rack-a-rs485 has not been polled");
        ObjectNode last = heartbeats.get(heartbeats.size() - 1);
        assertThat(last.path("pollers").get(0).path("last_poll_age_s").asDouble()).isGreaterThanOrEqualTo(110);
        second(true);
        assertThat(events).extracting(DaemonEvent::kind).containsExactly("watchdog.stalled", "watchdog.recovered");
    }

    @Test
    void contactDropsOnAnAlarmOfItsPriorityOrHigherOnlyAndAtStop() {
        contact.summary(summary(0));
        contact.summary(summaryWith("medium"));
        contact.summary(summaryWith("high"));
        contact.summary(summary(0));
        contact.summary(summaryWith("critical"));
        contact.summary(summary(0));
        contact.stop();
        contact.summary(summary(0));
        // 1 all well; medium is below the configured high, so no change; high drops; clear; critical drops;
        // clear; stop drops for good.
        assertThat(coil).containsExactly(1.0, 0.0, 1.0, 0.0, 1.0, 0.0);
    }

    private static ObjectNode summary(int activeHigh) {
        List<Payloads.AlarmView> views = new ArrayList<>();
        for (int i = 0; i < activeHigh; i++) {
            views.add(new Payloads.AlarmView("a" + i, Priority.HIGH, true, true));
        }
        return Payloads.summary(views, Instant.EPOCH);
    }

    private static ObjectNode summaryWith(String priority) {
        return Payloads.summary(List.of(new Payloads.AlarmView("x", Priority.valueOf(priority.toUpperCase()), true,
                true)), Instant.EPOCH);
    }
}
