package org.cryowarden.drivers.testing;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.concurrent.TimeUnit;

/**
 * A pair of connected pseudo-terminals from {@code socat}, reachable through two symlinks, for tests that need a
 * real serial line. {@link #kill()} makes both ends vanish as an unplugged USB adapter would, {@link #restart()}
 * brings them back on the same link paths. Waits are bounded; {@link #close()} cleans up.
 */
public final class SocatPair implements AutoCloseable {

    private static final Duration START_BOUND = Duration.ofSeconds(10);

    private final Path near;
    private final Path far;
    private Process process;

    private SocatPair(Path near, Path far) {
        this.near = near;
        this.far = far;
    }

    /** Starts socat with links {@code <folder>/near} and {@code <folder>/far}. */
    public static SocatPair start(Path folder) throws IOException, InterruptedException {
        SocatPair pair = new SocatPair(folder.resolve("near"), folder.resolve("far"));
        pair.launch();
        return pair;
    }

    /** True when socat is installed (tests needing it are skipped otherwise, with a message). */
    public static boolean available() {
        try {
            Process which = new ProcessBuilder("socat", "-V").redirectErrorStream(true).start();
            which.getInputStream().readAllBytes();
            return which.waitFor(5, TimeUnit.SECONDS) && which.exitValue() == 0;
        } catch (IOException e) {
            return false;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return false;
        }
    }

    /** The end the driver opens. */
    public Path near() {
        return near;
    }

    /** The end the test device opens. */
    public Path far() {
        return far;
    }

    /** Kills socat and waits (bounded) until both links are gone. */
    public void kill() throws InterruptedException {
        process.destroy();
        if (!process.waitFor(5, TimeUnit.SECONDS)) {
            process.destroyForcibly().waitFor(5, TimeUnit.SECONDS);
        }
        long deadline = System.nanoTime() + START_BOUND.toNanos();
        while ((Files.exists(near, java.nio.file.LinkOption.NOFOLLOW_LINKS)
                || Files.exists(far, java.nio.file.LinkOption.NOFOLLOW_LINKS)) && System.nanoTime() < deadline) {
            try {
                Files.deleteIfExists(near);
                Files.deleteIfExists(far);
            } catch (IOException e) {
                // socat removes them itself; retry until the bound
            }
        }
    }

    /** Starts socat again on the same links. */
    public void restart() throws IOException, InterruptedException {
        launch();
    }

    @Override
    public void close() throws InterruptedException {
        if (process != null && process.isAlive()) {
            kill();
        }
    }

    private void launch() throws IOException, InterruptedException {
        process = new ProcessBuilder("socat", "-d", "-d",
                "pty,raw,echo=0,link=" + near, "pty,raw,echo=0,link=" + far)
                .redirectErrorStream(true)
                .redirectOutput(ProcessBuilder.Redirect.DISCARD)
                .start();
        long deadline = System.nanoTime() + START_BOUND.toNanos();
        while (!(Files.exists(near) && Files.exists(far))) {
            if (!process.isAlive()) {
                throw new IOException("socat exited with " + process.exitValue() + " before creating " + near);
            }
            if (System.nanoTime() > deadline) {
                process.destroyForcibly();
                throw new IOException("socat did not create " + near + " and " + far + " within " + START_BOUND);
            }
            process.waitFor(20, TimeUnit.MILLISECONDS);
        }
    }
}
