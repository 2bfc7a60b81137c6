package org.cryowarden.daemon.mqtt;

import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.RejectedExecutionException;
import java.util.concurrent.ScheduledFuture;
import java.util.concurrent.ScheduledThreadPoolExecutor;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.function.Consumer;
import org.eclipse.paho.mqttv5.client.IMqttToken;
import org.eclipse.paho.mqttv5.client.MqttActionListener;
import org.eclipse.paho.mqttv5.client.MqttAsyncClient;
import org.eclipse.paho.mqttv5.client.MqttCallback;
import org.eclipse.paho.mqttv5.client.MqttClientException;
import org.eclipse.paho.mqttv5.client.MqttConnectionOptions;
import org.eclipse.paho.mqttv5.client.MqttDisconnectResponse;
import org.eclipse.paho.mqttv5.client.persist.MemoryPersistence;
import org.eclipse.paho.mqttv5.common.MqttException;
import org.eclipse.paho.mqttv5.common.MqttMessage;
import org.eclipse.paho.mqttv5.common.MqttSubscription;
import org.eclipse.paho.mqttv5.common.packet.MqttProperties;
import org.eclipse.paho.mqttv5.common.util.MqttTopicValidator;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * One MQTT 5 connection to a broker through Eclipse Paho, made safe for a daemon that runs all night.
 *
 * <ul>
 *   <li>Connecting is our own loop with backoff, for the first connect and every reconnect (Paho does not retry
 *       a failed first connect, paho.mqtt.java #9 and #930; its reconnect timer thread survives close, #654).
 *       The session starts clean; subscriptions are sent again after every connect.</li>
 *   <li>The last will ({@code willPayload}, retained, QoS 1, on the status topic) tells subscribers the daemon
 *       is gone when the connection breaks. After every connect the link publishes {@code onlinePayload} there;
 *       {@link #close(byte[], Duration)} publishes the caller's offline payload, because a clean disconnect
 *       does not send the will.</li>
 *   <li>Publishes go through our own bounded queue and in-flight window, in submission order; a publish
 *       refused with 32202 "too many publishes in progress" (the broker's Receive Maximum, #530, #993) goes back
 *       to the head of the queue and is retried. Each publish reports a {@link PublishResult}: delivered only
 *       once the broker acknowledged it. While disconnected a publish fails at once: the journal's outbox, not
 *       a Paho buffer, keeps what must not be lost.</li>
 *   <li>Paho's callbacks never block or wait for a publish (#310, #985): they run the link's short bookkeeping
 *       in its {@link SerialLane} and hand everything else to our threads. Message handlers, connection listeners
 *       and publish results run on one callback thread of the link, in order: a handler may publish but must not
 *       block for long.</li>
 *   <li>Paho runs on an executor the link owns, so {@link #close} leaves no Paho thread behind.</li>
 * </ul>
 *
 * <p>Thread-safe. Create, add subscriptions and listeners, {@link #start()}, use, {@link #close}.
 */
public final class MqttLink implements AutoCloseable {

    /** The bound {@link #close()} uses. */
    public static final Duration DEFAULT_CLOSE_TIMEOUT = Duration.ofSeconds(10);

    private static final Logger LOG = LoggerFactory.getLogger(MqttLink.class);
    private static final int PAHO_THREADS = 8;
    private static final Duration WINDOW_RETRY = Duration.ofMillis(20);
    private static final int FIRST_REFUSAL_CODE = 0x80;

    private final MqttLinkSettings settings;
    private final MqttAsyncClient client;
    private final MqttConnectionOptions options;
    /** Runs every change of the state below, one at a time, on whichever thread asks for it. */
    private final SerialLane lane;
    /** Only schedules delayed work (reconnects, window retries) into the lane. */
    private final ScheduledThreadPoolExecutor control;
    private final ExecutorService callbacks;
    private final ScheduledThreadPoolExecutor pahoPool;
    private final List<Subscription> subscriptions = new CopyOnWriteArrayList<>();
    private final List<ConnectionListener> listeners = new CopyOnWriteArrayList<>();
    private final AtomicInteger queuedCount = new AtomicInteger();
    private final CompletableFuture<Void> firstConnect = new CompletableFuture<>();
    private final Object closeLock = new Object();

    // State below is read and written in the lane only.
    private final Deque<Pending> queue = new ArrayDeque<>();
    private final Set<Pending> inFlight = new LinkedHashSet<>();
    private ScheduledFuture<?> retryTask;
    private ScheduledFuture<?> windowRetryTask;
    /** Publish results decided by the lane's current run, handed to the callback thread in one piece. */
    private final List<Runnable> completions = new ArrayList<>();
    private int failedAttempts;
    private int epoch;
    private boolean everConnected;

    private volatile CompletableFuture<Void> attemptSettled = CompletableFuture.completedFuture(null);
    private volatile State state = State.NEW;
    private volatile boolean closing;
    private Boolean closedCleanly;

    private enum State { NEW, CONNECTING, CONNECTED, DISCONNECTED, CLOSED }

    /** A publish waiting for a window slot or for the broker's acknowledgement. */
    private static final class Pending {
        final OutgoingMessage message;
        final CompletableFuture<PublishResult> result;
        int epoch;
        /** Set once its result is decided: the future itself completes later, on the callback thread. */
        boolean decided;

        Pending(OutgoingMessage message, CompletableFuture<PublishResult> result) {
            this.message = message;
            this.result = result;
        }
    }

    /**
     * Builds the link; nothing connects until {@link #start()}.
     *
     * @throws IllegalArgumentException when Paho refuses the client id or URI, or a TLS file is missing or bad
     */
    public MqttLink(MqttLinkSettings settings) {
        this.settings = Objects.requireNonNull(settings, "settings");
        this.options = connectionOptions(settings);
        this.lane = new SerialLane(e -> LOG.error("MQTT link to {}: internal failure", settings.serverUri(), e),
                this::handCompletionsOn);
        this.control = scheduler(1, new LinkThreads(settings.clientId(), "control"));
        this.callbacks = Executors.newSingleThreadExecutor(new LinkThreads(settings.clientId(), "callbacks"));
        this.pahoPool = scheduler(PAHO_THREADS, new LinkThreads(settings.clientId(), "paho"));
        try {
            this.client = new MqttAsyncClient(settings.pahoUri(), settings.clientId(), new MemoryPersistence(),
                    null, pahoPool);
        } catch (MqttException e) {
            shutdownExecutors(Duration.ofSeconds(1));
            throw new IllegalArgumentException("cannot create an MQTT client for " + settings.serverUri() + ": "
                    + describe(e), e);
        }
        this.client.setCallback(new PahoCallbacks());
    }

    /** Adds a listener told about connects and connection losses; add before {@link #start()} to miss none. */
    public void addConnectionListener(ConnectionListener listener) {
        listeners.add(Objects.requireNonNull(listener, "listener"));
    }

    /** Starts connecting in the background; returns at once. Call once. */
    public void start() {
        if (closing) {
            throw new IllegalStateException("link to " + settings.serverUri() + " is closed");
        }
        control.execute(() -> lane.runHere(() -> {
            if (state == State.NEW) {
                state = State.DISCONNECTED;
                attemptConnect();
            }
        }));
    }

    /** How many publishes wait for a window slot right now (for tests and metrics). */
    int waitingCount() {
        return queuedCount.get();
    }

    /** Whether the link is connected right now. */
    public boolean isConnected() {
        return state == State.CONNECTED;
    }

    /** Waits at most {@code timeout} for the first successful connect; returns whether it happened. */
    public boolean awaitFirstConnect(Duration timeout) throws InterruptedException {
        try {
            firstConnect.get(timeout.toMillis(), TimeUnit.MILLISECONDS);
            return true;
        } catch (TimeoutException | ExecutionException e) {
            return false;
        }
    }

    /**
     * Queues a message for publishing; never blocks. The result completes on the link's callback thread.
     * Fails at once when the link is not connected, is closing, or the queue is full.
     */
    public CompletableFuture<PublishResult> publish(OutgoingMessage message) {
        Objects.requireNonNull(message, "message");
        CompletableFuture<PublishResult> result = new CompletableFuture<>();
        if (closing) {
            result.complete(new PublishResult.Failed("the MQTT link is closing"));
            return result;
        }
        if (queuedCount.incrementAndGet() > settings.queueCapacity()) {
            queuedCount.decrementAndGet();
            result.complete(new PublishResult.Failed("the MQTT publish queue is full ("
                    + settings.queueCapacity() + " waiting)"));
            return result;
        }
        Pending pending = new Pending(message, result);
        if (!inLane(() -> enqueue(pending, false))) {
            queuedCount.decrementAndGet();
            result.complete(new PublishResult.Failed("the MQTT link is closed"));
        }
        return result;
    }

    /**
     * Subscribes {@code handler} to {@code filter}, now if connected and again after every connect. The handler
     * runs on the link's callback thread. Avoid overlapping filters: a message matching two subscriptions may
     * arrive twice. The future completes when the broker first grants the subscription, exceptionally if it
     * refuses it.
     */
    public CompletableFuture<Void> subscribe(String filter, int qos, Consumer<IncomingMessage> handler) {
        MqttTopicValidator.validate(filter, true, true);
        if (qos != 0 && qos != 1) {
            throw new IllegalArgumentException("qos must be 0 or 1, got " + qos + " for filter " + filter);
        }
        Subscription subscription = new Subscription(filter, qos, Objects.requireNonNull(handler, "handler"),
                new CompletableFuture<>());
        subscriptions.add(subscription);
        if (!inLane(() -> {
            if (state == State.CONNECTED) {
                sendSubscriptions(List.of(subscription));
            }
        })) {
            subscription.granted().completeExceptionally(new IllegalStateException("the MQTT link is closed"));
        }
        return subscription.granted();
    }

    /**
     * Answers an MQTT 5 request: publishes {@code payload} at QoS 1 to the request's Response Topic with its
     * Correlation Data. Fails when the request carried no Response Topic.
     */
    public CompletableFuture<PublishResult> reply(IncomingMessage request, byte[] payload) {
        Optional<String> responseTopic = request.responseTopic();
        if (responseTopic.isEmpty()) {
            return CompletableFuture.completedFuture(new PublishResult.Failed(
                    "the message on " + request.topic() + " carries no response topic; there is nowhere to reply"));
        }
        return publish(new OutgoingMessage(responseTopic.get(), payload, 1, false, Optional.empty(),
                request.correlationData()));
    }

    /** {@link #reply(IncomingMessage, byte[])} with a UTF-8 text (JSON) payload. */
    public CompletableFuture<PublishResult> reply(IncomingMessage request, String payload) {
        return reply(request, payload.getBytes(StandardCharsets.UTF_8));
    }

    /**
     * Closes the link: lets queued publishes go out, publishes {@code offlinePayload} retained on the status
     * topic, disconnects cleanly and stops every thread of the link, all within {@code timeout}. Idempotent; call
     * from a thread of your own, not from a link callback.
     *
     * @return whether the offline status was delivered and the disconnect was clean
     */
    public boolean close(byte[] offlinePayload, Duration timeout) {
        Objects.requireNonNull(offlinePayload, "offlinePayload");
        if (LinkThreads.isLinkThread(Thread.currentThread())) {
            throw new IllegalStateException("close the MQTT link from a thread of your own, not from a link callback");
        }
        synchronized (closeLock) {
            if (closedCleanly != null) {
                return closedCleanly;
            }
            closing = true;
            long deadline = System.nanoTime() + timeout.toNanos();
            // Closing Paho in the middle of a connect can strand its connect thread (#850): let the attempt end.
            awaitQuietly(attemptSettled, Math.min(remainingUntil(deadline) / 3, TimeUnit.SECONDS.toNanos(3)));
            PublishResult offline = publishOffline(offlinePayload, remainingUntil(deadline) * 2 / 3);
            boolean disconnected = disconnect(deadline);
            inLane(() -> {
                state = State.CLOSED;
                failEverything("the MQTT link was closed");
            });
            try {
                client.close(true);
            } catch (MqttException | RuntimeException e) {
                LOG.debug("closing the Paho client for {}: {}", settings.serverUri(), describe(e));
            }
            shutdownExecutors(Duration.ofNanos(Math.max(remainingUntil(deadline), TimeUnit.SECONDS.toNanos(1))));
            closedCleanly = offline.isDelivered() && disconnected;
            if (!offline.isDelivered()) {
                LOG.warn("MQTT link to {} closed without publishing the offline status: {}",
                        settings.serverUri(), ((PublishResult.Failed) offline).reason());
            }
            return closedCleanly;
        }
    }

    /** Closes within {@link #DEFAULT_CLOSE_TIMEOUT}, publishing the will payload as the offline status. */
    @Override
    public void close() {
        close(settings.willPayload(), DEFAULT_CLOSE_TIMEOUT);
    }

    // ---- in the lane ----------------------------------------------------------------------------------------

    private void attemptConnect() {
        retryTask = null;
        if (closing || state == State.CONNECTED || state == State.CONNECTING) {
            return;
        }
        state = State.CONNECTING;
        attemptSettled = new CompletableFuture<>();
        try {
            client.connect(options, null, new MqttActionListener() {
                @Override
                public void onSuccess(IMqttToken token) {
                    inLane(MqttLink.this::connected);
                }

                @Override
                public void onFailure(IMqttToken token, Throwable failure) {
                    inLane(() -> connectFailed(failure));
                }
            });
        } catch (MqttException | RuntimeException e) {
            connectFailed(e);
        }
    }

    private void connectFailed(Throwable failure) {
        if (state != State.CONNECTING) {
            return;
        }
        state = State.DISCONNECTED;
        attemptSettled.complete(null);
        Duration delay = settings.backoff().delayAfter(failedAttempts);
        if (failedAttempts == 0) {
            LOG.warn("cannot connect to the MQTT broker at {}: {}; retrying, every {} ms at most",
                    settings.serverUri(), describe(failure), settings.maxRetryDelay().toMillis());
        } else {
            LOG.debug("connect attempt {} to {} failed: {}", failedAttempts + 1, settings.serverUri(),
                    describe(failure));
        }
        failedAttempts++;
        scheduleConnect(delay);
    }

    private void connected() {
        if (state != State.CONNECTING) {
            return;
        }
        attemptSettled.complete(null);
        if (closing) {
            state = State.CONNECTED;
            return;
        }
        state = State.CONNECTED;
        epoch++;
        failedAttempts = 0;
        boolean reconnect = everConnected;
        everConnected = true;
        LOG.info("{} MQTT broker at {}", reconnect ? "reconnected to" : "connected to", settings.serverUri());
        Pending online = new Pending(OutgoingMessage.atLeastOnce(settings.statusTopic(), settings.onlinePayload(), true),
                new CompletableFuture<>());
        online.result.thenAccept(result -> {
            if (!result.isDelivered()) {
                LOG.warn("online status on {} not delivered: {}", settings.statusTopic(),
                        ((PublishResult.Failed) result).reason());
            }
        });
        queuedCount.incrementAndGet();
        queue.addFirst(online);
        if (!subscriptions.isEmpty()) {
            sendSubscriptions(List.copyOf(subscriptions));
        }
        pump();
        firstConnect.complete(null);
        for (ConnectionListener listener : listeners) {
            onCallbacks(() -> listener.connected(reconnect));
        }
    }

    private void connectionLost(String reason) {
        if (state != State.CONNECTED && state != State.CONNECTING) {
            return;
        }
        boolean wasConnected = state == State.CONNECTED;
        state = State.DISCONNECTED;
        epoch++;
        failEverything("the connection to the MQTT broker was lost before it acknowledged the message (" + reason + ")");
        if (closing) {
            return;
        }
        if (wasConnected) {
            LOG.warn("lost the connection to the MQTT broker at {}: {}; reconnecting", settings.serverUri(), reason);
            for (ConnectionListener listener : listeners) {
                onCallbacks(() -> listener.lost(reason));
            }
        }
        scheduleConnect(settings.minRetryDelay());
    }

    private void scheduleConnect(Duration delay) {
        if (closing || retryTask != null) {
            return;
        }
        try {
            // On the control thread itself: Paho refuses to connect from its own callback threads.
            retryTask = control.schedule(() -> lane.runHere(this::attemptConnect), delay.toMillis(),
                    TimeUnit.MILLISECONDS);
        } catch (RejectedExecutionException e) {
            retryTask = null;
        }
    }

    private void enqueue(Pending pending, boolean allowWhileClosing) {
        if (state != State.CONNECTED || (closing && !allowWhileClosing)) {
            queuedCount.decrementAndGet();
            complete(pending, new PublishResult.Failed(state != State.CONNECTED
                    ? "not connected to the MQTT broker at " + settings.serverUri() : "the MQTT link is closing"));
            return;
        }
        queue.addLast(pending);
        pump();
    }

    /** Moves queued publishes into the window, in order, while there is room and a connection. */
    private void pump() {
        while (state == State.CONNECTED && inFlight.size() < settings.maxInFlight() && !queue.isEmpty()) {
            Pending pending = queue.peekFirst();
            pending.epoch = epoch;
            inFlight.add(pending);
            try {
                client.publish(pending.message.topic(), toPaho(pending.message), pending, new PublishListener());
            } catch (MqttException e) {
                inFlight.remove(pending);
                if (e.getReasonCode() == MqttClientException.REASON_CODE_MAX_INFLIGHT) {
                    // The broker's Receive Maximum is smaller than our window: wait for an acknowledgement.
                    if (inFlight.isEmpty()) {
                        scheduleWindowRetry();
                    }
                    return;
                }
                if (e.getReasonCode() == MqttClientException.REASON_CODE_CLIENT_NOT_CONNECTED
                        || e.getReasonCode() == MqttClientException.REASON_CODE_CONNECTION_LOST) {
                    return;
                }
                queue.pollFirst();
                queuedCount.decrementAndGet();
                complete(pending, new PublishResult.Failed("the MQTT client refused the message for "
                        + pending.message.topic() + ": " + describe(e)));
                continue;
            } catch (RuntimeException e) {
                inFlight.remove(pending);
                queue.pollFirst();
                queuedCount.decrementAndGet();
                complete(pending, new PublishResult.Failed("the MQTT client refused the message for "
                        + pending.message.topic() + ": " + describe(e)));
                continue;
            }
            queue.pollFirst();
            queuedCount.decrementAndGet();
        }
    }

    private void scheduleWindowRetry() {
        if (windowRetryTask != null && !windowRetryTask.isDone()) {
            return;
        }
        try {
            windowRetryTask = control.schedule(() -> inLane(this::pump), WINDOW_RETRY.toMillis(),
                    TimeUnit.MILLISECONDS);
        } catch (RejectedExecutionException e) {
            windowRetryTask = null;
        }
    }

    private void acknowledged(Pending pending, IMqttToken token, Throwable failure) {
        if (pending.epoch != epoch || !inFlight.remove(pending)) {
            return;
        }
        if (failure instanceof MqttException e && e.getReasonCode() == MqttClientException.REASON_CODE_MAX_INFLIGHT) {
            queuedCount.incrementAndGet();
            queue.addFirst(pending);
        } else if (failure != null) {
            complete(pending, new PublishResult.Failed("the MQTT broker did not take the message for "
                    + pending.message.topic() + ": " + describe(failure)));
        } else {
            int refusal = refusalCode(token);
            complete(pending, refusal < 0 ? PublishResult.Delivered.INSTANCE
                    : new PublishResult.Failed("the MQTT broker refused the message for " + pending.message.topic()
                    + " with reason code 0x" + Integer.toHexString(refusal)));
        }
        pump();
    }

    private void sendSubscriptions(List<Subscription> toSend) {
        // Retain As Published (MQTT 5.0, 3.8.3.1): a message published retained keeps its flag when forwarded
        // live, so a handler can tell it from a transient one (commands refuse retained messages).
        MqttSubscription[] wire = toSend.stream().map(s -> {
            MqttSubscription subscription = new MqttSubscription(s.filter(), s.qos());
            subscription.setRetainAsPublished(true);
            return subscription;
        }).toArray(MqttSubscription[]::new);
        try {
            // The overloads taking an IMqttMessageListener are broken in Paho 1.2.5 (#816, #863, #885):
            // messages are routed by our own filter matching instead.
            client.subscribe(wire, null, new MqttActionListener() {
                @Override
                public void onSuccess(IMqttToken token) {
                    int[] codes = token.getReasonCodes();
                    for (int i = 0; i < toSend.size(); i++) {
                        Subscription s = toSend.get(i);
                        int code = codes != null && i < codes.length ? codes[i] : 0;
                        if (code >= FIRST_REFUSAL_CODE) {
                            LOG.warn("the MQTT broker refused the subscription to {} (reason code 0x{})",
                                    s.filter(), Integer.toHexString(code));
                            s.granted().completeExceptionally(new IllegalStateException("the MQTT broker at "
                                    + settings.serverUri() + " refused the subscription to " + s.filter()
                                    + " (reason code 0x" + Integer.toHexString(code) + ")"));
                        } else {
                            s.granted().complete(null);
                        }
                    }
                }

                @Override
                public void onFailure(IMqttToken token, Throwable failure) {
                    LOG.warn("subscribing to {} failed: {}", toSend.stream().map(Subscription::filter).toList(),
                            describe(failure));
                }
            }, new MqttProperties());
        } catch (MqttException | RuntimeException e) {
            LOG.warn("subscribing to {} failed: {}", toSend.stream().map(Subscription::filter).toList(), describe(e));
        }
    }

    /** Fails every publish in the window with {@code reason} and every queued one as not sent. */
    private void failEverything(String reason) {
        List<Pending> sent = new ArrayList<>(inFlight);
        inFlight.clear();
        List<Pending> waiting = new ArrayList<>(queue);
        queuedCount.addAndGet(-queue.size());
        queue.clear();
        for (Pending pending : sent) {
            complete(pending, new PublishResult.Failed(reason));
        }
        for (Pending pending : waiting) {
            complete(pending, new PublishResult.Failed("not sent: " + reason));
        }
    }

    // ---- closing --------------------------------------------------------------------------------------------

    private PublishResult publishOffline(byte[] payload, long timeoutNanos) {
        CompletableFuture<PublishResult> result = new CompletableFuture<>();
        Pending offline = new Pending(OutgoingMessage.atLeastOnce(settings.statusTopic(), payload, true), result);
        boolean submitted = inLane(() -> {
            if (retryTask != null) {
                retryTask.cancel(false);
                retryTask = null;
            }
            queuedCount.incrementAndGet();
            enqueue(offline, true);
        });
        if (!submitted) {
            return new PublishResult.Failed("the MQTT link was already stopped");
        }
        try {
            return result.get(Math.max(timeoutNanos, 0), TimeUnit.NANOSECONDS);
        } catch (TimeoutException e) {
            return new PublishResult.Failed("the broker did not acknowledge the offline status within "
                    + TimeUnit.NANOSECONDS.toMillis(timeoutNanos) + " ms");
        } catch (ExecutionException e) {
            return new PublishResult.Failed(describe(e.getCause()));
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return new PublishResult.Failed("interrupted while publishing the offline status");
        }
    }

    private boolean disconnect(long deadline) {
        CompletableFuture<Boolean> done = new CompletableFuture<>();
        long quiesce = Math.min(1000, TimeUnit.NANOSECONDS.toMillis(remainingUntil(deadline)) / 2);
        // On this (the closing) thread: Paho refuses to disconnect from its own callback threads (32107).
        boolean submitted = lane.runHere(() -> {
            if (retryTask != null) {
                retryTask.cancel(false);
                retryTask = null;
            }
            if (!client.isConnected()) {
                done.complete(false);
                return;
            }
            try {
                client.disconnect(Math.max(quiesce, 0), null, new MqttActionListener() {
                    @Override
                    public void onSuccess(IMqttToken token) {
                        done.complete(true);
                    }

                    @Override
                    public void onFailure(IMqttToken token, Throwable failure) {
                        done.complete(false);
                    }
                }, 0, new MqttProperties());
            } catch (MqttException | RuntimeException e) {
                done.complete(false);
            }
        });
        boolean clean = false;
        if (submitted) {
            try {
                clean = done.get(Math.max(remainingUntil(deadline), 0), TimeUnit.NANOSECONDS);
            } catch (TimeoutException | ExecutionException e) {
                clean = false;
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
        if (!clean && client.isConnected()) {
            try {
                client.disconnectForcibly(0, 500, false);
            } catch (MqttException | RuntimeException e) {
                LOG.debug("forced disconnect from {}: {}", settings.serverUri(), describe(e));
            }
        }
        return clean;
    }

    private void shutdownExecutors(Duration bound) {
        long deadline = System.nanoTime() + bound.toNanos();
        lane.close();
        control.shutdown();
        callbacks.shutdown();
        // Paho's threads have nothing left to do once the client is closed: interrupt whatever still runs.
        pahoPool.shutdownNow();
        awaitStop(control, deadline);
        awaitStop(callbacks, deadline);
        awaitStop(pahoPool, Math.min(deadline, System.nanoTime() + TimeUnit.SECONDS.toNanos(1)));
    }

    private void awaitStop(ExecutorService executor, long deadline) {
        try {
            if (!executor.awaitTermination(Math.max(remainingUntil(deadline), 0), TimeUnit.NANOSECONDS)) {
                executor.shutdownNow();
                if (!executor.awaitTermination(200, TimeUnit.MILLISECONDS)) {
                    LOG.warn("MQTT link to {}: a thread did not stop (a Paho connect thread stuck as in"
                            + " paho.mqtt.java #850?)", settings.serverUri());
                }
            }
        } catch (InterruptedException e) {
            executor.shutdownNow();
            Thread.currentThread().interrupt();
        }
    }

    // ---- helpers --------------------------------------------------------------------------------------------

    /** Runs {@code task} in the lane; false once the link has stopped. */
    private boolean inLane(Runnable task) {
        return lane.submit(task);
    }

    private void onCallbacks(Runnable task) {
        if (lane.isRunningHere()) {
            handCompletionsOn(); // results decided before this callback are told before it
        }
        try {
            callbacks.execute(() -> {
                try {
                    task.run();
                } catch (RuntimeException e) {
                    LOG.error("MQTT link to {}: a handler failed", settings.serverUri(), e);
                }
            });
        } catch (RejectedExecutionException e) {
            LOG.debug("MQTT link to {} is closed; dropped a callback", settings.serverUri());
        }
    }

    private void complete(Pending pending, PublishResult result) {
        if (pending.decided) {
            return;
        }
        pending.decided = true;
        completions.add(() -> pending.result.complete(result));
    }

    /**
     * Hands the results the lane decided to the callback thread as one task: one wake-up for a burst of
     * acknowledgements instead of one each. Runs in the lane, so batches keep their order.
     */
    private void handCompletionsOn() {
        if (completions.isEmpty()) {
            return;
        }
        Runnable[] batch = completions.toArray(Runnable[]::new);
        completions.clear();
        Runnable tell = () -> {
            for (Runnable completion : batch) {
                try {
                    completion.run();
                } catch (RuntimeException e) {
                    LOG.error("MQTT link to {}: a publish result handler failed", settings.serverUri(), e);
                }
            }
        };
        try {
            callbacks.execute(tell);
        } catch (RejectedExecutionException e) {
            tell.run();
        }
    }

    private void dispatch(IncomingMessage message) {
        for (Subscription subscription : subscriptions) {
            if (subscription.matches(message.topic())) {
                try {
                    subscription.handler().accept(message);
                } catch (RuntimeException e) {
                    LOG.error("handler for {} failed on a message on {}", subscription.filter(), message.topic(), e);
                }
            }
        }
    }

    private static MqttMessage toPaho(OutgoingMessage message) {
        MqttMessage paho = new MqttMessage(message.payloadUnsafe());
        paho.setQos(message.qos());
        paho.setRetained(message.retained());
        if (message.responseTopic().isPresent() || message.correlationData().isPresent()) {
            MqttProperties properties = new MqttProperties();
            message.responseTopic().ifPresent(properties::setResponseTopic);
            message.correlationData().ifPresent(properties::setCorrelationData);
            paho.setProperties(properties);
        }
        return paho;
    }

    private static IncomingMessage fromPaho(String topic, MqttMessage message) {
        MqttProperties properties = message.getProperties();
        Optional<String> responseTopic = Optional.empty();
        Optional<byte[]> correlation = Optional.empty();
        if (properties != null) {
            responseTopic = Optional.ofNullable(properties.getResponseTopic()).filter(t -> !t.isEmpty());
            correlation = Optional.ofNullable(properties.getCorrelationData());
        }
        return new IncomingMessage(topic, message.getPayload(), message.getQos(), message.isRetained(),
                responseTopic, correlation);
    }

    private static int refusalCode(IMqttToken token) {
        int[] codes = token == null ? null : token.getReasonCodes();
        if (codes != null) {
            for (int code : codes) {
                if (code >= FIRST_REFUSAL_CODE) {
                    return code;
                }
            }
        }
        return -1;
    }

    private static MqttConnectionOptions connectionOptions(MqttLinkSettings settings) {
        MqttConnectionOptions options = new MqttConnectionOptions();
        options.setCleanStart(true);
        options.setSessionExpiryInterval(0L);
        options.setAutomaticReconnect(false);
        options.setConnectionTimeout((int) settings.connectTimeout().toSeconds());
        options.setKeepAliveInterval((int) settings.keepAlive().toSeconds());
        if (settings.secure()) {
            options.setSocketFactory(settings.tls().socketFactory());
            options.setHttpsHostnameVerificationEnabled(true);
        } else {
            options.setSocketFactory(new LinkSocketFactory());
        }
        MqttMessage will = new MqttMessage(settings.willPayload());
        will.setQos(1);
        will.setRetained(true);
        options.setWill(settings.statusTopic(), will);
        settings.username().ifPresent(options::setUserName);
        settings.password().ifPresent(p -> options.setPassword(p.getBytes(StandardCharsets.UTF_8)));
        return options;
    }

    /** A scheduler whose pending delayed tasks (retries, Paho's keep-alive pings) are dropped at shutdown. */
    private static ScheduledThreadPoolExecutor scheduler(int threads, LinkThreads factory) {
        ScheduledThreadPoolExecutor executor = new ScheduledThreadPoolExecutor(threads, factory);
        executor.setExecuteExistingDelayedTasksAfterShutdownPolicy(false);
        executor.setContinueExistingPeriodicTasksAfterShutdownPolicy(false);
        executor.setRemoveOnCancelPolicy(true);
        return executor;
    }

    private static void awaitQuietly(CompletableFuture<?> future, long timeoutNanos) {
        try {
            future.get(Math.max(timeoutNanos, 0), TimeUnit.NANOSECONDS);
        } catch (TimeoutException | ExecutionException e) {
            // go on closing
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    private static long remainingUntil(long deadline) {
        return deadline - System.nanoTime();
    }

    static String describe(Throwable e) {
        if (e == null) {
            return "unknown cause";
        }
        String message = e.getMessage();
        if (e instanceof MqttException m) {
            String cause = m.getCause() != null && m.getCause().getMessage() != null
                    ? " (" + m.getCause().getMessage() + ")" : "";
            return (message == null ? "MQTT error" : message) + " [" + m.getReasonCode() + "]" + cause;
        }
        return message == null || message.isBlank() ? e.getClass().getSimpleName() : message;
    }

    private final class PublishListener implements MqttActionListener {
        @Override
        public void onSuccess(IMqttToken token) {
            Pending pending = (Pending) token.getUserContext();
            inLane(() -> acknowledged(pending, token, null));
        }

        @Override
        public void onFailure(IMqttToken token, Throwable failure) {
            Pending pending = (Pending) token.getUserContext();
            inLane(() -> acknowledged(pending, token, failure));
        }
    }

    /** Paho's callbacks: each one only hands its work to our threads and returns. */
    private final class PahoCallbacks implements MqttCallback {
        @Override
        public void disconnected(MqttDisconnectResponse response) {
            String reason = response.getException() != null ? describe(response.getException())
                    : response.getReasonString() != null ? response.getReasonString()
                    : "disconnected by the broker (reason code " + response.getReturnCode() + ")";
            inLane(() -> connectionLost(reason));
        }

        @Override
        public void mqttErrorOccurred(MqttException exception) {
            LOG.warn("MQTT protocol error on {}: {}", settings.serverUri(), describe(exception));
        }

        @Override
        public void messageArrived(String topic, MqttMessage message) {
            IncomingMessage incoming = fromPaho(topic, message);
            onCallbacks(() -> dispatch(incoming));
        }

        @Override
        public void deliveryComplete(IMqttToken token) {
            // Results are reported through each publish's own listener.
        }

        @Override
        public void connectComplete(boolean reconnect, String serverUri) {
            // Our connect listener handles this in the lane.
        }

        @Override
        public void authPacketArrived(int reasonCode, MqttProperties properties) {
            // Enhanced authentication is not used.
        }
    }
}
