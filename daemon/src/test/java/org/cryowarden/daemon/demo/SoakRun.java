package org.cryowarden.daemon.demo;

import com.fasterxml.jackson.databind.JsonNode;
import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryMXBean;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.OptionalInt;
import java.util.Random;
import java.util.stream.Stream;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.daemon.run.Payloads;
import org.cryowarden.simulator.emulators.Fault;
import org.cryowarden.simulator.emulators.FaultKind;
import org.cryowarden.simulator.emulators.Instrument;

/**
 * Simulated days of the quiet night scenario through the real pipeline (emulators over TCP, drivers, engine,
 * SQLite journal, the machine's Mosquitto), with random faults: about twelve a day, an instrument falls silent,
 * answers garbage or answers later than its timeout for 30 s to 150 s. After each day it collects garbage and measures heap, threads, open file
 * descriptors, events journaled and events the dashboard did not get. Heap and threads must stay flat after the
 * first day: heap within {@value #HEAP_TOLERANCE_MB} MB of day 1 (and 25 %), threads within {@value
 * #THREAD_TOLERANCE}.
 *
 * <pre>java ... org.cryowarden.daemon.demo.SoakRun [days] [day-length] [step] [faults-per-day] [seed]</pre>
 * defaults 7 days of 24 h in 5 s steps (shorter than the 10 s stale timeouts); CI runs 3 days of 20 min in {@code SoakSmokeTest}.
 */
final class SoakRun {

    static final long HEAP_TOLERANCE_MB = 16;
    static final int THREAD_TOLERANCE = 2;
    private static final List<String> FAULTY = List.of("aim-1", "level-meter-1", "temperature-monitor-1");
    private static final List<FaultKind> KINDS = List.of(FaultKind.SILENCE, FaultKind.GARBAGE, FaultKind.SLOW);

    /** One day's figures. */
    record Day(int day, long heapMb, int threads, long fds, long events, long lost, int faults) {
        @Override
        public String toString() {
            return String.format("day %d: heap after GC %d MB, threads %d, open fds %d, events %d, lost %d,"
                    + " faults %d", day, heapMb, threads, fds, events, lost, faults);
        }
    }

    private SoakRun() {
    }

    public static void main(String[] args) throws Exception {
        int days = args.length > 0 ? Integer.parseInt(args[0]) : 7;
        Duration dayLength = args.length > 1 ? Duration.parse("PT" + args[1].toUpperCase()) : Duration.ofHours(24);
        Duration step = args.length > 2 ? Duration.parse("PT" + args[2].toUpperCase()) : Duration.ofSeconds(5);
        int faultsPerDay = args.length > 3 ? Integer.parseInt(args[3]) : 12;
        long seed = args.length > 4 ? Long.parseLong(args[4]) : System.nanoTime();
        Path folder = Files.createTempDirectory("cryowarden-soak");
        List<Day> figures = run(folder, days, dayLength, step, faultsPerDay, seed);
        String verdict = verdict(figures);
        System.out.println(verdict);
        System.exit(verdict.startsWith("flat") ? 0 : 1);
    }

