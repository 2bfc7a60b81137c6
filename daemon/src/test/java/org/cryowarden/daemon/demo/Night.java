package org.cryowarden.daemon.demo;

import static org.assertj.core.api.Assertions.assertThat;

import java.net.InetAddress;
import java.net.Socket;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.UUID;
import java.util.function.BooleanSupplier;
import org.cryowarden.daemon.run.Daemon;
import org.cryowarden.daemon.run.DaemonSettings;
import org.cryowarden.daemon.run.SiteSetup;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.config.ConfigNode;
import org.cryowarden.rules.config.Configuration;
import org.cryowarden.rules.model.BusDef;
import org.cryowarden.rules.model.SiteDef;
import org.cryowarden.rules.model.TransportDef;
import org.cryowarden.simulator.EmulatorOptions;
import org.cryowarden.simulator.Endpoint;
import org.cryowarden.simulator.Simulator;
import org.cryowarden.simulator.scenario.Scenario;
import org.cryowarden.simulator.scenario.ScenarioReader;

/**
 * The example site's quench night for end-to-end tests: the simulator and a daemon in driven mode on one
 * virtual clock, publishing to a real broker under a topic prefix of its own. The buses reach the emulators over
 * TCP, or over pseudo-terminals (socat) where the scenario offers one.
 */
final class Night implements AutoCloseable {

    static final String MOSQUITTO = "tcp://127.0.0.1:1883";

    final String prefix;
    final Simulator simulator;
    final Daemon daemon;
    final List<Endpoint> endpoints;

    private Night(String prefix, Simulator simulator, Daemon daemon, List<Endpoint> endpoints) {
        this.prefix = prefix;
        this.simulator = simulator;
        this.daemon = daemon;
        this.endpoints = endpoints;
    }

    /** Starts the quench night; with {@code ptys} the buses the scenario marks {@code pty: true} use them. */
    static Night start(Path folder, String broker, boolean ptys) throws Exception {
        return start(folder, broker, ptys, folder.resolve("journal.db"));
    }

    /** As {@link #start(Path, String, boolean)}, with the journal in the given file. */
    static Night start(Path folder, String broker, boolean ptys, Path journal) throws Exception {
        return start(folder, broker, ptys, journal, "harbour-hall-quench-scenario.yaml");
    }

    /** As {@link #start(Path, String, boolean)}, with the daemon's settings changed by {@code adjust}. */
    static Night start(Path folder, String broker, boolean ptys,
            java.util.function.UnaryOperator<DaemonSettings> adjust) throws Exception {
        return start(folder, broker, ptys, folder.resolve("journal.db"), "harbour-hall-quench-scenario.yaml", adjust);
    }

    /** As {@link #start(Path, String, boolean, Path)}, with another scenario of config-examples. */
    static Night start(Path folder, String broker, boolean ptys, Path journal, String scenarioFile) throws Exception {
        return start(folder, broker, ptys, journal, scenarioFile, java.util.function.UnaryOperator.identity());
    }

    /** The general form: journal file, scenario of config-examples, and a change to the daemon's settings. */
    static Night start(Path folder, String broker, boolean ptys, Path journal, String scenarioFile,
            java.util.function.UnaryOperator<DaemonSettings> adjust) throws Exception {
        Path examples = Files.createDirectories(folder.resolve("config-examples"));
        for (String name : List.of(DemoFiles.SITE, DemoFiles.RULES, scenarioFile)) {
            Files.copy(Path.of("..", "config-examples", name), examples.resolve(name));
        }
        Scenario scenario = DemoNight.unpaced(ScenarioReader.read(examples.resolve(scenarioFile)));
        VirtualTimeSource clock = new VirtualTimeSource(scenario.start());
        DriverCatalog catalog = DriverCatalog.discover(Night.class.getClassLoader(), Optional.empty());
        Path site = examples.resolve(DemoFiles.SITE);
        List<Path> rules = List.of(examples.resolve(DemoFiles.RULES));
        Simulator simulator = Simulator.create(scenario, clock, false);
        try {
            Optional<Path> ptyDir = ptys ? Optional.of(Files.createDirectories(folder.resolve("pty")))
                    : Optional.empty();
            List<Endpoint> endpoints = simulator.startEmulators(new EmulatorOptions(InetAddress.getLoopbackAddress(),
                    Optional.of(0), ptyDir));
            Configuration configuration = DemoNight.pointAt(SiteSetup.load(site, rules, catalog, clock), endpoints);
            if (ptys) {
                configuration = overPtys(configuration, endpoints);
            }
            String prefix = "cryowarden-test/" + UUID.randomUUID();
            DaemonSettings settings = adjust.apply(DaemonSettings.read(configuration.site(), examples)
                    .withBroker(Optional.of(broker), 1883).withPrefix(prefix, "test-" + UUID.randomUUID())
                    .withJournal(journal).withApi(Optional.empty(), Optional.empty()));
            Daemon daemon = Daemon.start(site, rules, configuration, settings, catalog, clock,
                    Daemon.Options.defaults().driven());
            return new Night(prefix, simulator, daemon, endpoints);
        } catch (Exception | AssertionError e) {
            simulator.close();
            throw e;
        }
    }

