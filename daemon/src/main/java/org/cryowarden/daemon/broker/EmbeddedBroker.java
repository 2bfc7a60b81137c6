package org.cryowarden.daemon.broker;

import com.hivemq.embedded.EmbeddedHiveMQ;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.InetAddress;
import java.net.UnknownHostException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Comparator;
import java.util.Objects;
import java.util.OptionalInt;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import java.util.stream.Stream;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * An in-process MQTT 5 broker (HiveMQ Community Edition embedded) for sites that have no broker of their own.
 *
 * <p>It listens on 127.0.0.1 only (the broker lets every client in, hivemq-community-edition #293), keeps
 * sessions and retained messages in memory, never sends usage statistics, and works in a temporary folder that
 * it creates and deletes (inside a fat jar the broker would otherwise try to write next to the jar, #299). It
 * logs through our Logback configuration: the broker's own logging bootstrap is turned off (#575).
 *
 * <p>Lifecycle: {@link #start} returns a running broker or throws; {@link #close} stops it within a bound and
 * deletes its folder. A stopped broker cannot be restarted: start a new one. Thread-safe.
 */
public final class EmbeddedBroker implements AutoCloseable {

    /** The only address the embedded broker listens on. */
    public static final String BIND_ADDRESS = "127.0.0.1";

    /** How long {@link #close()} waits for the broker to stop (a stop takes about 4 s). */
    public static final Duration DEFAULT_STOP_TIMEOUT = Duration.ofSeconds(20);

    private static final Logger LOG = LoggerFactory.getLogger(EmbeddedBroker.class);

    private final EmbeddedHiveMQ hivemq;
    private final Path folder;
    private final int port;
    private final Duration startDuration;
    private final Object lock = new Object();
    private boolean closed;

    private EmbeddedBroker(EmbeddedHiveMQ hivemq, Path folder, int port, Duration startDuration) {
        this.hivemq = hivemq;
        this.folder = folder;
        this.port = port;
        this.startDuration = startDuration;
    }

    /**
     * Starts a broker on the port the choice allows and waits until it accepts connections.
     *
     * @param choice       which port to listen on
     * @param startTimeout how long to wait for the broker to come up
     * @throws BrokerStartException when the port is taken, the temporary folder cannot be written, or the broker
     *                              fails or does not start in time; the message says what to do
     */
    public static EmbeddedBroker start(PortChoice choice, Duration startTimeout) throws BrokerStartException {
        Objects.requireNonNull(choice, "choice");
        Objects.requireNonNull(startTimeout, "startTimeout");
        InetAddress loopback = loopback();
        int port = choosePort(loopback, choice);
        Path folder = createFolder(port);
        long started = System.nanoTime();
        EmbeddedHiveMQ hivemq;
        try {
            hivemq = EmbeddedHiveMQ.builder()
                    .withConfigurationFolder(folder.resolve("config"))
                    .withDataFolder(folder.resolve("data"))
                    .withExtensionsFolder(folder.resolve("extensions"))
                    .withoutLoggingBootstrap()
                    .build();
        } catch (RuntimeException | LinkageError e) {
            deleteFolder(folder);
            throw new BrokerStartException("the embedded MQTT broker cannot be built: " + describe(e)
                    + " (a class missing from the runnable jar?); configure an external broker in the site file", e);
        }
        try {
            hivemq.start().get(startTimeout.toMillis(), TimeUnit.MILLISECONDS);
        } catch (TimeoutException e) {
            abandon(hivemq, folder);
            throw new BrokerStartException("the embedded MQTT broker did not start within "
                    + startTimeout.toSeconds() + " s on " + BIND_ADDRESS + ":" + port
                    + "; the machine may be overloaded: try again, or configure an external broker in the site file");
        } catch (ExecutionException e) {
            abandon(hivemq, folder);
            throw new BrokerStartException("the embedded MQTT broker failed to start on " + BIND_ADDRESS + ":" + port
                    + ": " + describe(e.getCause()) + "; configure an external broker in the site file instead", e.getCause());
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            abandon(hivemq, folder);
            throw new BrokerStartException("interrupted while starting the embedded MQTT broker", e);
        }
        if (LocalPorts.isFree(loopback, port)) {
            // The broker logs a failed bind and carries on without the listener; nobody could connect.
            abandon(hivemq, folder);
            throw portTaken(port, "the broker could not open it");
        }
        Duration took = Duration.ofNanos(System.nanoTime() - started);
        LOG.info("embedded MQTT broker listening on tcp://{}:{} (in-memory, started in {} ms)",
                BIND_ADDRESS, port, took.toMillis());
        return new EmbeddedBroker(hivemq, folder, port, took);
    }

    /** The port the broker listens on (the one chosen when the choice searched upward). */
    public int port() {
        return port;
    }

    /** The URI clients connect to, e.g. {@code tcp://127.0.0.1:1883}. */
    public String serverUri() {
        return "tcp://" + BIND_ADDRESS + ":" + port;
    }

    /** The temporary folder the broker works in (deleted by {@link #stop}). */
    Path folder() {
        return folder;
    }

    /** How long {@link #start} took from building the broker to an open listener. */
    public Duration startDuration() {
        return startDuration;
    }

    /**
     * Stops the broker, waiting at most {@code timeout}, and deletes its folder. Idempotent.
     *
     * @return whether the broker reported that it stopped within the bound
     */
    public boolean stop(Duration timeout) {
        synchronized (lock) {
            if (closed) {
                return true;
            }
            closed = true;
        }
        boolean stopped = stopQuietly(hivemq, timeout);
        deleteFolder(folder);
        return stopped;
    }

    /** Stops within {@link #DEFAULT_STOP_TIMEOUT}; see {@link #stop(Duration)}. */
    @Override
    public void close() {
        stop(DEFAULT_STOP_TIMEOUT);
    }

    private static int choosePort(InetAddress loopback, PortChoice choice) throws BrokerStartException {
        OptionalInt free = LocalPorts.firstFree(loopback, choice);
        if (free.isPresent()) {
            return free.getAsInt();
        }
        if (!choice.searchUpward()) {
            throw portTaken(choice.port(), "another program is listening on it (perhaps another MQTT broker)");
        }
        throw new BrokerStartException("cannot start the embedded MQTT broker: every port from " + choice.port()
                + " to " + choice.lastCandidate() + " on " + BIND_ADDRESS
                + " is in use; choose a port in another range, or use the broker that is already running");
    }

    private static BrokerStartException portTaken(int port, String why) {
        return new BrokerStartException("cannot start the embedded MQTT broker: port " + port + " on " + BIND_ADDRESS
                + " is in use, " + why + "; stop that program, choose another port, "
                + "or configure the running broker in the site file instead");
    }

    private static Path createFolder(int port) throws BrokerStartException {
        Path folder = null;
        try {
            folder = Files.createTempDirectory("cryowarden-broker-");
            Files.createDirectories(folder.resolve("config"));
            Files.createDirectories(folder.resolve("data"));
            Files.createDirectories(folder.resolve("extensions"));
            Files.writeString(folder.resolve("config").resolve("config.xml"),
                    BrokerConfigXml.render(BIND_ADDRESS, port), StandardCharsets.UTF_8);
            return folder;
        } catch (IOException e) {
            if (folder != null) {
                deleteFolder(folder);
            }
            throw new BrokerStartException("cannot prepare the embedded MQTT broker's folder under "
                    + System.getProperty("java.io.tmpdir") + ": " + describe(e)
                    + "; free space there or point -Djava.io.tmpdir at a writable folder", e);
        }
    }

    private static void abandon(EmbeddedHiveMQ hivemq, Path folder) {
        stopQuietly(hivemq, DEFAULT_STOP_TIMEOUT);
        deleteFolder(folder);
    }

    private static boolean stopQuietly(EmbeddedHiveMQ hivemq, Duration timeout) {
        try {
            hivemq.stop().get(timeout.toMillis(), TimeUnit.MILLISECONDS);
            return true;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return false;
        } catch (ExecutionException | TimeoutException | RuntimeException e) {
            LOG.warn("embedded MQTT broker did not stop cleanly within {} s: {}", timeout.toSeconds(), describe(e));
            return false;
        }
    }

    private static void deleteFolder(Path folder) {
        try (Stream<Path> paths = Files.walk(folder)) {
            paths.sorted(Comparator.reverseOrder()).forEach(path -> {
                try {
                    Files.deleteIfExists(path);
                } catch (IOException e) {
                    throw new UncheckedIOException(e);
                }
            });
        } catch (IOException | UncheckedIOException e) {
            LOG.warn("could not delete the embedded broker folder {}: {}", folder, e.getMessage());
        }
    }

    private static InetAddress loopback() {
        try {
            return InetAddress.getByName(BIND_ADDRESS);
        } catch (UnknownHostException e) {
            throw new IllegalStateException("127.0.0.1 is always a valid address", e);
        }
    }

    private static String describe(Throwable e) {
        if (e == null) {
            return "unknown cause";
        }
        String message = e.getMessage();
        return message == null || message.isBlank() ? e.getClass().getSimpleName() : message;
    }
}
