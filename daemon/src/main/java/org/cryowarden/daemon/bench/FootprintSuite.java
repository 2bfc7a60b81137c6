package org.cryowarden.daemon.bench;

import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import org.cryowarden.drivers.poll.BusPoller;

/**
 * The daemon's footprint over a night, scaled down: 200 channels polled at 1 Hz with their rules, the journal
 * and MQTT, at real speed for at least 10 minutes (an hour scaled by the run's length), once the JIT has settled
 * after start (at least 30 s, at most 4 min). Measured: heap in use
 * after a full GC, resident set (VmRSS of /proc/self/status), CPU of one core from the process CPU time with the
 * bench device's threads taken out (and, beside it, how much of the time the JIT spent compiling), and journal
 * growth per channel-hour; beside the CPU, which threads spent it ({@link ThreadCpu}) and, measured after the run,
 * what one bare timed wake-up costs on the machine ({@link WakeCost}), since on a virtual machine the pollers'
 * wake-ups rather than their work set the figure. One channel crosses its limit every 10 s and returns 3 s
 * later, so alarms flow through the journal and the broker too.
 */
final class FootprintSuite {

    static final int CHANNELS = 200;
    static final int BUSES = 4;
    static final double HEAP_BUDGET_MB = 64;
    static final double CPU_BUDGET_PERCENT = 2;
    static final Duration WARM_AT_LEAST = Duration.ofSeconds(30);
    static final Duration WARM_AT_MOST = Duration.ofMinutes(4);
    static final Duration JIT_WINDOW = Duration.ofSeconds(10);
    /** Compiling for less than this in a window of {@link #JIT_WINDOW} (1 % of it) counts as settled. */
    static final Duration JIT_SETTLED = Duration.ofMillis(100);