    /** One simulated second: the simulator steps, the daemon polls what is due, the journal catches up. */
    void step() throws InterruptedException {
        simulator.step();
        daemon.step();
        daemon.awaitQuiet(Duration.ofSeconds(5));
    }

    void steps(int count) throws InterruptedException {
        for (int i = 0; i < count; i++) {
            step();
        }
    }

    /** Steps until {@code done}, at most {@code maxSteps}, leaving real time for broker round trips. */
    void stepUntil(BooleanSupplier done, int maxSteps) throws InterruptedException {
        stepUntil(done, maxSteps, () -> "");
    }

    /** As {@link #stepUntil(BooleanSupplier, int)}, with what to show when the condition was not met. */
    void stepUntil(BooleanSupplier done, int maxSteps, java.util.function.Supplier<String> seen)
            throws InterruptedException {
        for (int i = 0; i < maxSteps && !done.getAsBoolean(); i++) {
            step();
            Thread.sleep(5); // real time for the broker round trip; the simulated clock moves only by steps
        }
        assertThat(done.getAsBoolean()).as("condition within " + maxSteps + " steps; seen: " + seen.get()).isTrue();
    }

    @Override
    public void close() {
        try {
            if (daemon != null) {
                daemon.close();
            }
        } finally {
            simulator.close();
        }
    }

    static void mosquittoRuns() throws Exception {
        if (!listening(1883)) {
            new ProcessBuilder("mosquitto", "-d", "-c", "/etc/mosquitto/mosquitto.conf").inheritIO().start().waitFor();
            long deadline = System.nanoTime() + Duration.ofSeconds(10).toNanos();
            while (!listening(1883) && System.nanoTime() < deadline) {
                Thread.sleep(50);
            }
        }
        assertThat(listening(1883)).as("Mosquitto on 127.0.0.1:1883").isTrue();
    }

    /** A Mosquitto of the test's own on {@code port} (loopback only, without a configuration file). */
    static Process ownMosquitto(int port) throws Exception {
        Process process = new ProcessBuilder("mosquitto", "-p", Integer.toString(port))
                .redirectErrorStream(true).redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
        long deadline = System.nanoTime() + Duration.ofSeconds(10).toNanos();
        while (!listening(port) && System.nanoTime() < deadline && process.isAlive()) {
            Thread.sleep(20);
        }
        assertThat(listening(port)).as("mosquitto on port " + port).isTrue();
        return process;
    }

    static boolean listening(int port) {
        try (Socket socket = new Socket(InetAddress.getLoopbackAddress(), port)) {
            return true;
        } catch (java.io.IOException e) {
            return false;
        }
    }

    /** Each bus whose emulated line has a pseudo-terminal reaches it as a serial port by that path. */
    private static Configuration overPtys(Configuration configuration, List<Endpoint> endpoints) {
        List<BusDef> buses = new ArrayList<>();
        for (BusDef bus : configuration.site().buses()) {
            Optional<Path> pty = endpoints.stream().filter(e -> e.portId().equals(bus.id())).findFirst()
                    .flatMap(Endpoint::pty);
            if (pty.isEmpty()) {
                buses.add(bus);
                continue;
            }
            SourcePosition at = bus.transport().position();
            ConfigNode.Mapping settings = new ConfigNode.Mapping(List.of(entry("kind", "serial", at),
                    entry("port", pty.get().toString(), at), entry("baud", "9600", at)), at);
            buses.add(new BusDef(bus.id(), new TransportDef("serial", settings, at), bus.instruments(),
                    bus.position()));
        }
        SiteDef site = configuration.site();
        SiteDef pointed = new SiteDef(site.name(), site.ambientPressurePa(), buses, site.channels(), site.derived(),
                site.outputs(), site.sections(), site.timeZone(), site.position());
        return new Configuration(pointed, configuration.rules(), configuration.siteFile(), configuration.ruleFiles());
    }

    private static ConfigNode.Entry entry(String key, String value, SourcePosition at) {
        return new ConfigNode.Entry(key, at, new ConfigNode.Scalar(value, false, at));
    }
}
