package org.cryowarden.daemon.run;

import com.fasterxml.jackson.databind.node.ObjectNode;
import java.util.Locale;
import java.util.function.Consumer;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.engine.OutputCommand;
import org.cryowarden.rules.model.Priority;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The building's common-alarm contact: a relay output held energised (1) while all is well and dropped (0) when
 * an alarm of the configured priority or a more urgent one is active (as the summary counts it), when the
 * watchdog sees a stall, and when the daemon stops. Fail-safe by wiring: a dead daemon, a cut wire or a relay
 * module without power also reads as an alarm, provided the module's own comms-loss timeout drops its coils.
 * The state is written again at every heartbeat, which keeps such a timeout fed.
 *
 * <p>Any thread; writes go through the output writer like the engine's commands.
 */
final class CommonAlarmContact {

    static final String SOURCE = "common-alarm";
    private static final Logger LOG = LoggerFactory.getLogger(CommonAlarmContact.class);

    private final NightSettings.CommonAlarm settings;
    private final TimeSource time;
    private final Consumer<OutputCommand> writer;
    private boolean summaryKnown;
    private boolean alarm;
    private boolean healthy = true;
    private boolean stopping;
    private Boolean written;
    private String cause = "starting";

    CommonAlarmContact(NightSettings.CommonAlarm settings, TimeSource time, Consumer<OutputCommand> writer) {
        this.settings = settings;
        this.time = time;
        this.writer = writer;
    }

    String output() {
        return settings.output();
    }

    /** From the journal thread: the summary as last recorded. */
    synchronized void summary(ObjectNode summary) {
        if (!summary.has("active")) {
            return;
        }
        summaryKnown = true;
        boolean any = false;
        for (Priority priority : Priority.values()) {
            if (priority.compareTo(settings.priority()) <= 0
                    && summary.path("active").path(priority.word()).asInt() > 0) {
                any = true;
            }
        }
        alarm = any;
        decide(false);
    }

    /** From the watchdog after each check. */
    synchronized void health(boolean healthyNow) {
        healthy = healthyNow;
        decide(false);
    }

    /** Writes the present state again (the heartbeat), so the relay module's comms-loss timeout stays fed. */
    synchronized void refresh() {
        decide(true);
    }

    /** Drops the contact for good: the daemon stops. */
    synchronized void stop() {
        stopping = true;
        decide(false);
    }

    synchronized boolean energised() {
        return Boolean.TRUE.equals(written);
    }

    private void decide(boolean again) {
        boolean energise = summaryKnown && !alarm && healthy && !stopping;
        String why = stopping ? "cryowarden stopping" : !healthy ? "watchdog: stall"
                : alarm ? "an alarm of priority " + settings.priority().word() + " or higher is active"
                : summaryKnown ? "all well" : "starting";
        if (written != null && written == energise && !again) {
            return;
        }
        if (written == null || written != energise) {
            LOG.info("common-alarm contact {} {}: {}", settings.output(), energise ? "energised" : "dropped", why);
        }
        written = energise;
        cause = why;
        writer.accept(new OutputCommand(time.wallNow(), settings.output(), energise ? 1 : 0, SOURCE,
                cause.toLowerCase(Locale.ROOT)));
    }
}
