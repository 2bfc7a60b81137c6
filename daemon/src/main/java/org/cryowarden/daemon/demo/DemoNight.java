package org.cryowarden.daemon.demo;

import java.io.IOException;
import java.io.PrintWriter;
import java.net.InetAddress;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.OptionalDouble;
import java.util.Set;
import java.util.concurrent.ConcurrentLinkedQueue;
import java.util.concurrent.atomic.AtomicLong;
import java.util.stream.Stream;
import org.cryowarden.daemon.run.Daemon;
import org.cryowarden.daemon.run.DaemonSettings;
import org.cryowarden.daemon.run.OperatorCommand;
import org.cryowarden.daemon.run.Recorded;
import org.cryowarden.daemon.run.SiteSetup;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
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
import org.cryowarden.simulator.emulators.PortSpec;
import org.cryowarden.simulator.scenario.Scenario;
import org.cryowarden.simulator.scenario.ScenarioReader;

/**
 * An accelerated night: the simulator's scenario on TCP ports, the daemon on the example site pointed at them,
 * one virtual clock for both. Each simulated step moves the physics and the clock, lets every bus poll what is
 * due, lets the engine evaluate, and waits for the journal; real time is only used to pace the night at
 * {@code speed} simulated seconds per real second. A scripted night operator ({@value #OPERATOR}, role operator in
 * the example site's {@code operators}) acknowledges each alarm a few simulated minutes after it is raised, and the
 * lab lead ({@value #SUPERVISOR}, a supervisor) resets tripped interlocks once their cause is clear.
 */
public final class DemoNight {

    /** The example site's channel and room the summary reports on. */
    static final String LOWEST_OXYGEN = "o2-magnet-hall-lowest";
    static final String ROOM = "magnet-hall";
    /** Who acknowledges and who resets: operators of the example site, checked like any other. */
    static final String OPERATOR = "duty-1";
    static final String SUPERVISOR = "lab-lead";
    static final Duration ACK_AFTER = Duration.ofMinutes(3);

    private static final DateTimeFormatter CLOCK = DateTimeFormatter.ofPattern("HH:mm:ss").withZone(ZoneOffset.UTC);

    /**
     * How to run.
     *
     * @param scenario  a short scenario name ({@code quench}) or a scenario file
     * @param speed     simulated seconds per real second; infinite runs as fast as the machine can
     * @param mqttPort  the embedded broker's port (the first free one from it upward when not given exactly)
     * @param broker    an existing broker instead of the embedded one
     * @param journal   where to keep the night's journal; a temporary file otherwise
     * @param duration  how much of the scenario to run; the whole scenario when empty
     * @param terminal  redraw a live table (a terminal) or print progress lines (CI, a pipe)
     */
    public record Settings(String scenario, double speed, int mqttPort, boolean exactPort, Optional<String> broker,
                           Optional<Path> journal, Optional<Duration> duration, boolean terminal) {
    }

    private final Settings settings;
    private final PrintWriter out;
    private final AtomicLong raised = new AtomicLong();
    private final AtomicLong acknowledged = new AtomicLong();
    private final AtomicLong trips = new AtomicLong();
    private final AtomicLong resets = new AtomicLong();
    private final AtomicLong events = new AtomicLong();
    private final ConcurrentLinkedQueue<String> newLines = new ConcurrentLinkedQueue<>();
    private final ConcurrentLinkedQueue<String> raisedAlarms = new ConcurrentLinkedQueue<>();
    private final ConcurrentLinkedQueue<String> trippedInterlocks = new ConcurrentLinkedQueue<>();
    private final ConcurrentLinkedQueue<String> resetInterlocks = new ConcurrentLinkedQueue<>();
    private final Map<String, String> activeAlarms = new java.util.concurrent.ConcurrentHashMap<>();
    private final ArrayDeque<String> recent = new ArrayDeque<>();

    public DemoNight(Settings settings, PrintWriter out) {
        this.settings = settings;
        this.out = out;
    }

    /** Runs the night and returns its summary. */
    public DemoSummary run() throws IOException, ConfigException, Daemon.StartException, InterruptedException {
        Path work = Files.createTempDirectory("cryowarden-demo-");
        try {
            return runIn(work);
        } finally {
            deleteQuietly(work);
        }
    }

