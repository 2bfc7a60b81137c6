package org.cryowarden.daemon.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.net.InetAddress;
import java.net.UnknownHostException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.Callable;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.simulator.EmulatorOptions;
import org.cryowarden.simulator.Endpoint;
import org.cryowarden.simulator.Pace;
import org.cryowarden.simulator.SimulationRun;
import org.cryowarden.simulator.Simulator;
import org.cryowarden.simulator.model.VesselState;
import org.cryowarden.simulator.scenario.Scenario;
import org.cryowarden.simulator.scenario.ScenarioReader;
import org.cryowarden.simulator.trace.TraceWriter;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * {@code simulate}: runs a scenario standalone, with its instruments on TCP ports (and pseudo-terminals), so a
 * cryowarden daemon or any Modbus/SCPI tool can be pointed at it. Timeline entries marked
 * {@code when: standalone} apply, since no daemon drives the outputs.
 */
@Command(name = "simulate", mixinStandardHelpOptions = true,
        description = {"Run a scenario: a physical model of the plant with emulated instruments on TCP ports.",
            "The simulator is for rehearsal and testing; it is not a safety system."})
final class SimulateCommand implements Callable<Integer> {

    static final int BAD_INPUT = 2;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Option(names = "--scenario", required = true, paramLabel = "FILE", description = "the scenario YAML file")
    Path scenarioFile;

    @Option(names = "--speed", paramLabel = "N", description = "simulated seconds per real second (default 1)")
    Double speed;

    @Option(names = "--fast", description = "run as fast as possible")
    boolean fast;

    @Option(names = "--hours", paramLabel = "H", description = "simulated hours to run (default: the scenario's duration)")
    Double hours;

    @Option(names = "--tcp-base-port", paramLabel = "P",
            description = "first TCP port; the scenario's ports take P, P+1, ... (default: the file's, 0 = any free)")
    Integer tcpBasePort;

    @Option(names = "--bind", paramLabel = "ADDRESS", defaultValue = "127.0.0.1",
            description = "address to listen on (default 127.0.0.1)")
    String bind;

    @Option(names = "--pty-dir", paramLabel = "DIR",
            description = "create pseudo-terminal links (socat) here for ports with 'pty: true'")
    Path ptyDir;

    @Option(names = "--trace", paramLabel = "FILE.csv", description = "write the true physical state at every step")
    Path trace;

    @Option(names = "--no-emulators", description = "run the physics only, with no ports")
    boolean noEmulators;

