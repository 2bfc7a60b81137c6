package org.cryowarden.simulator;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.locks.LockSupport;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.simulator.emulators.Instrument;
import org.cryowarden.simulator.emulators.PortServer;
import org.cryowarden.simulator.emulators.PortSpec;
import org.cryowarden.simulator.emulators.Protocol;
import org.cryowarden.simulator.emulators.PtyBridge;
import org.cryowarden.simulator.emulators.StreamingDevice;
import org.cryowarden.simulator.model.Actuators;
import org.cryowarden.simulator.model.Plant;
import org.cryowarden.simulator.model.PlantState;
import org.cryowarden.simulator.model.RoomState;
import org.cryowarden.simulator.model.VesselState;
import org.cryowarden.simulator.scenario.InstrumentDef;
import org.cryowarden.simulator.scenario.Scenario;
import org.cryowarden.simulator.scenario.ScenarioContext;
import org.cryowarden.simulator.scenario.ScenarioReader;
import org.cryowarden.simulator.scenario.SensorDef;
import org.cryowarden.simulator.scenario.TimelineEvent;
import org.cryowarden.simulator.sensors.Sensor;
import org.cryowarden.simulator.sensors.SensorBank;
import org.cryowarden.simulator.sensors.SensorSnapshot;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The simulator's public face: a scenario's plant, sensors and instruments stepped on a shared
 * {@link VirtualTimeSource}. Typical use by an in-process demo:
 *
 * <pre>{@code
 * Scenario scenario = ScenarioReader.read(path);
 * VirtualTimeSource clock = new VirtualTimeSource(scenario.start());
 * try (Simulator sim = Simulator.create(scenario, clock, false)) {
 *     List<Endpoint> endpoints = sim.startEmulators(EmulatorOptions.loopbackAnyPort());
 *     SimulationRun run = sim.start(Pace.times(240), scenario.duration());
 *     ... point the daemon at endpoints, read sim.state() ...
 *     run.await(Duration.ofMinutes(3));
 * }
 * }</pre>
 *
 * Each step applies the timeline events that are due, steps the physics, advances the clock by the scenario's
 * step, samples the sensors and publishes an immutable {@link PlantState} and {@link SensorSnapshot} for other
 * threads. Steps are taken by one thread at a time: the caller of {@link #step}/{@link #advance}, or the run
 * thread of {@link #start}. {@code standalone} says whether timeline entries marked {@code when: standalone}
 * apply (they stand in for a daemon's interlocks).
 */
public final class Simulator implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(Simulator.class);

    private final Scenario scenario;
    private final VirtualTimeSource clock;
    private final boolean standalone;
    private final Plant plant;
    private final SensorBank bank;
    private final Map<String, Instrument> instruments = new LinkedHashMap<>();
    private final Map<String, String> portOfInstrument = new LinkedHashMap<>();
    private final Map<String, PortServer> servers = new LinkedHashMap<>();
    private final Map<String, PtyBridge> bridges = new LinkedHashMap<>();
    private final List<StreamingDevice> streams = new ArrayList<>();
    private final List<StepListener> listeners = new CopyOnWriteArrayList<>();
    private final List<String> eventLog = Collections.synchronizedList(new ArrayList<>());
    private final Map<String, Double> lowestOxygen = new LinkedHashMap<>();
    private final Map<String, Double> highestPressure = new LinkedHashMap<>();
    private final Object stepLock = new Object();
    private final double stepSeconds;
    private int nextEvent;
    private long steps;
    private volatile PlantState state;
    private volatile SensorSnapshot sensors;
    private volatile SimulationRun run;

    private Simulator(Scenario scenario, VirtualTimeSource clock, boolean standalone) {
        this.scenario = scenario;
        this.clock = clock;
        this.standalone = standalone;
        this.stepSeconds = scenario.step().toNanos() / 1e9;
        this.plant = new Plant(scenario.rooms(), scenario.vessels(), new Actuators());
        List<Sensor> built = new ArrayList<>();
        for (SensorDef def : scenario.sensors()) {
            built.add(def.create(plant, scenario.seed()));
        }
        this.bank = new SensorBank(built);
        for (InstrumentDef def : scenario.instruments()) {
            Instrument instrument = def.create(plant, scenario.seed());
            instruments.put(def.id(), instrument);
            portOfInstrument.put(def.id(), def.portId());
            if (instrument instanceof StreamingDevice stream) {
                streams.add(stream);
            }
        }
        this.sensors = bank.sample(clock.wallNow(), 0, stepSeconds);
        this.state = plant.snapshot(clock.wallNow());
        track(state);
    }

    /** A simulator for a scenario file. */
    public static Simulator load(Path scenarioFile, VirtualTimeSource clock, boolean standalone)
            throws ConfigException {
        return create(ScenarioReader.read(scenarioFile), clock, standalone);
    }

    /** A simulator for a scenario, sharing {@code clock} with whoever else reads it. */
    public static Simulator create(Scenario scenario, VirtualTimeSource clock, boolean standalone) {
        return new Simulator(scenario, clock, standalone);
    }

    public Scenario scenario() {
        return scenario;
    }

    public VirtualTimeSource clock() {
        return clock;
    }

    /**
     * Opens every port of the scenario on TCP (and on a pseudo-terminal where asked) and returns where each one
     * is. Ports are opened in file order; a port that cannot be opened closes the ones already open.
     *
     * @throws IOException when a TCP port is taken, socat is missing or a pty does not appear
     */
    public List<Endpoint> startEmulators(EmulatorOptions options) throws IOException {
        List<Endpoint> endpoints = new ArrayList<>();
        int next = options.tcpBasePort().orElse(-1);
        try {
            if (options.ptyDirectory().isPresent()) {
                Files.createDirectories(options.ptyDirectory().get());
            }
            for (PortSpec spec : scenario.ports()) {
                List<Instrument> members = new ArrayList<>();
                for (String id : spec.instrumentIds()) {
                    members.add(instruments.get(id));
                }
                PortServer server = new PortServer(spec, members, () -> sensors);
                int tcp = next < 0 ? spec.tcpPort() : next == 0 ? 0 : next++;
                server.start(options.bindAddress(), tcp);
                servers.put(spec.id(), server);
                Optional<Path> pty = Optional.empty();
                if (spec.pty() && options.ptyDirectory().isPresent()) {
                    Path link = options.ptyDirectory().get().resolve(spec.id());
                    PtyBridge bridge = new PtyBridge(link, options.bindAddress().getHostAddress(), server.port());
                    bridge.start();
                    bridges.put(spec.id(), bridge);
                    pty = Optional.of(link);
                }
                endpoints.add(new Endpoint(spec.id(), protocolName(server.protocol()),
                        options.bindAddress().getHostAddress(), server.port(), pty, spec.instrumentIds()));
            }
        } catch (IOException | RuntimeException e) {
            closeEmulators();
            throw e;
        }
        return endpoints;
    }

    private static String protocolName(Protocol protocol) {
        return switch (protocol) {
            case MODBUS_RTU -> "modbus-rtu";
            case SCPI -> "scpi";
            case LINE -> "line";
        };
    }

    public void addStepListener(StepListener listener) {
        listeners.add(listener);
    }

    /** Takes one step of the scenario's step length. */
    public void step() {
        synchronized (stepLock) {
            applyDueEvents();
            plant.step(stepSeconds);
            clock.advance(scenario.step());
            steps++;
            SensorSnapshot snapshot = bank.sample(clock.wallNow(), plant.elapsedSeconds(), stepSeconds);
            PlantState after = plant.snapshot(clock.wallNow());
            sensors = snapshot;
            state = after;
            track(after);
            for (StreamingDevice stream : streams) {
                Optional<String> line = stream.lineDue(snapshot);
                PortServer server = servers.get(portOfInstrument.get(stream.id()));
                if (line.isPresent() && server != null) {
                    server.publish(stream, line.get());
                }
            }
            for (StepListener listener : listeners) {
                listener.afterStep(after, snapshot);
            }
        }
    }

    /** Steps as fast as possible until {@code duration} more has passed. */
    public void advance(Duration duration) {
        long count = stepsIn(duration);
        for (long i = 0; i < count; i++) {
            step();
        }
    }

    private long stepsIn(Duration duration) {
        return Math.max(0, Math.round(duration.toNanos() / (double) scenario.step().toNanos()));
    }

    /** Runs {@code duration} of the scenario on a thread of its own at {@code pace}. */
    public SimulationRun start(Pace pace, Duration duration) {
        if (run != null && !run.isFinished()) {
            throw new IllegalStateException("the simulation is already running");
        }
        SimulationRun handle = new SimulationRun();
        long count = stepsIn(duration);
        handle.start(() -> {
            long realStart = System.nanoTime();
            for (long i = 0; i < count && !handle.stopRequested(); i++) {
                step();
                if (!pace.isFast()) {
                    long due = realStart + Math.round((i + 1) * stepSeconds / pace.speed() * 1e9);
                    long wait;
                    while ((wait = due - System.nanoTime()) > 0 && !handle.stopRequested()) {
                        LockSupport.parkNanos(wait);
                    }
                }
            }
        });
        run = handle;
        return handle;
    }

    private void applyDueEvents() {
        double now = plant.elapsedSeconds();
        List<TimelineEvent> timeline = scenario.timeline();
        while (nextEvent < timeline.size() && timeline.get(nextEvent).at().toNanos() / 1e9 <= now + 1e-9) {
            TimelineEvent event = timeline.get(nextEvent++);
            if (event.standaloneOnly() && !standalone) {
                eventLog.add(event.describe() + " (skipped: standalone only)");
                continue;
            }
            try {
                event.effect().apply(context);
                eventLog.add(event.describe());
                LOG.info("scenario {}: {}", scenario.name(), event.describe());
            } catch (IOException e) {
                eventLog.add(event.describe() + " (failed: " + e.getMessage() + ")");
                LOG.warn("scenario {}: {} failed: {}", scenario.name(), event.describe(), e.getMessage());
            }
        }
    }

    private final ScenarioContext context = new ScenarioContext() {
        @Override
        public Plant plant() {
            return plant;
        }

        @Override
        public double now() {
            return plant.elapsedSeconds();
        }

        @Override
        public Optional<Instrument> instrument(String id) {
            return Optional.ofNullable(instruments.get(id));
        }

        @Override
        public void setPortDisconnected(String instrumentId, boolean down) throws IOException {
            Simulator.this.setPortDisconnected(portOfInstrument.get(instrumentId), down);
        }
    };

    /**
     * The timeline's {@code disconnect} fault for a whole port, for tests that script it themselves: the line's
     * device server drops every connection and refuses new ones, and its pseudo-terminal, if any, disappears (a
     * USB adapter pulled); {@code false} brings both back, the pseudo-terminal on the same link path.
     */
    public void setPortDisconnected(String portId, boolean down) throws IOException {
        PortServer server = servers.get(portId);
        if (server != null) {
            server.setDisconnected(down);
        }
        PtyBridge bridge = bridges.get(portId);
        if (bridge != null) {
            bridge.setSuspended(down);
        }
    }

    private void track(PlantState after) {
        for (RoomState room : after.rooms()) {
            lowestOxygen.merge(room.id(), room.oxygenPercent(), Math::min);
        }
        for (VesselState vessel : after.vessels()) {
            highestPressure.merge(vessel.id(), vessel.pressurePascal(), Math::max);
        }
    }

    /** The true state after the last step (thread-safe). */
    public PlantState state() {
        return state;
    }

    /** The sensors' readings after the last step (thread-safe). */
    public SensorSnapshot sensors() {
        return sensors;
    }

    public Duration elapsed() {
        return state.elapsed();
    }

    public long steps() {
        return steps;
    }

    public Optional<Instrument> instrument(String id) {
        return Optional.ofNullable(instruments.get(id));
    }

    /** The emulator of a port, once started, for tests that look at its counters. */
    public Optional<PortServer> port(String portId) {
        return Optional.ofNullable(servers.get(portId));
    }

    /**
     * The pseudo-terminal of a port, once started, for tests that pull only the USB adapter while the instruments
     * behind it stay powered ({@link PtyBridge#setSuspended}).
     */
    public Optional<PtyBridge> pty(String portId) {
        return Optional.ofNullable(bridges.get(portId));
    }

    /** The timeline events applied so far, as "HH:MM:SS action target". */
    public List<String> eventLog() {
        synchronized (eventLog) {
            return List.copyOf(eventLog);
        }
    }

    /** The lowest true oxygen so far per room, %vol. */
    public Map<String, Double> lowestOxygenPercent() {
        synchronized (stepLock) {
            return Map.copyOf(lowestOxygen);
        }
    }

    /** The highest true bath pressure so far per vessel, Pa absolute. */
    public Map<String, Double> highestPressurePascal() {
        synchronized (stepLock) {
            return Map.copyOf(highestPressure);
        }
    }

    /** The physics, for tests that script it directly (simulation thread only). */
    public Plant plant() {
        return plant;
    }

    private void closeEmulators() {
        for (PtyBridge bridge : bridges.values()) {
            bridge.close();
        }
        bridges.clear();
        for (PortServer server : servers.values()) {
            server.close();
        }
        servers.clear();
    }

    /** Stops a run, the emulators and every socat process started. Idempotent. */
    @Override
    public void close() {
        SimulationRun current = run;
        if (current != null) {
            current.stop();
        }
        closeEmulators();
    }
}
