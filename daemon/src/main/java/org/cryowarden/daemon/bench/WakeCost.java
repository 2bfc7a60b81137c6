package org.cryowarden.daemon.bench;

import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.time.Duration;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.locks.Condition;
import java.util.concurrent.locks.ReentrantLock;

/**
 * What one timed wake-up costs on this machine: a thread that does nothing but wait {@code gap} on a condition,
 * again and again, and the CPU time it is charged per wake-up. On a hypervisor this is far from free (tens of
 * microseconds where the guest's idle exit lands on the woken thread), and a poller that spreads its instruments
 * over the period wakes once per phase: the footprint suite measures this in the same run, so that a CPU figure
 * can be read against what the wake-ups alone cost here.
 */
record WakeCost(Duration gap, int wakeUps, long cpuNanos) {

    /** Waits {@code wakeUps} times {@code gap} on the calling thread and takes its CPU time. */
    static WakeCost measure(Duration gap, int wakeUps) throws InterruptedException {
        ThreadMXBean threads = ManagementFactory.getThreadMXBean();
        ReentrantLock lock = new ReentrantLock();
        Condition never = lock.newCondition();
        long cpu0 = threads.getCurrentThreadCpuTime();
        long next = System.nanoTime();
        for (int i = 0; i < wakeUps; i++) {
            next += gap.toNanos();
            lock.lock();
            try {
                long wait;
                while ((wait = next - System.nanoTime()) > 0) {
                    never.awaitNanos(wait);
                }
            } finally {
                lock.unlock();
            }
        }
        return new WakeCost(gap, wakeUps, Math.max(0, threads.getCurrentThreadCpuTime() - cpu0));
    }

    double microsPerWakeUp() {
        return cpuNanos / 1e3 / wakeUps;
    }

    /** Percent of one core that {@code perSecond} such wake-ups cost. */
    double percentOfOneCoreAt(double perSecond) {
        return cpuNanos / (double) wakeUps * perSecond / TimeUnit.SECONDS.toNanos(1) * 100;
    }
}
