package org.cryowarden.daemon.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Optional;
import java.util.concurrent.Callable;
import org.cryowarden.daemon.demo.DemoNight;
import org.cryowarden.daemon.demo.DemoSummary;
import org.cryowarden.daemon.run.Daemon;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.DurationSyntax;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * {@code cryowarden demo}: an accelerated night on the example site against the simulator, with the embedded
 * broker, needing nothing but Java.
 */
@Command(
        name = "demo",
        description = {
            "Run an accelerated night: the simulator's scenario on TCP ports, the daemon on the example site,",
            "an embedded MQTT broker, a live console and a summary at the end.",
            "cryowarden is a supervisory layer, not a certified safety system: it never replaces hardwired",
            "oxygen monitoring, relief devices or local codes."
        },
        mixinStandardHelpOptions = true)
final class DemoCommand implements Callable<Integer> {

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Option(names = "--scenario", paramLabel = "NAME", defaultValue = "quench",
            description = "quench (default), quiet, vent-blocked, or a scenario file")
    String scenario;

    @Option(names = "--speed", paramLabel = "N", defaultValue = "60",
            description = "simulated seconds per real second (default 60: the 2 h quench night in 2 min)")
    double speed;

    @Option(names = "--fast", description = "run as fast as the machine can")
    boolean fast;

    @Option(names = "--duration", paramLabel = "TIME", description = "run only this much of the scenario, e.g. 30min")
    String duration;

    @Option(names = "--mqtt-port", paramLabel = "N",
            description = "the embedded broker's port (default: 1883 if free, else the next free one)")
    Integer mqttPort;

    @Option(names = "--broker", paramLabel = "tcp://HOST:PORT", description = "use this broker instead")
    String broker;

    @Option(names = "--journal", paramLabel = "FILE", description = "keep the night's journal in FILE")
    Path journal;

    @Option(names = "--plain", description = "print progress lines instead of redrawing (automatic without a terminal)")
    boolean plain;

    @Override
    public Integer call() throws Exception {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        if (!(speed > 0)) {
            err.println("--speed must be a positive number, got " + speed);
            err.flush();
            return CheckCommand.INVALID;
        }
        if (mqttPort != null && (mqttPort < 1 || mqttPort > 65535)) {
            err.println("--mqtt-port must be between 1 and 65535, got " + mqttPort);
            err.flush();
            return CheckCommand.INVALID;
        }
        if (broker != null && !broker.matches("tcp://[^:/]+:\\d{1,5}")) {
            err.println("--broker must look like tcp://HOST:PORT, got " + broker);
            err.flush();
            return CheckCommand.INVALID;
        }
        Optional<Duration> length = Optional.empty();
        if (duration != null) {
            try {
                length = Optional.of(DurationSyntax.parse(duration));
            } catch (IllegalArgumentException e) {
                err.println("--duration: " + e.getMessage());
                err.flush();
                return CheckCommand.INVALID;
            }
        }
        boolean terminal = !plain && System.console() != null;
        DemoNight.Settings settings = new DemoNight.Settings(scenario, fast ? Double.POSITIVE_INFINITY : speed,
                mqttPort == null ? 1883 : mqttPort, mqttPort != null, Optional.ofNullable(broker),
                Optional.ofNullable(journal), length, terminal);
        try {
            DemoSummary summary = new DemoNight(settings, out).run();
            return 0;
        } catch (ConfigException e) {
            return RunCommand.refuse(err, e);
        } catch (Daemon.StartException e) {
            err.println("cannot start the demo: " + e.getMessage());
            err.flush();
            return CheckCommand.INVALID;
        } catch (java.io.IOException e) {
            err.println("cannot start the simulator: " + e.getMessage());
            err.flush();
            return CheckCommand.INVALID;
        }
    }
}