    private DemoSummary runIn(Path work) throws IOException, ConfigException, Daemon.StartException,
            InterruptedException {
        Optional<String> resource = DemoFiles.scenarioResource(settings.scenario());
        Path examples = DemoFiles.copy(work, resource.orElse("harbour-hall-quench-scenario.yaml"));
        Path scenarioFile = resource.map(examples::resolve).orElse(Path.of(settings.scenario()));
        Scenario scenario = unpaced(ScenarioReader.read(scenarioFile));
        VirtualTimeSource clock = new VirtualTimeSource(scenario.start());
        Path site = examples.resolve(DemoFiles.SITE);
        List<Path> rules = List.of(examples.resolve(DemoFiles.RULES));
        DriverCatalog catalog = DriverCatalog.discover(DemoNight.class.getClassLoader(), Optional.empty());
        Configuration loaded = SiteSetup.load(site, rules, catalog, clock);
        try (Simulator simulator = Simulator.create(scenario, clock, false)) {
            List<Endpoint> endpoints = simulator.startEmulators(new EmulatorOptions(InetAddress.getLoopbackAddress(),
                    Optional.empty(), Optional.empty()));
            Configuration configuration = pointAt(loaded, endpoints);
            DaemonSettings daemonSettings = DaemonSettings.read(configuration.site(), examples)
                    .withBroker(settings.broker(), settings.mqttPort())
                    .withJournal(settings.journal().orElse(work.resolve("demo-journal.db")))
                    .withApi(Optional.empty(), Optional.empty())
                    .withMaxInterval(Duration.ofMinutes(1));
            Daemon.Options driven = Daemon.Options.defaults().driven();
            // Driven, the engine ticks once per simulated step: the tick period the journal records for replay.
            Daemon.Options options = new Daemon.Options(Daemon.Mode.DRIVEN, !settings.exactPort(), scenario.step(),
                    driven.writeTimeout(), driven.backoff());
            try (Daemon daemon = Daemon.start(site, rules, configuration, daemonSettings, catalog, clock, options)) {
                daemon.addListener(this::committed);
                return night(simulator, daemon, scenario, clock, endpoints);
            }
        }
    }

    private DemoSummary night(Simulator simulator, Daemon daemon, Scenario scenario, VirtualTimeSource clock,
            List<Endpoint> endpoints) throws InterruptedException {
        String port = daemon.brokerUri().substring(daemon.brokerUri().lastIndexOf(':') + 1);
        out.println("cryowarden demo: " + scenario.name() + " (" + scenario.source() + ")");
        out.println(Caution.TEXT);
        out.println("Simulated instruments: " + endpoints.stream().map(e -> e.portId() + " tcp " + e.host() + ":"
                + e.tcpPort()).reduce((a, b) -> a + ", " + b).orElse("none"));
        out.println("MQTT broker: " + daemon.brokerUri() + (settings.broker().isPresent() ? "" : " (embedded)")
                + "; topics under " + daemon.prefix() + "/");
        out.println("Watch it:    mosquitto_sub -h 127.0.0.1 -p " + port + " -t 'cryowarden/#' -v");
        out.println("Journal:     " + daemon.journalFile());
        // The scripted operators' commands are checked like anyone's: say so at once if the site would refuse them.
        daemon.settings().operators().refusal("ack", OPERATOR).or(() -> daemon.settings().operators()
                .refusal("reset", SUPERVISOR)).ifPresent(refusal -> out.println("Operators:   the scripted"
                        + " acknowledgements and resets will be refused: " + refusal));
        out.flush();
        Duration length = settings.duration().orElse(scenario.duration());
        long steps = Math.max(1, length.toNanos() / scenario.step().toNanos());
        double stepSeconds = scenario.step().toNanos() / 1e9;
        long realStart = System.nanoTime();
        long lastDraw = 0;
        Instant nextProgress = clock.wallNow();
        Map<String, Instant> ackDue = new LinkedHashMap<>();
        Instant nextResetTry = clock.wallNow();
        Set<String> tripped = new LinkedHashSet<>();
        OptionalDouble lowest = OptionalDouble.empty();
        for (long i = 0; i < steps; i++) {
            simulator.step();
            daemon.step();
            daemon.awaitQuiet(Duration.ofSeconds(5));
            Instant now = clock.wallNow();
            String alarm;
            while ((alarm = raisedAlarms.poll()) != null) {
                ackDue.put(alarm, now.plus(ACK_AFTER));
            }
            String interlock;
            while ((interlock = trippedInterlocks.poll()) != null) {
                tripped.add(interlock);
            }
            while ((interlock = resetInterlocks.poll()) != null) {
                tripped.remove(interlock);
            }
            for (var due : new ArrayList<>(ackDue.entrySet())) {
                if (!now.isBefore(due.getValue())) {
                    ackDue.remove(due.getKey());
                    daemon.command(new OperatorCommand("ack", due.getKey(), OPERATOR, "seen on the demo console",
                            Optional.empty(), ""));
                }
            }
            if (!tripped.isEmpty() && !now.isBefore(nextResetTry)) {
                nextResetTry = now.plus(Duration.ofMinutes(5));
                for (String id : tripped) {
                    daemon.command(new OperatorCommand("reset", id, SUPERVISOR, "", Optional.empty(), ""));
                }
            }
            Reading o2 = daemon.latestReadings().get(LOWEST_OXYGEN);
            if (o2 != null && o2.quality() == Quality.GOOD
                    && (lowest.isEmpty() || o2.value() < lowest.getAsDouble())) {
                lowest = OptionalDouble.of(o2.value());
            }
            long nowReal = System.nanoTime();
            if (settings.terminal()) {
                if (nowReal - lastDraw > 250_000_000L || i == steps - 1) {
                    lastDraw = nowReal;
                    draw(daemon, scenario, clock, length, i + 1, steps);
                }
            } else {
                String line;
                while ((line = newLines.poll()) != null) {
                    out.println("  " + line);
                }
                if (!now.isBefore(nextProgress) || i == steps - 1) {
                    nextProgress = now.plus(Duration.ofMinutes(10));
                    out.println(progress(scenario, clock, length, daemon));
                }
                out.flush();
            }
            if (Double.isFinite(settings.speed())) {
                long due = realStart + Math.round((i + 1) * stepSeconds / settings.speed() * 1e9);
                long wait = due - System.nanoTime();
                if (wait > 0) {
                    Thread.sleep(wait / 1_000_000, (int) (wait % 1_000_000));
                }
            }
        }
        daemon.awaitQuiet(Duration.ofSeconds(10));
        Double trueLowest = simulator.lowestOxygenPercent().get(ROOM);
        DemoSummary summary = new DemoSummary(length, Duration.ofNanos(System.nanoTime() - realStart), raised.get(),
                acknowledged.get(), trips.get(), resets.get(), events.get(), lowest,
                trueLowest == null ? OptionalDouble.empty() : OptionalDouble.of(trueLowest));
        out.println();
        out.println(summary.text());
        out.println(Caution.TEXT);
        out.flush();
        return summary;
    }

