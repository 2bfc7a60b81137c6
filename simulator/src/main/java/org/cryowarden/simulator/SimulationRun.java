package org.cryowarden.simulator;

import java.time.Duration;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;

/** A simulation running on its own thread; {@link #stop} ends it early. */
public final class SimulationRun {

    private final CountDownLatch done = new CountDownLatch(1);
    private volatile boolean stopRequested;
    private volatile Throwable failure;
    private Thread thread;

    SimulationRun() {
    }

    void start(Runnable body) {
        thread = new Thread(() -> {
            try {
                body.run();
            } catch (Throwable t) {
                failure = t;
            } finally {
                done.countDown();
            }
        }, "simulation");
        thread.setDaemon(true);
        thread.start();
    }

    boolean stopRequested() {
        return stopRequested;
    }

    /** Asks the run to end after the current step and waits (at most 5 s) for it. */
    public void stop() {
        stopRequested = true;
        if (thread != null) {
            thread.interrupt();
        }
        try {
            done.await(5, TimeUnit.SECONDS);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    /** Waits for the run to finish; true when it did within {@code timeout}. */
    public boolean await(Duration timeout) throws InterruptedException {
        return done.await(timeout.toNanos(), TimeUnit.NANOSECONDS);
    }

    public boolean isFinished() {
        return done.getCount() == 0;
    }

    /** The exception that ended the run early, if any (a bug in the simulator). */
    public Throwable failure() {
        return failure;
    }
}
