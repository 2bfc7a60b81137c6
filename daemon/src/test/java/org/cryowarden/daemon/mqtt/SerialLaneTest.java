package org.cryowarden.daemon.mqtt;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicReference;
import org.junit.jupiter.api.Test;

class SerialLaneTest {

    private final List<RuntimeException> failures = Collections.synchronizedList(new ArrayList<>());
    private final AtomicInteger releases = new AtomicInteger();
    private final SerialLane lane = new SerialLane(failures::add, releases::incrementAndGet);

    @Test
    void aFreeLaneRunsTheTaskOnTheSubmittingThreadAtOnce() {
        AtomicReference<Thread> ranOn = new AtomicReference<>();

        assertThat(lane.submit(() -> ranOn.set(Thread.currentThread()))).isTrue();

        assertThat(ranOn.get()).isSameAs(Thread.currentThread());
        assertThat(releases.get()).isEqualTo(1);
    }

    @Test
    void aBusyLaneLeavesTheTaskToTheThreadRunningItAndReturnsAtOnce() throws Exception {
        CountDownLatch letGo = new CountDownLatch(1);
        List<String> order = Collections.synchronizedList(new ArrayList<>());
        AtomicReference<Thread> secondRanOn = new AtomicReference<>();
        Thread holder = holdTheLane(letGo, order, "first");

        lane.submit(() -> {
            order.add("second");
            secondRanOn.set(Thread.currentThread());
        });
        assertThat(order).isEmpty(); // returned without running it

        letGo.countDown();
        holder.join(10_000);
        assertThat(order).containsExactly("first", "second");
        assertThat(secondRanOn.get()).isSameAs(holder);
    }

    @Test
    void aTaskSubmittedFromATaskRunsAfterItNotInsideIt() {
        List<String> order = new ArrayList<>();

        lane.submit(() -> {
            order.add("outer starts");
            lane.submit(() -> order.add("inner"));
            order.add("outer ends");
        });

        assertThat(order).containsExactly("outer starts", "outer ends", "inner");
    }

    @Test
    void tasksFromManyThreadsRunOneAtATimeAndEachThreadsInItsOwnOrder() throws Exception {
        int threads = 4;
        int each = 5_000;
        AtomicInteger inside = new AtomicInteger();
        AtomicInteger overlaps = new AtomicInteger();
        int[][] seen = new int[threads][1];
        List<String> outOfOrder = Collections.synchronizedList(new ArrayList<>());
        List<Thread> submitters = new ArrayList<>();
        CountDownLatch start = new CountDownLatch(1);
        for (int t = 0; t < threads; t++) {
            int who = t;
            submitters.add(new Thread(() -> {
                await(start);
                for (int i = 0; i < each; i++) {
                    int n = i;
                    lane.submit(() -> {
                        if (inside.incrementAndGet() != 1) {
                            overlaps.incrementAndGet();
                        }
                        if (seen[who][0] != n) {
                            outOfOrder.add(who + ": " + n + " after " + seen[who][0]);
                        }
                        seen[who][0] = n + 1;
                        inside.decrementAndGet();
                    });
                }
            }));
        }
        submitters.forEach(Thread::start);
        start.countDown();
        for (Thread submitter : submitters) {
            submitter.join(30_000);
        }

        assertThat(overlaps.get()).isZero();
        assertThat(outOfOrder).isEmpty();
        for (int t = 0; t < threads; t++) {
            assertThat(seen[t][0]).isEqualTo(each);
        }
    }

    @Test
    void runHereWaitsForTheLaneThenRunsOnTheCallingThreadAfterWhatWasSubmittedBefore() throws Exception {
        CountDownLatch letGo = new CountDownLatch(1);
        List<String> order = Collections.synchronizedList(new ArrayList<>());
        Thread holder = holdTheLane(letGo, order, "holder");
        lane.submit(() -> order.add("queued before"));
        AtomicReference<Thread> ranOn = new AtomicReference<>();
        Thread caller = new Thread(() -> lane.runHere(() -> {
            order.add("here");
            ranOn.set(Thread.currentThread());
        }), "caller");
        caller.start();

        letGo.countDown();
        holder.join(10_000);
        caller.join(10_000);

        assertThat(order).containsExactly("holder", "queued before", "here");
        assertThat(ranOn.get()).isSameAs(caller);
    }

    @Test
    void runHereFromInsideATaskIsRefused() {
        lane.submit(() -> assertThatThrownBy(() -> lane.runHere(() -> { }))
                .isInstanceOf(IllegalStateException.class));

        assertThat(failures).isEmpty();
    }

    @Test
    void aFailingTaskIsReportedAndTheNextOneStillRuns() {
        List<String> order = new ArrayList<>();

        lane.submit(() -> {
            lane.submit(() -> {
                throw new IllegalStateException("broken task");
            });
            lane.submit(() -> order.add("after the broken one"));
        });

        assertThat(failures).extracting(Throwable::getMessage).containsExactly("broken task");
        assertThat(order).containsExactly("after the broken one");
    }

    @Test
    void aClosedLaneRefusesNewTasks() {
        lane.close();

        assertThat(lane.submit(() -> { })).isFalse();
        assertThat(lane.runHere(() -> { })).isFalse();
        assertThat(releases.get()).isZero();
    }

    /**
     * Starts a thread whose task holds the lane until {@code letGo} opens, then adds {@code entry} to
     * {@code order}; returns once that task runs.
     */
    private Thread holdTheLane(CountDownLatch letGo, List<String> order, String entry) throws InterruptedException {
        CountDownLatch inside = new CountDownLatch(1);
        Thread holder = new Thread(() -> lane.submit(() -> {
            inside.countDown();
            await(letGo);
            order.add(entry);
        }), "holder");
        holder.start();
        assertThat(inside.await(10, TimeUnit.SECONDS)).isTrue();
        return holder;
    }

    private static void await(CountDownLatch latch) {
        try {
            if (!latch.await(10, TimeUnit.SECONDS)) {
                throw new IllegalStateException("latch not released within 10 s");
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException(e);
        }
    }
}
