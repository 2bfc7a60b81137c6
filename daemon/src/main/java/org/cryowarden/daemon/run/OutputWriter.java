package org.cryowarden.daemon.run;

import java.time.Duration;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import java.util.concurrent.atomic.AtomicLong;
import java.util.function.BiConsumer;
import org.cryowarden.drivers.poll.BusPoller;
import org.cryowarden.drivers.spi.WriteResult;
import org.cryowarden.rules.engine.OutputCommand;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Executes the engine's output commands through the poller of the bus that owns each output, one at a time in
 * order. A write that fails, times out, or reads back another value reports a disagreement (the "command
 * disagree" alarm); a write that agrees clears it. Commands are never dropped; the engine never waits here.
 */
final class OutputWriter implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(OutputWriter.class);
    private static final double READBACK_TOLERANCE = 1e-6;

    private final LinkedBlockingQueue<OutputCommand> queue = new LinkedBlockingQueue<>();
    private volatile Map<String, BusPoller> owners;
    private final Duration timeout;
    private final BiConsumer<String, Optional<String>> results;
    private final AtomicLong writes = new AtomicLong();
    private final AtomicLong failures = new AtomicLong();
    private volatile boolean running;
    private volatile boolean busy;
    private Thread thread;

    OutputWriter(Map<String, BusPoller> owners, Duration timeout, BiConsumer<String, Optional<String>> results) {
        this.owners = Map.copyOf(owners);
        this.timeout = timeout;
        this.results = results;
    }

    void start() {
        running = true;
        thread = new Thread(this::loop, "outputs");
        thread.setDaemon(true);
        thread.start();
    }

    void offer(OutputCommand command) {
        queue.add(command);
    }

    void owners(Map<String, BusPoller> replaced) {
        owners = Map.copyOf(replaced);
    }

    int depth() {
        return queue.size();
    }

    long failures() {
        return failures.get();
    }

    long writes() {
        return writes.get();
    }

    boolean idle() {
        return queue.isEmpty() && !busy;
    }

    @Override
    public void close() {
        running = false;
        if (thread != null) {
            thread.interrupt();
            try {
                thread.join(5_000);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
    }

    private void loop() {
        while (running) {
            OutputCommand command;
            try {
                command = queue.poll(1, TimeUnit.SECONDS);
            } catch (InterruptedException e) {
                return;
            }
            if (command == null) {
                continue;
            }
            busy = true;
            try {
                Optional<String> disagreement = execute(command);
                writes.incrementAndGet();
                disagreement.ifPresent(d -> {
                    failures.incrementAndGet();
                    LOG.error("output {} := {} for {}: {}", command.outputId(), command.value(), drivenBy(command),
                            d);
                });
                results.accept(command.outputId(), disagreement);
            } finally {
                busy = false;
            }
        }
    }

    /**
     * What asked for the write, for the log: the common-alarm contact by name, otherwise the engine's own cause,
     * which starts with the interlock or fill controller it comes from ("interlock X tripped by Y", "fill F
     * opened: ...").
     */
    static String drivenBy(OutputCommand command) {
        if (command.interlockId().equals(CommonAlarmContact.SOURCE)) {
            return "the common-alarm contact (" + command.cause() + ")";
        }
        return command.cause();
    }

    private Optional<String> execute(OutputCommand command) {
        BusPoller owner = owners.get(command.outputId());
        if (owner == null) {
            return Optional.of("no bus drives output '" + command.outputId() + "'");
        }
        WriteResult result;
        try {
            result = owner.write(command.outputId(), command.value()).get(timeout.toMillis(), TimeUnit.MILLISECONDS);
        } catch (TimeoutException e) {
            return Optional.of("no confirmation within " + timeout.toMillis() + " ms");
        } catch (ExecutionException e) {
            return Optional.of("write failed: " + e.getCause());
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return Optional.of("interrupted while writing");
        }
        if (!result.ok()) {
            return Optional.of("write refused: " + result.reason());
        }
        if (result.readback().isPresent()
                && Math.abs(result.readback().getAsDouble() - command.value()) > READBACK_TOLERANCE) {
            return Optional.of("wrote " + command.value() + " but read back " + result.readback().getAsDouble());
        }
        return Optional.empty();
    }
}