    /** Runs the soak and returns each day's figures (printed as they come). */
    static List<Day> run(Path folder, int days, Duration dayLength, Duration step, int faultsPerDay, long seed)
            throws Exception {
        System.out.printf("soak: %d days of %s in steps of %s, about %d faults a day, seed %d%n", days, dayLength,
                step, faultsPerDay, seed);
        Night.mosquittoRuns();
        Random random = new Random(seed);
        List<Day> figures = new ArrayList<>();
        MemoryMXBean memory = ManagementFactory.getMemoryMXBean();
        try (Night night = Night.start(folder, Night.MOSQUITTO, false, folder.resolve("soak.db"),
                "harbour-hall-quiet-scenario.yaml");
             Subscriber dashboard = new Subscriber(Night.MOSQUITTO, night.prefix + "/event")) {
            night.stepUntil(night.daemon::acceptingCommands, 100);
            long stepsPerDay = dayLength.dividedBy(step);
            long seenSeq = 0;
            long journaledBefore = 0;
            long lostTotal = 0;
            for (int day = 1; day <= days; day++) {
                int faults = 0;
                Instrument faulty = null;
                long faultEnds = 0;
                for (long i = 0; i < stepsPerDay; i++) {
                    if (faulty == null && random.nextInt((int) Math.max(1, stepsPerDay / faultsPerDay)) == 0) {
                        faulty = night.simulator.instrument(FAULTY.get(random.nextInt(FAULTY.size()))).orElseThrow();
                        FaultKind kind = KINDS.get(random.nextInt(KINDS.size()));
                        faulty.startFault(new Fault(kind, 0, Duration.ofMillis(700), OptionalInt.empty(),
                                night.simulator.elapsed().toSeconds()));
                        faultEnds = i + Math.max(1, Duration.ofSeconds(30 + random.nextInt(120)).dividedBy(step));
                        faults++;
                    } else if (faulty != null && i >= faultEnds) {
                        faulty.clearFault(Optional.empty());
                        faulty = null;
                    }
                    night.simulator.advance(step);
                    night.daemon.step();
                    night.daemon.awaitQuiet(Duration.ofSeconds(5));
                }
                if (faulty != null) {
                    faulty.clearFault(Optional.empty());
                }
                long dayStart = journaledBefore;
                List<JournalEvent> today = night.daemon.eventsAfter(dayStart, Integer.MAX_VALUE);
                long journaled = today.isEmpty() ? dayStart : today.get(today.size() - 1).seq();
                String kinds = kinds(today);
                today = null; // measured below: the day's events must not count as the daemon's heap
                long deadline = System.nanoTime() + Duration.ofSeconds(30).toNanos();
                while (maxSeq(dashboard) < journaled && System.nanoTime() < deadline) {
                    Thread.sleep(20);
                }
                long seen = dashboard.on(night.prefix + "/event").stream()
                        .filter(m -> seq(m) > dayStart && seq(m) <= journaled).count();
                long lost = (journaled - dayStart) - seen;
                dashboard.received.clear();
                lostTotal += lost;
                journaledBefore = journaled;
                System.gc();
                System.gc();
                long heapMb = memory.getHeapMemoryUsage().getUsed() / (1024 * 1024);
                Day figure = new Day(day, heapMb, Thread.activeCount(), openFileDescriptors(), journaled - dayStart,
                        lost, faults);
                figures.add(figure);
                System.out.println(figure + " " + kinds);
            }
        }
        return figures;
    }

    /** "flat: ..." when heap and threads stayed within tolerance of day 1 and no event was lost. */
    static String verdict(List<Day> figures) {
        Day first = figures.get(0);
        long maxHeap = Math.max(first.heapMb() + HEAP_TOLERANCE_MB, first.heapMb() * 5 / 4);
        for (Day day : figures.subList(1, figures.size())) {
            if (day.heapMb() > maxHeap) {
                return "grew: heap " + day.heapMb() + " MB on day " + day.day() + ", day 1 " + first.heapMb() + " MB";
            }
            if (day.threads() > first.threads() + THREAD_TOLERANCE) {
                return "grew: " + day.threads() + " threads on day " + day.day() + ", day 1 " + first.threads();
            }
        }
        long lost = figures.stream().mapToLong(Day::lost).sum();
        if (lost != 0) {
            return "lost " + lost + " events";
        }
        return "flat: heap within " + HEAP_TOLERANCE_MB + " MB (or 25 %) of day 1's " + first.heapMb()
                + " MB, threads within " + THREAD_TOLERANCE + " of " + first.threads() + ", 0 events lost";
    }

    /** The day's five most frequent event kinds, for reading the figures. */
    private static String kinds(List<JournalEvent> events) {
        java.util.Map<String, Long> counts = new java.util.TreeMap<>();
        events.forEach(e -> counts.merge(e.kind() + e.subject().map(s -> " " + s).orElse(""), 1L, Long::sum));
        return counts.entrySet().stream().sorted(java.util.Map.Entry.<String, Long>comparingByValue().reversed())
                .limit(5).map(e -> e.getKey() + " " + e.getValue()).toList().toString();
    }

    private static long maxSeq(Subscriber dashboard) {
        return dashboard.received.stream().mapToLong(SoakRun::seq).max().orElse(0);
    }

    private static long seq(Subscriber.Message message) {
        try {
            JsonNode event = Payloads.JSON.readTree(message.text());
            return event.path("seq").asLong(0);
        } catch (IOException e) {
            return 0;
        }
    }

    private static long openFileDescriptors() throws IOException {
        Path fds = Path.of("/proc/self/fd");
        if (!Files.isDirectory(fds)) {
            return -1;
        }
        try (Stream<Path> list = Files.list(fds)) {
            return list.count();
        }
    }
}
