package org.cryowarden.daemon.replay;

import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Iterator;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import java.util.Random;
import org.cryowarden.daemon.history.BlockEncoder;
import org.cryowarden.daemon.journal.HistoryTable;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalSettings;
import org.cryowarden.daemon.run.SiteSetup;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.config.Configuration;
import org.cryowarden.daemon.history.BlockReadings;
import org.cryowarden.daemon.history.HistoryBlock;
import org.cryowarden.daemon.history.MergedReadings;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.engine.EngineConfig;
import org.cryowarden.rules.model.AlarmOptions;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.Priority;
import org.cryowarden.rules.model.RuleDef;
import org.cryowarden.rules.model.RuleSet;
import org.cryowarden.rules.model.StaleRule;

/**
 * Measures replay speed on one thread: 200 channels at 1 Hz for 2 hours, each with a low limit and a stale rule,
 * decoded from hour-long history blocks, merged and fed through the engine with a tick every 100 ms. Run by hand
 * (see the developer guide), never by {@code mvn test}.
 */
public final class ReplaySpeedReport {

    private static final int CHANNELS = 200;
    private static final int SECONDS = 2 * 3600;
    private static final Instant START = Instant.parse("2025-01-15T18:00:00Z");

    private ReplaySpeedReport() {
    }

    public static void main(String[] args) throws Exception {
        if (args.length >= 3) {
            journal(Path.of(args[0]), Path.of(args[1]), Arrays.stream(args).skip(2).map(Path::of).toList());
            return;
        }
        List<List<HistoryBlock>> history = history();
        EngineConfig config = config();
        long readings = (long) CHANNELS * SECONDS;
        double best = 0;
        double bestEngineOnly = 0;
        for (int round = 0; round < 5; round++) {
            long start = System.nanoTime();
            ReplayResult result = new Replay(config, START, Duration.ofMillis(100))
                    .run(merged(history), List.of(), START.plusSeconds(SECONDS - 1));
            double seconds = (System.nanoTime() - start) / 1e9;
            best = Math.max(best, readings / seconds);
            List<Reading> decoded = new ArrayList<>();
            merged(history).forEachRemaining(decoded::add);
            start = System.nanoTime();
            ReplayResult again = new Replay(config, START, Duration.ofMillis(100))
                    .run(decoded.iterator(), List.of(), START.plusSeconds(SECONDS - 1));
            bestEngineOnly = Math.max(bestEngineOnly, readings / ((System.nanoTime() - start) / 1e9));
            if (result.readings() != readings || !again.events().equals(result.events())) {
                throw new AssertionError("replay fed " + result.readings() + " of " + readings);
            }
            System.out.printf(Locale.ROOT, "round %d: %d events%n", round, result.events().size());
        }
        System.out.printf(Locale.ROOT, "replay from blocks: %.2f M readings/s; from decoded readings: %.2f M "
                + "readings/s; one day of 200 channels at 1 Hz (17.28 M readings): %.1f s%n", best / 1e6,
                bestEngineOnly / 1e6, 17_280_000 / best);
    }

    /**
     * A recorded night of a real site: the stored blocks decoded and merged alone, then the whole replay (decode,
     * merge and engine) through {@link JournalReplay}, best of five each; the engine's share is the difference.
     */
    private static void journal(Path file, Path site, List<Path> rules) throws Exception {
        Configuration configuration = SiteSetup.load(site, rules,
                DriverCatalog.discover(ReplaySpeedReport.class.getClassLoader(), Optional.empty()),
                TimeSource.system());
        try (Journal journal = Journal.open(file, JournalSettings.defaults())) {
            HistoryTable.Span span = journal.history().span().orElseThrow();
            List<String> order = JournalReplay.pollOrder(configuration.site());
            double bestRead = Double.MAX_VALUE;
            double bestReplay = Double.MAX_VALUE;
            long readings = 0;
            for (int round = 0; round < 5; round++) {
                long start = System.nanoTime();
                Iterator<Reading> stream = new JournalHistory(journal).readings(order, span.first(), span.last());
                long n = 0;
                while (stream.hasNext()) {
                    stream.next();
                    n++;
                }
                bestRead = Math.min(bestRead, (System.nanoTime() - start) / 1e9);
                readings = n;
                start = System.nanoTime();
                JournalReplay.run(journal, configuration.site(), configuration.rules(), new JournalReplay.Request(
                        Optional.empty(), Optional.empty(), Optional.empty(), AnalysisSettings.defaults()));
                bestReplay = Math.min(bestReplay, (System.nanoTime() - start) / 1e9);
            }
            double perDay = 17_280_000.0 / readings;
            System.out.printf(Locale.ROOT, "%s: %d readings; read, decode and merge %.3f s (%.2f M/s); whole replay "
                    + "%.3f s (%.2f M/s); engine and analysis %.3f s%n", file, readings, bestRead,
                    readings / bestRead / 1e6, bestReplay, readings / bestReplay / 1e6, bestReplay - bestRead);
            System.out.printf(Locale.ROOT, "scaled to 17.28 M readings: decode+merge %.1f s, engine %.1f s, "
                    + "total %.1f s%n", bestRead * perDay, (bestReplay - bestRead) * perDay, bestReplay * perDay);
        }
    }

    private static Iterator<Reading> merged(List<List<HistoryBlock>> history) {
        List<Iterator<Reading>> streams = new ArrayList<>();
        history.forEach(blocks -> streams.add(BlockReadings.of(blocks)));
        return MergedReadings.of(streams);
    }

    private static List<List<HistoryBlock>> history() {
        Random random = new Random(42);
        List<List<HistoryBlock>> history = new ArrayList<>();
        for (int c = 0; c < CHANNELS; c++) {
            List<HistoryBlock> blocks = new ArrayList<>();
            BlockEncoder encoder = new BlockEncoder("ch" + c, Unit.PERCENT_VOLUME);
            for (int t = 0; t < SECONDS; t++) {
                double value = Math.round((20.9 + random.nextGaussian() * 0.3) * 100) / 100.0;
                encoder.append(Reading.good("ch" + c, value, Unit.PERCENT_VOLUME, START.plusSeconds(t)));
                if (encoder.count() == 3600) {
                    blocks.add(encoder.seal());
                }
            }
            history.add(blocks);
        }
        return history;
    }

    private static EngineConfig config() {
        List<ChannelDef> channels = new ArrayList<>();
        List<RuleDef> rules = new ArrayList<>();
        SourcePosition at = new SourcePosition("bench-rules.yaml", 1, 1);
        for (int c = 0; c < CHANNELS; c++) {
            channels.add(new ChannelDef("ch" + c, Unit.PERCENT_VOLUME, "bench", Duration.ofSeconds(1),
                    Duration.ofSeconds(5), Optional.empty(), at));
            AlarmOptions options = new AlarmOptions(Priority.HIGH, "low", Duration.ofSeconds(2), Duration.ZERO, false,
                    List.of(), Optional.empty());
            rules.add(new LimitRule("low" + c, "ch" + c, Direction.LOW, Quantity.parse("20.2 %vol"),
                    Quantity.parse("0 %vol"), options, at));
            rules.add(new StaleRule("stale" + c, "ch" + c, Optional.empty(), AlarmOptions.simple(Priority.MEDIUM,
                    "stale"), at));
        }
        return new EngineConfig(channels, List.of(), List.of(), new RuleSet(rules, List.of()),
                Quantity.STANDARD_ATMOSPHERE_PA);
    }
}