    private void committed(Recorded batch) {
        for (int i = 0; i < batch.events().size(); i++) {
            var event = batch.events().get(i);
            events.incrementAndGet();
            String subject = event.subject().orElse("");
            switch (event.kind()) {
                case "alarm.raised" -> {
                    raised.incrementAndGet();
                    raisedAlarms.add(subject);
                }
                case "alarm.acknowledged" -> acknowledged.incrementAndGet();
                case "interlock.tripped" -> {
                    trips.incrementAndGet();
                    trippedInterlocks.add(subject);
                }
                case "interlock.reset" -> {
                    resets.incrementAndGet();
                    resetInterlocks.add(subject);
                }
                default -> {
                }
            }
            if (!event.kind().equals("output.command") && !event.kind().equals("daemon.started")) {
                String line = CLOCK.format(event.at()) + "  " + event.kind() + " " + subject
                        + event.operator().map(o -> " by " + o).orElse("");
                newLines.add(line);
                synchronized (recent) {
                    recent.addLast(line);
                    while (recent.size() > 8) {
                        recent.removeFirst();
                    }
                }
            }
        }
        batch.alarms().forEach((id, doc) -> {
            String state = doc.path("state").asText();
            if (state.equals("normal")) {
                activeAlarms.remove(id);
            } else {
                activeAlarms.put(id, String.format(Locale.ROOT, "%-28s %-24s %s", id, state,
                        doc.path("priority").asText()));
            }
        });
    }

    private String progress(Scenario scenario, VirtualTimeSource clock, Duration length, Daemon daemon) {
        Duration elapsed = Duration.between(scenario.start(), clock.wallNow());
        Reading o2 = daemon.latestReadings().get(LOWEST_OXYGEN);
        return String.format(Locale.ROOT, "%s  simulated %s of %s  x%s  oxygen %s  active alarms %d",
                CLOCK.format(clock.wallNow()), hm(elapsed), hm(length), speedText(), o2 == null ? "-"
                        : String.format(Locale.ROOT, "%.2f %%vol", o2.value()), activeAlarms.size());
    }