    @Override
    public Integer call() throws Exception {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        if (fast && speed != null) {
            err.println("simulate: give either --speed N or --fast, not both");
            return BAD_INPUT;
        }
        if (speed != null && !(speed > 0 && Double.isFinite(speed))) {
            err.println("simulate: --speed must be a positive number, got " + speed);
            return BAD_INPUT;
        }
        if (hours != null && !(hours > 0 && hours <= 168)) {
            err.println("simulate: --hours must be more than 0 and at most 168, got " + hours);
            return BAD_INPUT;
        }
        if (tcpBasePort != null && (tcpBasePort < 0 || tcpBasePort > 65535)) {
            err.println("simulate: --tcp-base-port must be 0-65535, got " + tcpBasePort);
            return BAD_INPUT;
        }
        InetAddress address;
        try {
            address = InetAddress.getByName(bind);
        } catch (UnknownHostException e) {
            err.println("simulate: --bind " + bind + " is not an address of this machine");
            return BAD_INPUT;
        }
        Scenario scenario;
        try {
            scenario = ScenarioReader.read(scenarioFile);
        } catch (ConfigException e) {
            for (ConfigProblem problem : e.problems()) {
                err.println(problem);
            }
            err.flush();
            return BAD_INPUT;
        }
        Duration duration = hours != null ? Duration.ofMillis(Math.round(hours * 3_600_000)) : scenario.duration();
        Pace pace = fast ? Pace.FAST : Pace.times(speed != null ? speed : 1);
        VirtualTimeSource clock = new VirtualTimeSource(scenario.start());
        TraceWriter traceOut = null;
        try (Simulator simulator = Simulator.create(scenario, clock, true)) {
            out.println("scenario " + scenario.name() + " (" + scenarioFile + "): " + format(duration) + " from "
                    + scenario.start() + ", step " + format(scenario.step()) + ", "
                    + (pace.isFast() ? "as fast as possible" : "speed " + trim(pace.speed()) + "x"));
            out.println("the simulator is for rehearsal and testing; it is not a safety system");
            if (!noEmulators) {
                List<Endpoint> endpoints;
                try {
                    endpoints = simulator.startEmulators(new EmulatorOptions(address, Optional.ofNullable(tcpBasePort),
                            Optional.ofNullable(ptyDir)));
                } catch (IOException e) {
                    err.println("simulate: " + e.getMessage());
                    return BAD_INPUT;
                }
                for (Endpoint endpoint : endpoints) {
                    out.println("  " + endpoint.describe());
                }
            }
            out.flush();
            if (trace != null) {
                try {
                    traceOut = new TraceWriter(Files.newBufferedWriter(trace, StandardCharsets.UTF_8));
                } catch (IOException e) {
                    err.println("simulate: cannot write the trace " + trace + ": " + e.getMessage());
                    return BAD_INPUT;
                }
                simulator.addStepListener(traceOut);
            }
            int[] printed = {0};
            simulator.addStepListener((state, sensors) -> {
                List<String> log = simulator.eventLog();
                while (printed[0] < log.size()) {
                    out.println("  " + log.get(printed[0]++));
                    out.flush();
                }
            });
            long realStart = System.nanoTime();
            SimulationRun run = simulator.start(pace, duration);
            Thread hook = new Thread(simulator::close, "simulate-shutdown"); // Ctrl-C: stop socat, remove pty links
            Runtime.getRuntime().addShutdownHook(hook);
            while (!run.await(Duration.ofSeconds(1))) {
                // waiting for the night to pass; Ctrl-C stops it through the hook
            }
            try {
                Runtime.getRuntime().removeShutdownHook(hook);
            } catch (IllegalStateException shuttingDown) {
                // the JVM is already stopping
            }
            if (run.failure() != null) {
                throw new IllegalStateException("the simulation failed", run.failure());
            }
            double realSeconds = (System.nanoTime() - realStart) / 1e9;
            out.println(summary(simulator, realSeconds));
            out.flush();
            return 0;
        } finally {
            if (traceOut != null) {
                traceOut.close();
            }
        }
    }

    private static String summary(Simulator simulator, double realSeconds) {
        StringBuilder text = new StringBuilder();
        text.append(String.format(Locale.ROOT, "simulated %s in %.2f s of real time (%d steps)",
                format(simulator.elapsed()), realSeconds, simulator.steps()));
        for (Map.Entry<String, Double> room : simulator.lowestOxygenPercent().entrySet()) {
            text.append(String.format(Locale.ROOT, "%n  room %s: lowest oxygen %.2f %%vol, now %.2f %%vol",
                    room.getKey(), room.getValue(), simulator.state().room(room.getKey()).orElseThrow()
                            .oxygenPercent()));
        }
        for (VesselState vessel : simulator.state().vessels()) {
            double ambient = simulator.scenario().rooms().stream()
                    .filter(r -> simulator.scenario().vessels().stream().anyMatch(v -> v.id().equals(vessel.id())
                            && v.roomId().equals(r.id())))
                    .findFirst().map(r -> r.pressurePascal()).orElse(101325.0);
            text.append(String.format(Locale.ROOT,
                    "%n  vessel %s: %.1f L left, highest pressure %.1f kPa(g), relief lifts %d%s",
                    vessel.id(), vessel.liquidLitres(),
                    (simulator.highestPressurePascal().get(vessel.id()) - ambient) / 1000, vessel.reliefLifts(),
                    vessel.burstDiscOpen() ? ", burst disc open" : ""));
        }
        return text.toString();
    }

    private static String format(Duration duration) {
        long seconds = duration.toSeconds();
        return String.format(Locale.ROOT, "%02d:%02d:%02d", seconds / 3600, seconds / 60 % 60, seconds % 60);
    }

    private static String trim(double value) {
        return value == Math.rint(value) ? Long.toString((long) value) : Double.toString(value);
    }
}
