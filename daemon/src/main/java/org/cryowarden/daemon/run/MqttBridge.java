package org.cryowarden.daemon.run;

import com.fasterxml.jackson.databind.node.ObjectNode;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.locks.Condition;
import java.util.concurrent.locks.ReentrantLock;
import java.util.function.Function;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.daemon.mqtt.ConnectionListener;
import org.cryowarden.daemon.mqtt.IncomingMessage;
import org.cryowarden.daemon.mqtt.MqttLink;
import org.cryowarden.daemon.mqtt.OutgoingMessage;
import org.cryowarden.drivers.poll.TransactionGate;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.TimeSource;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Everything the daemon says and hears on MQTT, under one topic prefix:
 * <ul>
 *   <li>{@code reading/<channel>} retained, QoS 0, report by exception ({@link ReportByException}), on the
 *       reading thread, which also feeds the journal's minute aggregates;</li>
 *   <li>{@code alarm/<alarm>} retained QoS 1 and {@code summary} retained QoS 1, published once the journal
 *       recorded the change;</li>
 *   <li>{@code event} QoS 1 from the journal's outbox in sequence order ({@link EventOutbox}): sent by the journal
 *       thread as soon as it committed them, a window in flight, each marked delivered after its PUBACK, so a
 *       broker outage delays events but never loses or reorders them;</li>
 *   <li>{@code command/<verb>} requests, answered on their MQTT 5 Response Topic with the Correlation Data;</li>
 *   <li>{@code journal} retained QoS 1, only once the journal failed: {@code not recording} with the problem, then
 *       {@code recording} again. Events the journal could not record go out on {@code event} at once, without
 *       {@code seq} and with {@code "recorded": false}, so the alarm still reaches the dashboard.</li>
 * </ul>
 * After every (re)connect the current readings, alarms and summary are published again.
 */
final class MqttBridge implements JournalSink.Listener, AutoCloseable {

    static final String OUTBOX_SINK = "mqtt";

    private static final Logger LOG = LoggerFactory.getLogger(MqttBridge.class);
    /**
     * While readings stream in, the reading thread takes them at most this often: a bus polled instrument by
     * instrument would otherwise wake it for every reading. A reading after a quiet spell goes out at once.
     */
    static final long READING_PACE_NANOS = TimeUnit.MILLISECONDS.toNanos(50);

    private final MqttLink link;
    private final String prefix;
    private final Journal journal;
    private final TimeSource time;
    private final ReportByException rbe;
    private final Function<OperatorCommand, CompletableFuture<Optional<String>>> commands;
    private final Refusals refusals;

    /** Where refused commands are recorded (the journal, through the engine thread); must return at once. */
    interface Refusals {
        void refused(String via, String verb, Optional<OperatorCommand> command, String reason);
    }

    private final ReentrantLock lock = new ReentrantLock();
    private final Condition readingsWaiting = lock.newCondition();
    private final LinkedHashMap<String, Reading> pendingReadings = new LinkedHashMap<>();
    /** Every reading since the last take, in order, for the minute aggregates (publishing keeps the newest only). */
    private List<Reading> unaggregated = new ArrayList<>();
    /** True while the reading thread waits for the first reading after a quiet spell: only then is it woken. */
    private boolean awaitingFirst;
    private final Map<String, Reading> latestReadings = new LinkedHashMap<>();
    private boolean republishReadings;
    private final EventOutbox outbox;

    private final Object alarmLock = new Object();
    private final Map<String, String> alarmDocuments = new LinkedHashMap<>();
    private String summaryDocument;
    private String journalDocument;
    private boolean journalFailing;
    private String journalProblem;

    private final AtomicLong readingsPublished = new AtomicLong();
    /** Asked before each slice of readings ({@link #yieldTo}). */
    private TransactionGate gate = TransactionGate.OPEN;
    private final AtomicLong commandsRefused = new AtomicLong();
    private final AtomicLong aggregateFailures = new AtomicLong();
    private volatile CompletableFuture<Void> commandsGranted = new CompletableFuture<>();
    private volatile boolean running;
    private final List<Thread> threads = new ArrayList<>();

    MqttBridge(MqttLink link, String prefix, Journal journal, TimeSource time, ReportByException rbe,
            Function<OperatorCommand, CompletableFuture<Optional<String>>> commands, Refusals refusals) {
        this.link = link;
        this.prefix = prefix;
        this.journal = journal;
        this.time = time;
        this.rbe = rbe;
        this.commands = commands;
        this.refusals = refusals;
        this.outbox = new EventOutbox(link, journal, OUTBOX_SINK, time);
    }

    String prefix() {
        return prefix;
    }

    void start() {
        running = true;
        link.addConnectionListener(new ConnectionListener() {
            @Override
            public void connected(boolean reconnect) {
                LOG.info("MQTT connected{}; publishing the current state under {}/", reconnect ? " again" : "", prefix);
                republishAlarms();
                outbox.connected();
                lock.lock();
                try {
                    republishReadings = true;
                    readingsWaiting.signal();
                } finally {
                    lock.unlock();
                }
            }

            @Override
            public void lost(String reason) {
                LOG.warn("MQTT connection lost ({}); polling and evaluating go on, events wait in the journal", reason);
            }
        });
        commandsGranted = link.subscribe(prefix + "/command/+", 1, this::onCommand);
        link.start();
        threads.add(thread("mqtt readings", this::readingLoop));
        threads.add(thread("mqtt events", outbox::loop));
    }

