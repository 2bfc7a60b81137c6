package org.cryowarden.simulator.emulators;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * A pseudo-terminal for a port: a {@code socat} process joins a pty (reached by a symlink such as
 * {@code /tmp/sim/rack-a-rs485}) to the port's TCP listener, so a master opens the emulated line as a serial
 * device. socat ends when either side closes (a master closing the pty, a port disconnect); a supervisor thread
 * starts it again on the same link path unless the bridge is suspended or closed. A pty ignores the baud rate,
 * so line timing comes from the port's pacing.
 */
public final class PtyBridge implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(PtyBridge.class);

    private final Path link;
    private final String host;
    private final int tcpPort;
    private final Object lock = new Object();
    private Process process;
    private volatile boolean suspended;
    private volatile boolean closed;
    private Thread supervisor;

    public PtyBridge(Path link, String host, int tcpPort) {
        this.link = link;
        this.host = host;
        this.tcpPort = tcpPort;
    }

    public Path link() {
        return link;
    }

    /**
     * Starts socat and waits (at most 5 s) for the link to appear.
     *
     * @throws IOException when socat is missing or the link does not appear
     */
    public void start() throws IOException {
        launch();
        long deadline = System.nanoTime() + 5_000_000_000L;
        while (!Files.exists(link)) {
            if (System.nanoTime() > deadline) {
                close();
                throw new IOException("socat did not create the pseudo-terminal " + link + " within 5 s");
            }
            try {
                Thread.sleep(10);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new IOException("interrupted while starting socat", e);
            }
        }
        supervisor = new Thread(this::supervise, "sim-pty " + link.getFileName());
        supervisor.setDaemon(true);
        supervisor.start();
    }

    private void launch() throws IOException {
        List<String> command = List.of("socat", "pty,raw,echo=0,link=" + link, "tcp:" + host + ":" + tcpPort);
        synchronized (lock) {
            if (suspended || closed) {
                return; // taken away between the supervisor's check and here
            }
            try {
                process = new ProcessBuilder(command).redirectErrorStream(true)
                        .redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
            } catch (IOException e) {
                throw new IOException("cannot start socat for the pseudo-terminal " + link + " (" + e.getMessage()
                        + "); install socat or run without --pty-dir", e);
            }
        }
    }

    private void supervise() {
        while (!closed) {
            Process current;
            synchronized (lock) {
                current = process;
            }
            try {
                if (current != null) {
                    current.waitFor();
                }
                Thread.sleep(200);
            } catch (InterruptedException e) {
                return;
            }
            if (!closed && !suspended) {
                try {
                    launch();
                } catch (IOException e) {
                    LOG.warn("{}", e.getMessage());
                }
            }
        }
    }

    /**
     * Takes the pty away (a vanished USB adapter: socat ends and its link is gone when this returns, within a
     * bound of 2 s) or lets the supervisor bring it back on the same link path within about 200 ms.
     */
    public void setSuspended(boolean down) {
        Process current;
        synchronized (lock) {
            suspended = down;
            current = down ? process : null;
        }
        if (current == null) {
            return;
        }
        current.destroy();
        try {
            if (!current.waitFor(2, java.util.concurrent.TimeUnit.SECONDS)) {
                current.destroyForcibly();
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
        try {
            Files.deleteIfExists(link);
        } catch (IOException e) {
            LOG.warn("cannot remove the pseudo-terminal link {}: {}", link, e.getMessage());
        }
    }

    @Override
    public void close() {
        closed = true;
        Process current;
        synchronized (lock) {
            current = process;
        }
        if (current != null) {
            current.destroy();
            try {
                if (!current.waitFor(2, java.util.concurrent.TimeUnit.SECONDS)) {
                    current.destroyForcibly();
                }
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
        if (supervisor != null) {
            supervisor.interrupt();
        }
        try {
            Files.deleteIfExists(link);
        } catch (IOException e) {
            // socat removes its link on a clean exit; this is only a leftover
        }
    }
}