    BenchResult run(BenchSettings settings) throws Exception {
        Duration measure = settings.measure(Duration.ofMinutes(10));
        Duration warm = settings.seconds().isPresent() ? Duration.ofSeconds(1) : WARM_AT_LEAST;
        try (BrokerChoice broker = BrokerChoice.open(settings);
             BenchPlant plant = BenchPlant.start(CHANNELS, BUSES, Duration.ofSeconds(1), broker.uri(),
                     settings.together())) {
            settings.say("footprint: " + CHANNELS + " channels at 1 Hz, warming up at least " + warm.toSeconds()
                    + " s, then measuring " + measure.toSeconds() + " s of real time on the " + broker.description());
            var jit = ManagementFactory.getCompilationMXBean();
            Duration warmed = warmUp(jit, warm, settings.seconds().isPresent());
            settings.say(String.format(Locale.ROOT, "footprint: warmed up for %d s", warmed.toSeconds()));
            var os = (com.sun.management.OperatingSystemMXBean) ManagementFactory.getOperatingSystemMXBean();
            ThreadMXBean threads = ManagementFactory.getThreadMXBean();
            long jit0 = jit.isCompilationTimeMonitoringSupported() ? jit.getTotalCompilationTime() : 0;
            long cpu0 = os.getProcessCpuTime();
            long device0 = deviceCpu(plant, threads);
            ThreadCpu byThread0 = ThreadCpu.now(deviceThreadIds(plant));
            long journal0 = plant.journalStoredBytes();
            long processed0 = LatencySuite.processed(plant);
            long start = System.nanoTime();
            long end = start + measure.toNanos();
            int channel = 0;
            long nextCrossing = start;
            while (System.nanoTime() < end) {
                long now = System.nanoTime();
                if (now >= nextCrossing) {
                    int c = channel;
                    plant.deviceOf(c).set(plant.registerOf(c), BenchPlant.HIGH, false);
                    channel = (channel + 1) % CHANNELS;
                    nextCrossing += Duration.ofSeconds(10).toNanos();
                    Thread.sleep(Math.min(3_000, Math.max(1, (end - System.nanoTime()) / 1_000_000)));
                    plant.deviceOf(c).set(plant.registerOf(c), BenchPlant.NORMAL, false);
                }
                Thread.sleep(Math.max(1, Math.min(1_000, (Math.min(end, nextCrossing) - System.nanoTime()) / 1_000_000)));
            }
            double wall = (System.nanoTime() - start) / 1e9;
            long cpu = os.getProcessCpuTime() - cpu0;
            long jitMs = jit.isCompilationTimeMonitoringSupported() ? jit.getTotalCompilationTime() - jit0 : 0;
            long device = deviceCpu(plant, threads) - device0;
            Map<String, Long> byRole = ThreadCpu.now(deviceThreadIds(plant)).since(byThread0);
            long journalGrowth = plant.journalStoredBytes() - journal0;
            long journalFiles = plant.journalFileBytes();
            long processed = LatencySuite.processed(plant) - processed0;
            // after the measurement, so that it does not add to it
            WakeCost wake = WakeCost.measure(BusPoller.PHASE_GAP, settings.seconds().isPresent() ? 10 : 100);
            double pollerWakeUps = BUSES * (settings.together() ? 1.0
                    : Math.min(CHANNELS / BUSES, Duration.ofSeconds(1).toNanos() / BusPoller.PHASE_GAP.toNanos()));
            System.gc();
            System.gc();
            Thread.sleep(200);
            double heapMb = ManagementFactory.getMemoryMXBean().getHeapMemoryUsage().getUsed() / 1048576.0;
            double rssMb = statusKb("VmRSS") / 1024.0;
            double cpuPercent = (cpu - device) / 1e9 / wall * 100;
            double processCpuPercent = cpu / 1e9 / wall * 100;
            double jitPercent = jitMs / 1e3 / wall * 100;
            long javaThreads = byRole.values().stream().mapToLong(Long::longValue).sum();
            double jvmOwnPercent = Math.max(0, cpu - device - javaThreads) / 1e9 / wall * 100;
            double channelHours = CHANNELS * wall / 3600;
            double journalPerChannelHour = journalGrowth / channelHours;
            Map<String, Double> figures = new LinkedHashMap<>();
            figures.put("heap_after_gc_mb", heapMb);
            figures.put("rss_mb", rssMb);
            figures.put("cpu_percent_of_one_core", cpuPercent);
            figures.put("process_cpu_percent_with_bench_device", processCpuPercent);
            byRole.forEach((role, nanos) -> {
                if (nanos > 0) {
                    figures.put("cpu_percent_thread_" + role.replace(' ', '_'), nanos / 1e9 / wall * 100);
                }
            });
            figures.put("cpu_percent_jvm_own_threads", jvmOwnPercent);
            figures.put("bare_timed_wake_up_cpu_us", wake.microsPerWakeUp());
            figures.put("poller_wake_ups_per_second", pollerWakeUps);
            figures.put("journal_bytes_per_channel_hour", Math.max(journalPerChannelHour, 0));
            figures.put("journal_file_bytes_at_end", (double) journalFiles);
            figures.put("readings_per_second", processed / wall);
            figures.put("wall_seconds", wall);
            figures.put("warm_up_seconds", (double) warmed.toSeconds());
            Map<String, Double> reference = new LinkedHashMap<>();
            reference.put("heap_budget_mb", HEAP_BUDGET_MB);
            reference.put("cpu_budget_percent", CPU_BUDGET_PERCENT);
            Map<String, Double> ratio = new LinkedHashMap<>();
            ratio.put("heap_to_budget", heapMb / HEAP_BUDGET_MB);
            ratio.put("cpu_to_budget", cpuPercent / CPU_BUDGET_PERCENT);
            boolean meets = heapMb < HEAP_BUDGET_MB && cpuPercent < CPU_BUDGET_PERCENT;
            List<String> lines = new ArrayList<>();
            lines.add("footprint: " + CHANNELS + " channels at 1 Hz on " + BUSES + " Modbus TCP buses polled "
                    + (settings.together() ? "each all at once" : "instrument by instrument in phases") + ", "
                    + 2 * CHANNELS + " rules, journal and MQTT on the " + broker.description()
                    + String.format(Locale.ROOT, ", %.0f s of real time (scaled to an hour) after %d s of warm-up",
                    wall, warmed.toSeconds()));
            if (broker.embedded()) {
                lines.add("  note: the embedded broker runs in this process; heap, RSS and CPU include it");
            }
            lines.add(String.format(Locale.ROOT, "  heap after GC:  %.1f MB (budget %.0f MB, %.0f %% of it)", heapMb,
                    HEAP_BUDGET_MB, heapMb / HEAP_BUDGET_MB * 100));
            lines.add(String.format(Locale.ROOT, "  resident set:   %.1f MB (VmRSS; the JVM's own share included)",
                    rssMb));
            lines.add(String.format(Locale.ROOT, "  CPU:            %.2f %% of one core (budget %.0f %%); %.2f %% with"
                    + " the bench device's threads", cpuPercent, CPU_BUDGET_PERCENT, processCpuPercent));
            lines.add(String.format(Locale.ROOT, "                  JIT compiling meanwhile: %.2f %% (elapsed time of the"
                    + " compilations, an upper bound on their share; it fades as the night goes on)", jitPercent));
            lines.add("                  by thread: " + byThread(byRole, wall) + String.format(Locale.ROOT,
                    "; the JVM's own threads (JIT compilers, GC, VM) and threads that ended %.2f %%", jvmOwnPercent));
            lines.add(String.format(Locale.ROOT, "  wake-ups:       a bare %d ms timed wait costs %.0f us of CPU per"
                    + " wake-up on this machine; the pollers' %.0f wake-ups per second alone would cost %.2f %% at"
                    + " that rate", BusPoller.PHASE_GAP.toMillis(), wake.microsPerWakeUp(), pollerWakeUps,
                    wake.percentOfOneCoreAt(pollerWakeUps)));
            lines.add(String.format(Locale.ROOT, "  journal:        %,.0f bytes per channel-hour (%,d bytes of pages in use"
                    + " in %.2f channel-hours); %,d bytes on disk at the end, write-ahead log included",
                    journalPerChannelHour, journalGrowth, channelHours, journalFiles));
            lines.add(String.format(Locale.ROOT, "  readings:       %,.1f per second taken by the engine",
                    processed / wall));
            return new BenchResult("footprint", figures, reference, ratio,
                    "heap after GC < 64 MB and CPU < 2 % of one core", meets, lines);
        }
    }