    /** From the engine thread: the newest reading of a channel; never blocks. */
    void offerReading(Reading reading) {
        lock.lock();
        try {
            // The reading thread takes everything pending at once: only the first reading needs to wake it, and
            // only when it waits for one (while readings stream in, it comes back on its own pace).
            boolean first = pendingReadings.isEmpty();
            pendingReadings.put(reading.channel(), reading);
            unaggregated.add(reading);
            if (first && awaitingFirst) {
                readingsWaiting.signal();
            }
        } finally {
            lock.unlock();
        }
    }

    @Override
    public void committed(JournalSink.Committed committed) {
        // The events first, sent from this (the journal's) thread when nothing older waits: no read back, no
        // hand-off, and no alarm document or summary ahead of them on the connection.
        outbox.committed(committed.outbox());
        EventBatch batch = committed.batch();
        synchronized (alarmLock) {
            for (Map.Entry<String, ObjectNode> alarm : batch.alarms().entrySet()) {
                String text = Payloads.text(alarm.getValue());
                alarmDocuments.put(alarm.getKey(), text);
                if (link.isConnected()) {
                    link.publish(OutgoingMessage.atLeastOnce(prefix + "/alarm/" + alarm.getKey(), text, true));
                }
            }
            String summary = Payloads.text(batch.summary());
            boolean changed = !summary.equals(summaryDocument);
            summaryDocument = summary;
            if (changed && link.isConnected() && !batch.alarms().isEmpty()) {
                link.publish(OutgoingMessage.atLeastOnce(prefix + "/summary", summary, true));
            }
        }
        journalState(committed);
    }

    /** Publishes the watchdog's heartbeat on {@code <prefix>/heartbeat} (QoS 0, not retained) while connected. */
    void publishHeartbeat(String document) {
        if (link.isConnected()) {
            link.publish(OutgoingMessage.atMostOnce(prefix + "/heartbeat",
                    document.getBytes(java.nio.charset.StandardCharsets.UTF_8), false));
        }
    }

    long readingsPublished() {
        return readingsPublished.get();
    }

    long eventsPublished() {
        return outbox.published();
    }

    long commandsRefused() {
        return commandsRefused.get();
    }

    long outboxDepth() {
        return outbox.depth();
    }

    boolean connected() {
        return link.isConnected();
    }

    /** Whether the broker granted the command subscription (at least once): commands sent now are heard. */
    boolean commandsSubscribed() {
        return commandsGranted.isDone() && !commandsGranted.isCompletedExceptionally();
    }