    private void draw(Daemon daemon, Scenario scenario, VirtualTimeSource clock, Duration length, long step,
            long steps) {
        StringBuilder frame = new StringBuilder("\033[H\033[2J");
        frame.append("cryowarden demo - ").append(scenario.name()).append("   (Ctrl-C to stop)\n");
        frame.append(Caution.SHORT).append('\n');
        frame.append("MQTT ").append(daemon.brokerUri()).append("  topics ").append(daemon.prefix()).append("/#\n\n");
        frame.append(String.format(Locale.ROOT, "%-26s %12s %-7s %s%n", "CHANNEL", "VALUE", "UNIT", "QUALITY"));
        Map<String, Reading> latest = daemon.latestReadings();
        Stream.concat(daemon.configuration().site().channels().stream().map(c -> c.id()),
                daemon.configuration().site().derived().stream().map(c -> c.id())).forEach(id -> {
                    Reading r = latest.get(id);
                    frame.append(String.format(Locale.ROOT, "%-26s %12s %-7s %s%n", id,
                            r == null || !Double.isFinite(r.value()) ? "-" : format(r.value()),
                            r == null ? "" : r.unit().symbol(),
                            r == null ? "waiting" : r.quality().name().toLowerCase(Locale.ROOT)
                                    + (r.reason().isEmpty() ? "" : " (" + shorten(r.reason()) + ")")));
                });
        frame.append("\nACTIVE ALARMS\n");
        if (activeAlarms.isEmpty()) {
            frame.append("  none\n");
        }
        activeAlarms.values().stream().sorted(Comparator.naturalOrder())
                .forEach(a -> frame.append("  ").append(a).append('\n'));
        frame.append("\nRECENT EVENTS\n");
        synchronized (recent) {
            recent.forEach(line -> frame.append("  ").append(line).append('\n'));
        }
        int width = 40;
        int filled = (int) (width * step / steps);
        frame.append('\n').append('[').append("#".repeat(filled)).append(" ".repeat(width - filled)).append("] ")
                .append(progress(scenario, clock, length, daemon)).append('\n');
        out.print(frame);
        out.flush();
        newLines.clear();
    }

    private String speedText() {
        return Double.isFinite(settings.speed()) ? String.format(Locale.ROOT, "%.0f", settings.speed()) : "max";
    }

    private static String format(double value) {
        double magnitude = Math.abs(value);
        if (magnitude != 0 && (magnitude < 0.01 || magnitude >= 1e5)) {
            return String.format(Locale.ROOT, "%.2e", value);
        }
        return String.format(Locale.ROOT, "%.3f", value);
    }

    private static String shorten(String text) {
        return text.length() > 40 ? text.substring(0, 39) + "…" : text;
    }

    private static String hm(Duration duration) {
        return String.format(Locale.ROOT, "%02d:%02d", duration.toHours(), duration.toMinutesPart());
    }

    /** The scenario with every port answering at once: the night is accelerated, line timing would stall it. */
    static Scenario unpaced(Scenario scenario) {
        List<PortSpec> ports = new ArrayList<>();
        for (PortSpec port : scenario.ports()) {
            ports.add(new PortSpec(port.id(), 0, port.pty(), port.baud(), port.bitsPerByte(), false,
                    port.instrumentIds()));
        }
        return new Scenario(scenario.name(), scenario.source(), scenario.start(), scenario.duration(), scenario.step(),
                scenario.seed(), scenario.rooms(), scenario.vessels(), scenario.sensors(), ports,
                scenario.instruments(), scenario.timeline());
    }

    /** The configuration with each bus reaching the simulator's TCP port of the same id. */
    static Configuration pointAt(Configuration configuration, List<Endpoint> endpoints) {
        Map<String, Endpoint> byId = new LinkedHashMap<>();
        endpoints.forEach(e -> byId.put(e.portId(), e));
        List<BusDef> buses = new ArrayList<>();
        for (BusDef bus : configuration.site().buses()) {
            Endpoint endpoint = byId.get(bus.id());
            if (endpoint == null) {
                buses.add(bus);
                continue;
            }
            SourcePosition at = bus.transport().position();
            ConfigNode.Mapping settings = new ConfigNode.Mapping(List.of(
                    entry("kind", "tcp", at), entry("host", endpoint.host(), at),
                    entry("port", Integer.toString(endpoint.tcpPort()), at), entry("connect_timeout", "2s", at)), at);
            buses.add(new BusDef(bus.id(), new TransportDef("tcp", settings, at), bus.instruments(), bus.position()));
        }
        SiteDef site = configuration.site();
        SiteDef pointed = new SiteDef(site.name(), site.ambientPressurePa(), buses, site.channels(), site.derived(),
                site.outputs(), site.sections(), site.timeZone(), site.position());
        return new Configuration(pointed, configuration.rules(), configuration.siteFile(), configuration.ruleFiles());
    }

    private static ConfigNode.Entry entry(String key, String value, SourcePosition at) {
        return new ConfigNode.Entry(key, at, new ConfigNode.Scalar(value, false, at));
    }

    private static void deleteQuietly(Path folder) {
        try (Stream<Path> paths = Files.walk(folder)) {
            paths.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
        } catch (IOException e) {
            // a temporary folder; the system cleans it eventually
        }
    }
}
