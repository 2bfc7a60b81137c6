package org.cryowarden.daemon.run;

import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.daemon.notify.NotifierCatalog;
import org.cryowarden.daemon.notify.NotifySetup;
import org.cryowarden.drivers.settings.SettingsReader;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.NameMatch;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.config.ConfigNode;
import org.cryowarden.rules.config.Configuration;
import org.cryowarden.rules.model.FillDef;
import org.cryowarden.rules.model.InterlockDef;
import org.cryowarden.rules.model.OutputAction;
import org.cryowarden.rules.model.OutputDef;
import org.cryowarden.rules.model.Priority;

/**
 * What keeps an unattended night covered, from the site file's {@code notifiers}, {@code watchdog} and
 * {@code common_alarm} sections, checked with positions by {@code check} and at startup:
 * <pre>
 * watchdog:     {heartbeat: 10s, engine_stall: 30s, poller_stall: 2min}
 * common_alarm: {output: common-alarm, priority: high}
 * </pre>
 *
 * @param notifiers   the senders and roster; empty when the site names none
 * @param heartbeat   how often {@code <prefix>/heartbeat} is published
 * @param engineStall how long the engine may leave a probe unanswered before it counts as stalled
 * @param pollerStall how long a bus's poller may go without a round before it counts as stalled (default 2 min,
 *                    or three of the longest channel periods if longer)
 * @param commonAlarm the building common-alarm contact, if any
 */
public record NightSettings(Optional<NotifySetup> notifiers, Duration heartbeat, Duration engineStall,
                            Duration pollerStall, Optional<CommonAlarm> commonAlarm) {

    static final Duration DEFAULT_HEARTBEAT = Duration.ofSeconds(10);
    static final Duration DEFAULT_ENGINE_STALL = Duration.ofSeconds(30);
    static final Duration DEFAULT_POLLER_STALL = Duration.ofMinutes(2);

    /**
     * A relay output held energised while all is well and dropped on an alarm of {@code priority} or more urgent,
     * on a stall and at shutdown (fail-safe: a dead daemon or a cut wire reads as an alarm).
     */
    public record CommonAlarm(String output, Priority priority) {
    }

    /** Heartbeat and watchdog at their defaults, no notifiers, no contact: for callers that build a daemon in code. */
    public static NightSettings defaults() {
        return new NightSettings(Optional.empty(), DEFAULT_HEARTBEAT, DEFAULT_ENGINE_STALL, DEFAULT_POLLER_STALL,
                Optional.empty());
    }

    public NightSettings withNotify(Optional<NotifySetup> setup) {
        return new NightSettings(setup, heartbeat, engineStall, pollerStall, commonAlarm);
    }

    /**
     * Reads and checks the three sections; reads the roster and the senders' secret files.
     *
     * @param folder the site file's folder
     * @throws ConfigException with every problem found
     */
    public static NightSettings read(Configuration configuration, Path folder) throws ConfigException {
        List<ConfigProblem> problems = new ArrayList<>();
        Map<String, ConfigNode.Mapping> sections = configuration.site().sections();
        Duration heartbeat = DEFAULT_HEARTBEAT;
        Duration engineStall = DEFAULT_ENGINE_STALL;
        Duration longest = longestPeriod(configuration);
        Duration pollerStall = DEFAULT_POLLER_STALL.compareTo(longest.multipliedBy(3)) > 0 ? DEFAULT_POLLER_STALL
                : longest.multipliedBy(3);
        ConfigNode.Mapping watchdog = sections.get("watchdog");
        if (watchdog != null) {
            SettingsReader w = new SettingsReader(watchdog, "watchdog");
            w.allowOnly("heartbeat", "engine_stall", "poller_stall");
            heartbeat = w.duration("heartbeat", Duration.ofSeconds(1), Duration.ofMinutes(10), false)
                    .orElse(heartbeat);
            engineStall = w.duration("engine_stall", Duration.ofSeconds(5), Duration.ofHours(1), false)
                    .orElse(engineStall);
            pollerStall = w.duration("poller_stall", Duration.ofSeconds(10), Duration.ofHours(1), false)
                    .orElse(pollerStall);
            if (w.has("poller_stall") && pollerStall.compareTo(longest.multipliedBy(2)) <= 0) {
                w.problem(w.position("poller_stall"), "poller_stall " + pollerStall.toSeconds() + " s must be longer"
                        + " than twice the longest channel period (" + longest.toSeconds() + " s), or a quiet bus"
                        + " reads as stalled");
            }
            problems.addAll(w.problems());
        }
        Optional<CommonAlarm> contact = Optional.empty();
        ConfigNode.Mapping common = sections.get("common_alarm");
        if (common != null) {
            contact = commonAlarm(new SettingsReader(common, "common_alarm"), configuration, problems);
        }
        Optional<NotifySetup> setup = Optional.empty();
        try {
            setup = NotifySetup.read(configuration.site(), folder, NotifierCatalog.builtIn());
        } catch (ConfigException e) {
            problems.addAll(e.problems());
        }
        if (!problems.isEmpty()) {
            throw new ConfigException(problems);
        }
        return new NightSettings(setup, heartbeat, engineStall, pollerStall, contact);
    }

    private static Optional<CommonAlarm> commonAlarm(SettingsReader c, Configuration configuration,
            List<ConfigProblem> problems) {
        c.allowOnly("output", "priority");
        Optional<String> output = c.text("output", true).map(String::strip);
        Optional<Priority> priority = c.choice("priority", Map.of("critical", Priority.CRITICAL, "high",
                Priority.HIGH, "medium", Priority.MEDIUM, "low", Priority.LOW), false);
        if (output.isPresent()) {
            SourcePosition at = c.position("output");
            Optional<OutputDef> def = configuration.site().outputs().stream()
                    .filter(o -> o.id().equals(output.get())).findFirst();
            if (def.isEmpty()) {
                c.problem(at, "common_alarm output '" + output.get() + "' is no output of the site"
                        + NameMatch.closest(output.get(), configuration.site().outputs().stream().map(OutputDef::id)
                        .toList()).map(n -> "; did you mean '" + n + "'?").orElse(""));
            } else if (def.get().safeValue() != 0) {
                c.problem(at, "common_alarm output '" + output.get() + "' must have safe_value 0: the contact is"
                        + " fail-safe, de-energised (0) is the alarm state");
            }
            for (InterlockDef interlock : configuration.rules().interlocks()) {
                for (OutputAction action : interlock.actions()) {
                    if (action.output().equals(output.get())) {
                        c.problem(at, "common_alarm output '" + output.get() + "' is also driven by interlock '"
                                + interlock.id() + "' (" + interlock.position() + "); give the contact its own relay");
                    }
                }
            }
            for (FillDef fill : configuration.rules().fills()) {
                if (fill.valve().equals(output.get())) {
                    c.problem(at, "common_alarm output '" + output.get() + "' is also the valve of fill '" + fill.id()
                            + "'; give the contact its own relay");
                }
            }
        }
        problems.addAll(c.problems());
        if (output.isEmpty() || !c.problems().isEmpty()) {
            return Optional.empty();
        }
        return Optional.of(new CommonAlarm(output.get(), priority.orElse(Priority.HIGH)));
    }

    private static Duration longestPeriod(Configuration configuration) {
        Duration longest = Duration.ZERO;
        for (var channel : configuration.site().channels()) {
            if (channel.period().compareTo(longest) > 0) {
                longest = channel.period();
            }
        }
        return longest;
    }
}