    /** Stops the threads and closes the link, publishing {@code offline} with the reason as the status. */
    void close(byte[] offline) {
        running = false;
        outbox.stop();
        lock.lock();
        try {
            readingsWaiting.signalAll();
        } finally {
            lock.unlock();
        }
        for (Thread thread : threads) {
            try {
                thread.join(5_000);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
        link.close(offline, MqttLink.DEFAULT_CLOSE_TIMEOUT);
    }

    @Override
    public void close() {
        close("{\"state\":\"offline\",\"reason\":\"shutdown\"}".getBytes(StandardCharsets.UTF_8));
    }

    private void republishAlarms() {
        synchronized (alarmLock) {
            for (Map.Entry<String, String> alarm : alarmDocuments.entrySet()) {
                link.publish(OutgoingMessage.atLeastOnce(prefix + "/alarm/" + alarm.getKey(), alarm.getValue(), true));
            }
            if (summaryDocument != null) {
                link.publish(OutgoingMessage.atLeastOnce(prefix + "/summary", summaryDocument, true));
            }
            if (journalDocument != null) {
                link.publish(OutgoingMessage.atLeastOnce(prefix + "/journal", journalDocument, true));
            }
        }
    }

    /** Publishes unrecorded events straight away, and the journal's state when it changes. */
    private void journalState(JournalSink.Committed committed) {
        List<DaemonEvent> events = committed.batch().events();
        String document = null;
        synchronized (alarmLock) {
            if (committed.problem().isPresent() && !committed.problem().get().equals(journalProblem)) {
                journalProblem = committed.problem().get();
                ObjectNode node = Payloads.object();
                node.put("state", "not recording");
                node.put("problem", committed.problem().get());
                node.put("time", time.wallNow().toString());
                document = Payloads.text(node);
                journalFailing = true;
            } else if (committed.problem().isEmpty() && journalFailing && !events.isEmpty()) {
                journalFailing = false;
                journalProblem = null;
                ObjectNode node = Payloads.object();
                node.put("state", "recording");
                node.put("time", time.wallNow().toString());
                document = Payloads.text(node);
            }
            if (document != null) {
                journalDocument = document;
                if (link.isConnected()) {
                    link.publish(OutgoingMessage.atLeastOnce(prefix + "/journal", document, true));
                }
            }
        }
        if (committed.problem().isPresent() && link.isConnected()) {
            for (DaemonEvent event : events) {
                ObjectNode node = event.published(0);
                node.remove("seq");
                node.put("recorded", false);
                node.put("not_recorded_because", committed.problem().get());
                link.publish(OutgoingMessage.atLeastOnce(prefix + "/event", Payloads.text(node), false));
            }
        }
    }

    /**
     * Asks {@code gate} before each slice of readings, so that an alarm on its way out goes first. Set before
     * {@link #start}.
     */
    void yieldTo(TransactionGate gate) {
        this.gate = Objects.requireNonNull(gate, "gate");
    }

    private void readingLoop() {
        boolean streaming = false;
        long lastTake = System.nanoTime();
        while (running) {
            List<Reading> readings;
            List<Reading> aggregated;
            boolean everything;
            lock.lock();
            try {
                if (streaming) {
                    long wait;
                    while (running && !republishReadings
                            && (wait = lastTake + READING_PACE_NANOS - System.nanoTime()) > 0) {
                        readingsWaiting.awaitNanos(wait);
                    }
                } else if (pendingReadings.isEmpty() && !republishReadings) {
                    awaitingFirst = true;
                    try {
                        readingsWaiting.await(1, TimeUnit.SECONDS);
                    } finally {
                        awaitingFirst = false;
                    }
                }
                readings = new ArrayList<>(pendingReadings.values());
                pendingReadings.clear();
                aggregated = unaggregated;
                unaggregated = new ArrayList<>(Math.max(16, aggregated.size()));
                everything = republishReadings;
                republishReadings = false;
            } catch (InterruptedException e) {
                return;
            } finally {
                lock.unlock();
            }
            streaming = !readings.isEmpty();
            if (streaming) {
                gate.awaitTurn();
            }
            lastTake = System.nanoTime();
            long now = time.monotonicNanos();
            if (everything) {
                rbe.reset();
            }
            for (Reading reading : readings) {
                latestReadings.put(reading.channel(), reading);
            }
            for (Reading reading : aggregated) {
                try {
                    journal.recordReading(reading);
                } catch (JournalException e) {
                    if (aggregateFailures.getAndIncrement() % 1000 == 0) {
                        LOG.error("{}", e.getMessage());
                    }
                }
            }
            if (!link.isConnected()) {
                continue;
            }
            List<Reading> toSend = new ArrayList<>();
            if (everything) {
                toSend.addAll(latestReadings.values());
            } else {
                toSend.addAll(readings);
                for (String channel : rbe.overdue(now)) {
                    Reading latest = latestReadings.get(channel);
                    if (latest != null && !readings.contains(latest)) {
                        toSend.add(latest);
                    }
                }
            }
            for (Reading reading : toSend) {
                if (rbe.admit(reading, now)) {
                    readingsPublished.incrementAndGet();
                    link.publish(OutgoingMessage.atMostOnce(prefix + "/reading/" + reading.channel(),
                            Payloads.text(Payloads.reading(reading)).getBytes(StandardCharsets.UTF_8), true));
                }
            }
        }
    }

    private void onCommand(IncomingMessage message) {
        String verb = message.topic().substring(message.topic().lastIndexOf('/') + 1);
        if (message.retained() && message.payload().length == 0) {
            // An empty retained message is how a client clears a retained one (MQTT 5.0, 3.3.1.3): not a command.
            LOG.info("the retained message on {} was cleared", message.topic());
            return;
        }
        if (message.retained()) {
            // A retained command would act again at every reconnect: refuse it without reading it.
            refuse(message, verb, Optional.empty(), "commands must not be retained; clear the retained message on "
                    + message.topic());
            return;
        }
        OperatorCommand.Parsed parsed = OperatorCommand.parse(verb, message.payload());
        if (parsed.error().isPresent()) {
            refuse(message, verb, Optional.empty(), parsed.error().get());
            return;
        }
        OperatorCommand command = parsed.command().orElseThrow();
        commands.apply(command).whenComplete((refusal, failure) -> {
            Optional<String> error = failure != null ? Optional.of("internal failure: " + failure) : refusal;
            if (error.isPresent()) {
                refuse(message, verb, Optional.of(command), error.get());
            } else {
                LOG.info("command {} {} by {} over MQTT done", verb, command.target(), command.operator());
                link.reply(message, Payloads.text(Payloads.reply(Optional.empty())));
            }
        });
    }

    private void refuse(IncomingMessage message, String verb, Optional<OperatorCommand> command, String error) {
        commandsRefused.incrementAndGet();
        LOG.warn("command {} over MQTT refused: {}", verb, error);
        refusals.refused("mqtt", verb, command, error);
        if (message.responseTopic().isPresent()) {
            link.reply(message, Payloads.text(Payloads.reply(Optional.of(error))));
        }
    }

    private Thread thread(String name, Runnable body) {
        Thread thread = new Thread(body, name);
        thread.setDaemon(true);
        thread.start();
        return thread;
    }
}
