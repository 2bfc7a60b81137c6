package org.cryowarden.daemon.mqtt;

import java.util.Queue;
import java.util.concurrent.ConcurrentLinkedQueue;
import java.util.concurrent.locks.ReentrantLock;
import java.util.function.Consumer;

/**
 * Runs tasks one at a time, in the order they were submitted, on whichever thread submits them: the thread that
 * finds the lane free runs every task waiting, a thread that finds it busy leaves its task to the one running and
 * returns at once.
 *
 * <p>Why: the link's state (queue, window, connection) must change on one thread at a time, and a dedicated thread
 * for that costs two thread wake-ups per publish (submit, then the broker's acknowledgement), which halved the
 * publish rate against a bare client. A lane gives the same one-at-a-time order without the hand-offs. Because
 * no thread ever waits for the lane, a task may call into Paho while Paho's threads call back into the lane
 * without a deadlock; a task that submits another (directly or through a callback that runs inline) has it run
 * after itself, as an executor would.
 *
 * <p>Tasks must not block: they hold up every thread that submits meanwhile only by the length of the task.
 */
final class SerialLane {

    private final Queue<Runnable> waiting = new ConcurrentLinkedQueue<>();
    private final ReentrantLock running = new ReentrantLock();
    private final Consumer<RuntimeException> failures;
    private final Runnable beforeRelease;
    private volatile boolean closed;

    /**
     * @param failures      told about a task that threw; the lane goes on with the next one
     * @param beforeRelease run by the draining thread after its last task, still in the lane (to hand on what
     *                      the tasks collected in one piece)
     */
    SerialLane(Consumer<RuntimeException> failures, Runnable beforeRelease) {
        this.failures = failures;
        this.beforeRelease = beforeRelease;
    }

    /** Submits {@code task}; returns false, and drops it, once the lane is closed. */
    boolean submit(Runnable task) {
        if (closed) {
            return false;
        }
        waiting.add(task);
        drain();
        return true;
    }

    /**
     * Runs {@code task} in the lane on the calling thread, after every task submitted before it, waiting for the
     * lane when another thread has it: for calls a library refuses on its own callback threads (Paho will not
     * connect or disconnect from one). Returns false, and drops it, once the lane is closed. Never call it from a
     * task.
     */
    boolean runHere(Runnable task) {
        if (closed) {
            return false;
        }
        if (running.isHeldByCurrentThread()) {
            throw new IllegalStateException("runHere called from a task of the same lane");
        }
        running.lock();
        try {
            runWaiting();
            run(task);
            runWaiting();
            finish();
        } finally {
            running.unlock();
        }
        drain();
        return true;
    }

    /** Whether the calling thread is running a task of this lane right now. */
    boolean isRunningHere() {
        return running.isHeldByCurrentThread();
    }

    /** Refuses every later task; tasks already submitted still run. */
    void close() {
        closed = true;
    }

    private void drain() {
        if (running.isHeldByCurrentThread()) {
            return; // submitted from inside a task: the loop below runs it next
        }
        // Re-check after unlocking: a task added while this thread held the lane is otherwise stranded.
        while (!waiting.isEmpty() && running.tryLock()) {
            try {
                runWaiting();
                finish();
            } finally {
                running.unlock();
            }
        }
    }

    private void runWaiting() {
        Runnable task;
        while ((task = waiting.poll()) != null) {
            run(task);
        }
    }

    private void run(Runnable task) {
        try {
            task.run();
        } catch (RuntimeException e) {
            failures.accept(e);
        }
    }

    private void finish() {
        try {
            beforeRelease.run();
        } catch (RuntimeException e) {
            failures.accept(e);
        }
    }
}