    /**
     * Runs the plant for {@code least}, then until the JIT has settled (compiled for less than
     * {@link #JIT_SETTLED} over the last {@link #JIT_WINDOW}) or {@link #WARM_AT_MOST} has passed: a night runs
     * for hours, and the compilations of its first minutes are not what it costs once it runs. The compilations
     * still going on while measuring are reported beside the CPU figure.
     */
    private static Duration warmUp(java.lang.management.CompilationMXBean jit, Duration least, boolean smoke)
            throws InterruptedException {
        long start = System.nanoTime();
        Thread.sleep(least.toMillis());
        if (smoke || !jit.isCompilationTimeMonitoringSupported()) {
            return Duration.ofNanos(System.nanoTime() - start);
        }
        long limit = start + WARM_AT_MOST.toNanos();
        long before = jit.getTotalCompilationTime();
        while (System.nanoTime() < limit) {
            Thread.sleep(JIT_WINDOW.toMillis());
            long now = jit.getTotalCompilationTime();
            if (now - before < JIT_SETTLED.toMillis()) {
                break;
            }
            before = now;
        }
        return Duration.ofNanos(System.nanoTime() - start);
    }

    /** The roles whose share rounds to at least 0.01 % of a core, largest first: "poller 1.65 %, engine 0.08 %". */
    private static String byThread(Map<String, Long> byRole, double wallSeconds) {
        List<String> parts = new ArrayList<>();
        byRole.forEach((role, nanos) -> {
            double percent = nanos / 1e9 / wallSeconds * 100;
            if (percent >= 0.005) {
                parts.add(String.format(Locale.ROOT, "%s %.2f %%", role, percent));
            }
        });
        return parts.isEmpty() ? "none measurable" : String.join(", ", parts);
    }

    private static Set<Long> deviceThreadIds(BenchPlant plant) {
        Set<Long> ids = new HashSet<>();
        for (BenchDevice device : plant.devices()) {
            for (Thread thread : device.threads()) {
                ids.add(thread.getId());
            }
        }
        return ids;
    }

    private static long deviceCpu(BenchPlant plant, ThreadMXBean threads) {
        long total = 0;
        for (long id : deviceThreadIds(plant)) {
            total += Math.max(0, threads.getThreadCpuTime(id));
        }
        return total;
    }

    /** A line of /proc/self/status in kB; 0 where there is no such file (not Linux). */
    private static long statusKb(String key) throws IOException {
        Path status = Path.of("/proc/self/status");
        if (!Files.exists(status)) {
            return 0;
        }
        for (String line : Files.readAllLines(status)) {
            if (line.startsWith(key + ":")) {
                return Long.parseLong(line.substring(key.length() + 1).replace("kB", "").strip());
            }
        }
        return 0;
    }
}
