package org.cryowarden.daemon.run;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import io.micrometer.core.instrument.Gauge;
import io.micrometer.core.instrument.MeterRegistry;
import io.micrometer.prometheusmetrics.PrometheusConfig;
import io.micrometer.prometheusmetrics.PrometheusMeterRegistry;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.locks.ReentrantLock;
import org.cryowarden.daemon.broker.BrokerStartException;
import org.cryowarden.daemon.broker.EmbeddedBroker;
import org.cryowarden.daemon.broker.PortChoice;
import org.cryowarden.daemon.history.HistoryRecorder;
import org.cryowarden.daemon.journal.AlarmStateRecord;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.daemon.journal.JournalSettings;
import org.cryowarden.daemon.mqtt.MqttLink;
import org.cryowarden.daemon.mqtt.MqttLinkSettings;
import org.cryowarden.daemon.notify.NotifyService;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.drivers.site.SiteDrivers;
import org.cryowarden.drivers.poll.Backoff;
import org.cryowarden.drivers.poll.BusPoller;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.config.Configuration;
import org.cryowarden.rules.engine.AlarmStatus;
import org.cryowarden.rules.engine.Engine;
import org.cryowarden.rules.engine.EngineConfig;
import org.cryowarden.rules.engine.EngineSnapshot;
import org.cryowarden.rules.engine.InterlockStatus;
import org.cryowarden.rules.model.BusDef;
import org.cryowarden.rules.model.InstrumentDef;
import org.cryowarden.rules.model.PointDef;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The running program: one poller per bus, the engine thread, and the sinks behind their queues (journal first,
 * then MQTT; outputs to the owning drivers). Built by {@link #start}, stopped by {@link #close}.
 *
 * <p>Startup order: open the journal, start the embedded broker if the site names none, build the engine,
 * restore alarm states, latched trips and bypasses from the journal, then start the sinks, the engine and, last,
 * the pollers, so the first poll meets a restored engine. In {@link Mode#DRIVEN} (the demo's accelerated night)
 * no poller or engine thread is started: the caller moves a virtual clock and calls {@link #step()}.
 */
public final class Daemon implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(Daemon.class);

    /** Whether the daemon runs its own poller and engine threads, or a caller drives it. */
    public enum Mode { THREADS, DRIVEN }

    /** How to start, besides the configuration. */
    public record Options(Mode mode, boolean searchFreeBrokerPort, Duration tickEvery, Duration writeTimeout,
                          Backoff backoff) {
        public static Options defaults() {
            return new Options(Mode.THREADS, false, Duration.ofMillis(100), Duration.ofSeconds(5), Backoff.DEFAULT);
        }

        public Options driven() {
            return new Options(Mode.DRIVEN, true, tickEvery, writeTimeout, backoff);
        }
    }

    /** Startup failed for a reason an operator can act on (broker port taken, journal unwritable). */
    public static final class StartException extends Exception {
        public StartException(String message, Throwable cause) {
            super(message, cause);
        }
    }

    private final Path siteFile;
    private final List<Path> ruleFiles;
    private final DriverCatalog catalog;
    private final TimeSource time;
    private final Options options;
    private final DaemonSettings settings;
    private final Journal journal;
    private final Optional<EmbeddedBroker> broker;
    private final String brokerUri;
    private final EngineLoop loop;
    private final JournalSink journalSink;
    /** Holds the pollers and the readings publisher back while an alarm is on its way to the journal. */
    private final AlarmPathGate alarmPath;
    private final MqttBridge bridge;
    private final OutputWriter outputs;
    private final HistoryRecorder history;
    private volatile Optional<NotifyService> notifications;
    /**
     * Held while the notifiers are replaced and, in driven mode, while a step runs their due work: a reload runs on
     * the thread that asked for it, and a new service must not escalate before its resume has replayed the
     * journal, nor the old one deliver while it closes.
     */
    private final ReentrantLock notifyTurn = new ReentrantLock();
    private final Optional<CommonAlarmContact> contact;
    private final Watchdog watchdog;
    private final SystemdNotify systemd;
    private final java.util.concurrent.atomic.AtomicLong eventsRecorded = new java.util.concurrent.atomic.AtomicLong();
    private volatile ObjectNode lastSummary = Payloads.object();
    private final PrometheusMeterRegistry metrics = new PrometheusMeterRegistry(PrometheusConfig.DEFAULT);
    private final List<java.util.function.Consumer<Recorded>> listeners = new CopyOnWriteArrayList<>();
    private final Instant started;
    private volatile Configuration configuration;
    private volatile List<BusPoller> pollers;
    private volatile Map<String, Reading> latest = new java.util.concurrent.ConcurrentHashMap<>();
    private boolean closed;

    private Daemon(Path siteFile, List<Path> ruleFiles, Configuration configuration, DaemonSettings settings,
            NightSettings night, SystemdNotify systemd, DriverCatalog catalog, TimeSource time, Options options,
            Journal journal, Optional<EmbeddedBroker> broker) throws StartException {
        this.siteFile = siteFile;
        this.systemd = systemd;
        this.ruleFiles = List.copyOf(ruleFiles);
        this.configuration = configuration;
        this.settings = settings;
        this.catalog = catalog;
        this.time = time;
        this.options = options;
        this.journal = journal;
        this.broker = broker;
        this.brokerUri = broker.map(EmbeddedBroker::serverUri).orElseGet(() -> settings.broker().orElseThrow());
        this.started = time.wallNow();
        Engine engine = new Engine(EngineConfig.of(configuration.site(), configuration.rules()), time);
        try {
            this.history = HistoryRecorder.open(journal.history(), settings.history());
        } catch (JournalException e) {
            throw new StartException(e.getMessage(), e);
        }
        LOG.info("{}", history.restartNote());
        this.journalSink = new JournalSink(journal, settings.prefix() + "/event");
        JournalSink sink = journalSink;
        this.alarmPath = new AlarmPathGate(() -> !sink.idle());
        OutputWriterRef outputRef = new OutputWriterRef();
        MqttBridgeRef bridgeRef = new MqttBridgeRef();
        this.loop = new EngineLoop(engine, configuration.site(), time, options.tickEvery(), new EngineLoop.Sinks() {
            @Override
            public void batch(EventBatch batch) {
                journalSink.offer(batch);
                alarmPath.entered();
            }

            @Override
            public void reading(Reading reading) {
                latest.put(reading.channel(), reading);
                bridgeRef.bridge.offerReading(reading);
            }

            @Override
            public void output(org.cryowarden.rules.engine.OutputCommand command) {
                outputRef.writer.offer(command);
            }

            @Override
            public void taken(Reading reading, Instant at) {
                history.record(reading, at);
            }

            @Override
            public void ticked(Instant at) {
                history.tick(at);
            }
        });
        this.outputs = new OutputWriter(Map.of(), options.writeTimeout(), loop::outputResult);
        outputRef.writer = outputs;
        String version = DaemonVersion.current();
        String online = Payloads.text(Payloads.status("online", "running", version, Optional.of(started)));
        String will = Payloads.text(Payloads.status("offline", "connection lost", version, Optional.of(started)));
        MqttLinkSettings link = MqttLinkSettings.of(brokerUri, settings.clientId(), settings.prefix() + "/status",
                online, will).withTls(settings.tls());
        if (settings.username().isPresent()) {
            link = link.withCredentials(settings.username().get(), settings.mqttPassword());
        }
        this.bridge = new MqttBridge(new MqttLink(link), settings.prefix(), journal, time,
                new ReportByException(settings.deadbands(), settings.maxInterval()), this::command,
                this::commandRefused);
        bridgeRef.bridge = bridge;
        bridge.yieldTo(alarmPath);
        journalSink.addListener(bridge);
        this.notifications = night.notifiers().map(setup -> setup.service(journal, time, configuration.site().name()));
        this.contact = night.commonAlarm().map(c -> new CommonAlarmContact(c, time, outputs::offer));
        journalSink.addListener(committed -> {
            eventsRecorded.addAndGet(committed.seqs().stream().filter(java.util.OptionalLong::isPresent).count());
            if (committed.batch().summary().has("active")) {
                lastSummary = committed.batch().summary();
                contact.ifPresent(c -> c.summary(committed.batch().summary()));
            }
            notifications.ifPresent(n -> n.accept(committed.batch().events(), committed.seqs()));
        });
        this.watchdog = new Watchdog(time, night, systemd, new WatchdogParts());
        journalSink.addListener(committed -> {
            Recorded recorded = new Recorded(committed.batch().events(), committed.seqs(), committed.batch().alarms());
            listeners.forEach(l -> l.accept(recorded));
        });
        restore();
        notifications.ifPresent(Daemon::resumeEscalations);
        this.pollers = SiteDrivers.pollers(configuration.site(), catalog, time, loop::offer, options.backoff());
        outputs.owners(owners(pollers, configuration));
        registerMetrics();
    }

    private static final class OutputWriterRef {
        OutputWriter writer;
    }

    private static final class MqttBridgeRef {
        MqttBridge bridge;
    }

    /**
     * Starts the daemon on a loaded configuration.
     *
     * @throws StartException when the journal cannot be opened or the embedded broker cannot start
     */
    public static Daemon start(Path siteFile, List<Path> ruleFiles, Configuration configuration,
            DaemonSettings settings, DriverCatalog catalog, TimeSource time, Options options) throws StartException {
        NightSettings night;
        try {
            night = NightSettings.read(configuration, siteFolder(siteFile));
        } catch (ConfigException e) {
            throw new StartException(e.problems().stream().map(ConfigProblem::toString)
                    .collect(java.util.stream.Collectors.joining("; ")), e);
        }
        return start(siteFile, ruleFiles, configuration, settings, night, catalog, time, options);
    }

    /**
     * Starts the daemon with its notifiers, watchdog and common-alarm contact as read by
     * {@link NightSettings#read}. Under systemd ({@code NOTIFY_SOCKET} set) and with its own threads, it tells
     * systemd {@code READY=1}, {@code WATCHDOG=1} while healthy and {@code STOPPING=1}.
     */
    public static Daemon start(Path siteFile, List<Path> ruleFiles, Configuration configuration,
            DaemonSettings settings, NightSettings night, DriverCatalog catalog, TimeSource time, Options options)
            throws StartException {
        return start(siteFile, ruleFiles, configuration, settings, night, options.mode() == Mode.THREADS
                ? SystemdNotify.fromEnvironment(System.getenv()) : SystemdNotify.none(), catalog, time, options);
    }

    static Daemon start(Path siteFile, List<Path> ruleFiles, Configuration configuration, DaemonSettings settings,
            NightSettings night, SystemdNotify systemd, DriverCatalog catalog, TimeSource time, Options options)
            throws StartException {
        Journal journal;
        try {
            journal = Journal.open(settings.journalPath(),
                    JournalSettings.defaults().withAggregateRetention(settings.retention()));
        } catch (JournalException e) {
            throw new StartException(e.getMessage(), e);
        }
        Optional<EmbeddedBroker> broker = Optional.empty();
        if (settings.broker().isEmpty()) {
            try {
                PortChoice choice = options.searchFreeBrokerPort() ? PortChoice.firstFreeFrom(settings.embeddedPort())
                        : PortChoice.exactly(settings.embeddedPort());
                broker = Optional.of(EmbeddedBroker.start(choice, Duration.ofSeconds(30)));
                LOG.info("no broker in the site file: started the embedded MQTT broker on {} (127.0.0.1 only,"
                        + " in memory)", broker.get().serverUri());
            } catch (BrokerStartException e) {
                closeQuietly(journal);
                throw new StartException(e.getMessage(), e);
            }
        }
        Daemon daemon;
        try {
            daemon = new Daemon(siteFile, ruleFiles, configuration, settings, night, systemd, catalog, time, options,
                    journal, broker);
        } catch (StartException | RuntimeException e) {
            broker.ifPresent(EmbeddedBroker::close);
            closeQuietly(journal);
            throw e;
        }
        daemon.run();
        return daemon;
    }

    private void run() {
        journalSink.start();
        history.start();
        outputs.start();
        bridge.start();
        ObjectNode payload = Payloads.object();
        payload.put("cause", "cryowarden started");
        payload.put("version", DaemonVersion.current());
        payload.put("site", configuration.site().name());
        payload.put("broker", brokerUri);
        payload.put("site_file", siteFile.toAbsolutePath().normalize().toString());
        payload.put("tick_period", options.tickEvery().toString());
        loop.announce(List.of(new DaemonEvent("daemon.started", time.wallNow(), Optional.empty(), Optional.empty(),
                payload)));
        if (options.mode() == Mode.THREADS) {
            loop.start();
            for (BusPoller poller : pollers) {
                poller.start(settings.spreadPolls(), alarmPath);
            }
            notifications.ifPresent(NotifyService::start);
            watchdog.start();
        }
        systemd.send("READY=1");
        LOG.info("cryowarden running: site '{}', {} buses, {} channels, {} rules; MQTT {} under {}/; journal {}",
                configuration.site().name(), pollers.size(), configuration.channelCount(),
                configuration.rules().rules().size(), brokerUri, settings.prefix(), journal.file());
        for (String warning : settings.warnings()) {
            LOG.warn("{}", warning);
        }
    }

    /** Escalation survives a restart; a journal that cannot be read for it must not keep the daemon down. */
    private static void resumeEscalations(NotifyService notify) {
        try {
            notify.resume();
        } catch (JournalException e) {
            LOG.error("notify: could not resume escalations from the journal ({}); alarms still unacknowledged"
                    + " are not escalated further until they are raised again", e.getMessage());
        }
    }

    private void restore() throws StartException {
        Map<String, AlarmStateRecord> states;
        try {
            states = journal.alarmStates();
        } catch (JournalException e) {
            throw new StartException(e.getMessage(), e);
        }
        List<EngineSnapshot.AlarmRecord> alarms = new ArrayList<>();
        List<EngineSnapshot.InterlockRecord> interlocks = new ArrayList<>();
        List<EngineSnapshot.FillRecord> fills = new ArrayList<>();
        for (AlarmStateRecord record : states.values()) {
            if (record.alarmId().startsWith(SnapshotJson.FILL_KEY)) {
                SnapshotJson.parseFill(record.stateJson()).ifPresentOrElse(fills::add,
                        () -> LOG.warn("journal: cannot read the state of {}; it starts unlocked", record.alarmId()));
            } else if (record.alarmId().startsWith(SnapshotJson.INTERLOCK_KEY)) {
                SnapshotJson.parseInterlock(record.stateJson()).ifPresentOrElse(interlocks::add,
                        () -> LOG.warn("journal: cannot read the state of {}; it starts untripped", record.alarmId()));
            } else {
                SnapshotJson.parseAlarm(record.stateJson()).ifPresentOrElse(alarms::add,
                        () -> LOG.warn("journal: cannot read the state of alarm {}; it starts normal",
                                record.alarmId()));
            }
        }
        if (alarms.isEmpty() && interlocks.isEmpty() && fills.isEmpty()) {
            return;
        }
        List<String> notes = loop.restore(new EngineSnapshot(time.wallNow(), alarms, interlocks, fills));
        LOG.info("restored {} alarm states, {} interlocks and {} fill controllers from the journal", alarms.size(),
                interlocks.size(), fills.size());
        notes.forEach(note -> LOG.warn("restore: {}", note));
    }

    // ---- driven mode --------------------------------------------------------------------------------------------

    /**
     * Driven mode: polls every bus for what is due at the clock's current time, then lets the engine take the
     * readings and tick, on the caller's thread. Returns the monotonic time (ns) when a poll is next due.
     */
    public long step() {
        runNotificationsDue();
        long next = Long.MAX_VALUE;
        for (BusPoller poller : pollers) {
            long due = poller.runDue();
            next = Math.min(next, due);
        }
        loop.drain();
        watchdog.runDue();
        return next;
    }

    /**
     * Waits (bounded) until the journal has recorded everything queued (and, with threads, the engine took
     * everything): the demo's pause between steps. Output writes are not waited for: in driven mode they run at
     * the next {@link #step()}.
     */
    public boolean awaitQuiet(Duration bound) throws InterruptedException {
        long deadline = System.nanoTime() + bound.toNanos();
        while (System.nanoTime() < deadline) {
            if (journalSink.idle() && (options.mode() == Mode.DRIVEN || (loop.idle() && outputs.idle()))) {
                return true;
            }
            Thread.sleep(1);
        }
        return false;
    }

    // ---- views and commands -------------------------------------------------------------------------------------

    /** Told on the journal thread after each batch of events was recorded; must return quickly. */
    public void addListener(java.util.function.Consumer<Recorded> listener) {
        listeners.add(listener);
    }

    public String brokerUri() {
        return brokerUri;
    }

    public String prefix() {
        return settings.prefix();
    }

    public Instant started() {
        return started;
    }

    public Configuration configuration() {
        return configuration;
    }

    public DaemonSettings settings() {
        return settings;
    }

    public Path journalFile() {
        return journal.file();
    }

    public boolean mqttConnected() {
        return bridge.connected();
    }

    /** Connected, and the broker granted the subscription to {@code <prefix>/command/+} at least once. */
    public boolean acceptingCommands() {
        return bridge.connected() && bridge.commandsSubscribed();
    }

    public MeterRegistry meters() {
        return metrics;
    }

    /** The metrics in the Prometheus text format. */
    public String scrape() {
        return metrics.scrape();
    }

    /** The latest reading of every channel the engine saw, measured and derived. */
    public Map<String, Reading> latestReadings() {
        return Map.copyOf(latest);
    }

    public CompletableFuture<List<AlarmStatus>> alarms() {
        return loop.call(Engine::alarms);
    }

    public CompletableFuture<List<InterlockStatus>> interlocks() {
        return loop.call(Engine::interlocks);
    }

    /** Alarm documents as published, the daemon's own ones included. */
    public CompletableFuture<List<ObjectNode>> alarmDocuments() {
        return loop.call(engine -> {
            List<ObjectNode> documents = new ArrayList<>();
            Map<String, EngineSnapshot.AlarmRecord> records = new LinkedHashMap<>();
            for (EngineSnapshot.AlarmRecord record : engine.snapshot().alarms()) {
                records.put(record.id(), record);
            }
            for (AlarmStatus status : engine.alarms()) {
                documents.add(Payloads.alarm(status, Optional.ofNullable(records.get(status.id()))));
            }
            return documents;
        });
    }

    /**
     * Runs an operator's command once the site's operators section allows its operator to give it; completes with
     * the refusal (for the caller to reply with and journal), or empty once the command and what it changed are
     * recorded in the journal (so that a reply of "done" survives a kill -9).
     */
    public CompletableFuture<Optional<String>> command(OperatorCommand command) {
        Optional<String> refusal = settings.operators().refusal(command.verb(), command.operator());
        if (refusal.isPresent()) {
            return CompletableFuture.completedFuture(refusal);
        }
        return loop.command(command).thenCompose(refused -> refused.isPresent()
                ? CompletableFuture.completedFuture(refused)
                : journalSink.recordedSoFar().thenApply(recorded -> refused));
    }

    /**
     * Journals a refused operator command as a {@code command.refused} event with the reason, word for word the
     * reply's; it changes no alarm or interlock state. Any thread.
     *
     * @param via     where the command came from: {@code mqtt} or {@code http}
     * @param command the command when its body could be read; empty when the body itself was refused
     */
    public void commandRefused(String via, String verb, Optional<OperatorCommand> command, String reason) {
        loop.record(RefusedCommand.event(via, verb, command, reason, time.wallNow()));
    }

    public List<JournalEvent> eventsAfter(long seq, int limit) throws JournalException {
        return journal.eventsAfter(seq, limit);
    }

    public List<JournalEvent> eventsSince(Instant since, int limit) throws JournalException {
        return journal.eventsSince(since, limit);
    }

    /** A status document for the API and the CLI. */
    public ObjectNode status() {
        ObjectNode node = Payloads.object();
        node.put("site", configuration.site().name());
        node.put("version", DaemonVersion.current());
        node.put("started", started.toString());
        node.put("time", time.wallNow().toString());
        node.put("broker", brokerUri);
        node.put("mqtt_connected", bridge.connected());
        node.put("prefix", settings.prefix());
        node.put("journal", journal.file().toString());
        node.put("channels", configuration.channelCount());
        node.put("rules", configuration.rules().rules().size());
        node.put("readings_processed", loop.processed());
        node.put("reading_drops", loop.drops());
        node.put("outbox_depth", bridge.outboxDepth());
        node.put("watchdog_healthy", watchdog.healthy());
        ArrayNode buses = node.putArray("buses");
        for (BusPoller poller : pollers) {
            ObjectNode bus = buses.addObject();
            bus.put("bus", poller.busId());
            bus.put("up", poller.transportUp());
        }
        return node;
    }

    // ---- reload -------------------------------------------------------------------------------------------------

    /** The site sections read only at startup: a change to them is reported as needing a restart. */
    static final List<String> RESTART_SECTIONS = List.of("mqtt", "journal", "api", "watchdog", "common_alarm",
            "operators", "polling");

    /**
     * Re-reads the site and rule files, and the roster and secrets the notifiers name. An invalid set keeps the
     * running one and publishes its errors as a {@code config.rejected} event; a valid one replaces the engine with
     * alarm states carried over by id, restarts only the pollers whose bus changed, and starts the notifiers again
     * on the new roster (escalations under way carry on: see {@link NotifyService#resume}). Sections read only at
     * startup that changed are named in the event's {@code restart_needed}.
     *
     * @return the problems found; empty when the new set was applied
     */
    public List<String> reload() {
        Configuration fresh;
        NightSettings freshNight;
        try {
            fresh = SiteSetup.load(siteFile, ruleFiles, catalog, time);
            freshNight = NightSettings.read(fresh, siteFolder(siteFile));
        } catch (ConfigException e) {
            List<String> problems = e.problems().stream().map(ConfigProblem::toString).toList();
            ObjectNode payload = Payloads.object();
            payload.put("cause", "reload refused: " + problems.size() + " errors; the running configuration stays");
            payload.set("errors", Payloads.JSON.valueToTree(problems));
            loop.announce(List.of(new DaemonEvent("config.rejected", time.wallNow(), Optional.empty(),
                    Optional.empty(), payload)));
            problems.forEach(p -> LOG.error("reload: {}", p));
            return problems;
        }
        Engine engine = new Engine(EngineConfig.of(fresh.site(), fresh.rules()), time);
        List<String> restartNeeded = changedSections(configuration, fresh);
        ObjectNode payload = Payloads.object();
        payload.put("cause", "configuration reloaded: " + fresh.rules().rules().size() + " rules, "
                + fresh.channelCount() + " channels" + (restartNeeded.isEmpty() ? ""
                : "; restart to apply the changes to " + String.join(", ", restartNeeded)));
        payload.set("restart_needed", Payloads.JSON.valueToTree(restartNeeded));
        DaemonEvent event = new DaemonEvent("config.reloaded", time.wallNow(), Optional.empty(), Optional.empty(),
                payload);
        CompletableFuture<List<String>> done = new CompletableFuture<>();
        Configuration old = configuration;
        loop.replace(engine, fresh.site(), event, done);
        try {
            done.get();
        } catch (Exception e) {
            LOG.error("reload failed; the running configuration stays", e);
            return List.of("reload failed: " + e);
        }
        configuration = fresh;
        replacePollers(old, fresh);
        replaceNotifications(freshNight, fresh);
        if (!restartNeeded.isEmpty()) {
            LOG.warn("reload: {} changed; those sections are read at startup only, restart to apply them",
                    restartNeeded);
        }
        return List.of();
    }

    /** The sections of {@link #RESTART_SECTIONS} that differ between the two configurations. */
    static List<String> changedSections(Configuration old, Configuration fresh) {
        List<String> changed = new ArrayList<>();
        for (String section : RESTART_SECTIONS) {
            org.cryowarden.rules.config.ConfigNode.Mapping before = old.site().sections().get(section);
            org.cryowarden.rules.config.ConfigNode.Mapping after = fresh.site().sections().get(section);
            String a = before == null ? "" : plain(before);
            String b = after == null ? "" : plain(after);
            if (!a.equals(b)) {
                changed.add(section);
            }
        }
        return changed;
    }

    /**
     * Starts the notifiers again from the reloaded files. The new service is put in place first, so no recorded
     * event falls between the two; its resume replays what the old one had decided (and what the old one had
     * not yet taken), so nothing is sent twice.
     */
    private void replaceNotifications(NightSettings night, Configuration fresh) {
        Optional<NotifyService> before = notifications;
        Optional<NotifyService> after = night.notifiers().map(setup -> setup.service(journal, time,
                fresh.site().name()));
        notifyTurn.lock();
        try {
            notifications = after;
            before.ifPresent(NotifyService::close); // before the new one delivers, so no notice goes out twice
            after.ifPresent(Daemon::resumeEscalations);
            if (options.mode() == Mode.THREADS) {
                after.ifPresent(NotifyService::start);
            }
        } finally {
            notifyTurn.unlock();
        }
        LOG.info("reload: notifiers {}", after.isPresent() ? "started again on the reloaded roster" : "off");
    }

    /** Driven mode: the notifiers' due work on the caller's thread, never beside a reload replacing them. */
    private void runNotificationsDue() {
        notifyTurn.lock();
        try {
            notifications.ifPresent(NotifyService::runDue);
        } finally {
            notifyTurn.unlock();
        }
    }

    static Path siteFolder(Path siteFile) {
        Path parent = siteFile.toAbsolutePath().getParent();
        return parent == null ? Path.of(".") : parent;
    }

    private void replacePollers(Configuration old, Configuration fresh) {
        Map<String, BusPoller> running = new LinkedHashMap<>();
        for (BusPoller poller : pollers) {
            running.put(poller.busId(), poller);
        }
        Map<String, String> before = fingerprints(old);
        Map<String, String> after = fingerprints(fresh);
        List<BusPoller> next = new ArrayList<>();
        for (BusDef bus : fresh.site().buses()) {
            BusPoller current = running.remove(bus.id());
            if (current != null && after.get(bus.id()).equals(before.get(bus.id()))) {
                next.add(current);
                continue;
            }
            if (current != null) {
                current.close();
            }
            BusPoller poller = SiteDrivers.poller(bus, SiteDrivers.context(fresh.site(), time), catalog, time,
                    loop::offer, options.backoff());
            if (options.mode() == Mode.THREADS) {
                poller.start(settings.spreadPolls(), alarmPath);
            }
            LOG.info("reload: bus '{}' {}", bus.id(), current == null ? "added" : "changed; its poller restarted");
            next.add(poller);
        }
        running.values().forEach(poller -> {
            LOG.info("reload: bus '{}' removed", poller.busId());
            poller.close();
        });
        pollers = List.copyOf(next);
        outputs.owners(owners(pollers, fresh));
    }

    /** What makes a bus's poller different: its settings and channels without the positions they were read at. */
    static Map<String, String> fingerprints(Configuration configuration) {
        Map<String, String> prints = new LinkedHashMap<>();
        for (BusDef bus : configuration.site().buses()) {
            StringBuilder text = new StringBuilder(bus.transport().kind()).append(plain(bus.transport().settings()));
            for (InstrumentDef instrument : bus.instruments()) {
                text.append('|').append(instrument.id()).append(instrument.driver())
                        .append(plain(instrument.settings()));
                for (PointDef point : instrument.points()) {
                    text.append(';').append(point.channel()).append(point.output()).append(plain(point.settings()));
                    configuration.site().channels().stream().filter(c -> c.id().equals(point.channel())).findFirst()
                            .ifPresent(c -> text.append(c.unit()).append(c.period()).append(c.staleAfter())
                                    .append(c.validRange()));
                }
            }
            prints.put(bus.id(), text.toString());
        }
        return prints;
    }

    private static String plain(org.cryowarden.rules.config.ConfigNode node) {
        if (node instanceof org.cryowarden.rules.config.ConfigNode.Scalar scalar) {
            return scalar.text();
        }
        if (node instanceof org.cryowarden.rules.config.ConfigNode.Sequence sequence) {
            StringBuilder text = new StringBuilder("[");
            sequence.items().forEach(item -> text.append(plain(item)).append(','));
            return text.append(']').toString();
        }
        org.cryowarden.rules.config.ConfigNode.Mapping mapping = (org.cryowarden.rules.config.ConfigNode.Mapping) node;
        StringBuilder text = new StringBuilder("{");
        mapping.entries().forEach(e -> text.append(e.key()).append(':').append(plain(e.value())).append(','));
        return text.append('}').toString();
    }

    private static Map<String, BusPoller> owners(List<BusPoller> pollers, Configuration configuration) {
        Map<String, BusPoller> byBus = new LinkedHashMap<>();
        pollers.forEach(p -> byBus.put(p.busId(), p));
        Map<String, BusPoller> owners = new LinkedHashMap<>();
        for (BusDef bus : configuration.site().buses()) {
            for (InstrumentDef instrument : bus.instruments()) {
                for (PointDef point : instrument.points()) {
                    if (point.output() && byBus.containsKey(bus.id())) {
                        owners.put(point.channel(), byBus.get(bus.id()));
                    }
                }
            }
        }
        return owners;
    }

    private void registerMetrics() {
        Gauge.builder("cryowarden_engine_queue_depth", loop, EngineLoop::depth)
                .description("readings and tasks waiting for the engine thread").register(metrics);
        io.micrometer.core.instrument.FunctionCounter.builder("cryowarden_engine_reading_drops", loop,
                EngineLoop::drops).description("readings replaced by a newer one before the engine took them")
                .register(metrics);
        io.micrometer.core.instrument.FunctionCounter.builder("cryowarden_engine_readings", loop,
                EngineLoop::processed).description("readings evaluated").register(metrics);
        Gauge.builder("cryowarden_engine_lag_seconds", loop, l -> l.lag().toNanos() / 1e9)
                .description("age of the last reading when the engine took it").register(metrics);
        Gauge.builder("cryowarden_journal_queue_depth", journalSink, JournalSink::depth).register(metrics);
        io.micrometer.core.instrument.FunctionCounter.builder("cryowarden_journal_failures", journalSink,
                JournalSink::failures).description("event batches the journal could not record").register(metrics);
        Gauge.builder("cryowarden_journal_commit_seconds", journal, j -> j.lastCommitDuration().toNanos() / 1e9)
                .description("duration of the last journal commit").register(metrics);
        Gauge.builder("cryowarden_mqtt_outbox_depth", bridge, MqttBridge::outboxDepth)
                .description("events recorded but not yet acknowledged by the broker").register(metrics);
        Gauge.builder("cryowarden_mqtt_connected", bridge, b -> b.connected() ? 1 : 0).register(metrics);
        io.micrometer.core.instrument.FunctionCounter.builder("cryowarden_mqtt_readings_published", bridge,
                MqttBridge::readingsPublished).register(metrics);
        io.micrometer.core.instrument.FunctionCounter.builder("cryowarden_mqtt_events_published", bridge,
                MqttBridge::eventsPublished).register(metrics);
        io.micrometer.core.instrument.FunctionCounter.builder("cryowarden_commands_refused", bridge,
                MqttBridge::commandsRefused).register(metrics);
        Gauge.builder("cryowarden_output_queue_depth", outputs, OutputWriter::depth).register(metrics);
        io.micrometer.core.instrument.FunctionCounter.builder("cryowarden_output_write_failures", outputs,
                OutputWriter::failures).register(metrics);
        for (BusDef bus : configuration.site().buses()) {
            for (String key : List.of("transport_failures", "reopen_failures", "driver_errors", "sink_errors",
                    "missing_readings")) {
                io.micrometer.core.instrument.FunctionCounter.builder("cryowarden_bus_errors", this,
                        d -> d.busCounter(bus.id(), key)).tag("bus", bus.id()).tag("reason", key).register(metrics);
            }
        }
    }

    private double busCounter(String busId, String key) {
        for (BusPoller poller : pollers) {
            if (poller.busId().equals(busId)) {
                return poller.counters().getOrDefault(key, 0L);
            }
        }
        return 0;
    }

    @Override
    public synchronized void close() {
        if (closed) {
            return;
        }
        closed = true;
        LOG.info("cryowarden stopping");
        systemd.send("STOPPING=1");
        watchdog.close();
        dropContact();
        for (BusPoller poller : pollers) {
            poller.close();
        }
        loop.close();
        history.close();
        ObjectNode payload = Payloads.object();
        payload.put("cause", "cryowarden stopped");
        journalSink.offer(new EventBatch(List.of(new DaemonEvent("daemon.stopped", time.wallNow(), Optional.empty(),
                Optional.empty(), payload)), Map.of(), Map.of(), Payloads.object()));
        journalSink.close();
        if (options.mode() == Mode.DRIVEN) {
            runNotificationsDue(); // with threads, the notify thread's own last round
        }
        notifications.ifPresent(NotifyService::close);
        outputs.close();
        bridge.close(Payloads.text(Payloads.status("offline", "shutdown", DaemonVersion.current(),
                Optional.of(started))).getBytes(StandardCharsets.UTF_8));
        closeQuietly(journal);
        broker.ifPresent(EmbeddedBroker::close);
        LOG.info("cryowarden stopped");
    }

    /** Drops the common-alarm contact and waits (bounded) until the relay module confirmed it. */
    private void dropContact() {
        if (contact.isEmpty()) {
            return;
        }
        contact.get().stop();
        long deadline = System.nanoTime() + options.writeTimeout().toNanos();
        while (!outputs.idle() && System.nanoTime() < deadline) {
            if (options.mode() == Mode.DRIVEN) {
                for (BusPoller poller : pollers) {
                    poller.runDue(); // nobody else runs the poller rounds that carry the write
                }
            }
            try {
                Thread.sleep(1);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                return;
            }
        }
    }

    /** The watchdog's view of this daemon. */
    private final class WatchdogParts implements Watchdog.Parts {
        @Override
        public void submitToEngine(Runnable probe) {
            loop.submit(probe);
        }

        @Override
        public Map<String, Long> pollerRounds() {
            Map<String, Long> rounds = new LinkedHashMap<>();
            for (BusPoller poller : pollers) {
                rounds.put(poller.busId(), poller.lastRoundNanos());
            }
            return rounds;
        }

        @Override
        public void record(List<DaemonEvent> events) {
            journalSink.offer(new EventBatch(events, Map.of(), Map.of(), lastSummary));
        }

        @Override
        public ObjectNode counters() {
            ObjectNode node = Payloads.object();
            node.put("started", started.toString());
            node.put("readings_processed", loop.processed());
            node.put("reading_drops", loop.drops());
            node.put("events_recorded", eventsRecorded.get());
            node.put("engine_queue_depth", loop.depth());
            node.put("journal_queue_depth", journalSink.depth());
            node.put("mqtt_outbox_depth", bridge.outboxDepth());
            node.put("output_queue_depth", outputs.depth());
            contact.ifPresent(c -> node.put("common_alarm", c.energised() ? "energised" : "dropped"));
            return node;
        }

        @Override
        public void heartbeat(ObjectNode document) {
            bridge.publishHeartbeat(Payloads.text(document));
            contact.ifPresent(CommonAlarmContact::refresh);
        }

        @Override
        public void health(boolean healthy) {
            contact.ifPresent(c -> c.health(healthy));
        }
    }

    private static void closeQuietly(Journal journal) {
        try {
            journal.close();
        } catch (JournalException e) {
            LOG.error("{}", e.getMessage());
        }
    }
}
