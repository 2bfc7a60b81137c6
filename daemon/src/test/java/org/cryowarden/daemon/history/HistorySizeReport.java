package org.cryowarden.daemon.history;

import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.cryowarden.daemon.journal.BlockRow;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalSettings;
import org.cryowarden.rules.Reading;

/**
 * Measures bytes per reading and encode/decode throughput on the invented night series: run by hand (see the
 * developer guide), never by {@code mvn test}. Blocks of one hour (3,600 readings), as the journal would seal them.
 * Given journal files (e.g. of {@code demo --journal FILE} nights), it also decodes every stored block, encodes
 * its readings again as one block of the current format, checks that they come back bit for bit, and reports
 * bytes per reading as stored and as now encoded, per channel and for the whole journal.
 */
public final class HistorySizeReport {

    private static final int BLOCK = 3600;

    private HistorySizeReport() {
    }

    public static void main(String[] args) throws Exception {
        for (String file : args) {
            journal(Path.of(file));
        }
        if (args.length > 0) {
            return;
        }
        List<List<Reading>> night = List.of(Series.driftingLevel(1), Series.oxygenCell(2), Series.constant(),
                Series.stepped());
        report("drifting level, 0.1 % resolution", night.get(0));
        report("oxygen cell, 0.01 %vol resolution", night.get(1));
        report("constant pressure", night.get(2));
        report("stepped heater", night.get(3));
        report("full-precision noise (worst case)", Series.rawNoise(3));
        report("oxygen cell, timestamps +-20 ms at 1 ms", Series.jittered(night.get(1), Duration.ofMillis(20),
                Duration.ofMillis(1), 4));
        report("oxygen cell, timestamps +-20 ms at 1 us", Series.jittered(night.get(1), Duration.ofMillis(20),
                Duration.ofNanos(1000), 4));
        List<Reading> all = new ArrayList<>();
        night.forEach(all::addAll);
        report("typical night: the four series above", all);
        throughput(night);
    }

    private static void journal(Path file) throws Exception {
        long readings = 0;
        long stored = 0;
        long now = 0;
        System.out.println(file);
        try (Journal journal = Journal.open(file, JournalSettings.defaults())) {
            for (String channel : journal.history().channels()) {
                long channelReadings = 0;
                long channelStored = 0;
                long channelNow = 0;
                String coding = "";
                for (BlockRow row : journal.history().blocks(channel, Instant.EPOCH, Instant.parse("2262-01-01T00:00:00Z"))) {
                    List<Reading> decoded = HistoryBlock.parse(channel, row.data()).readings();
                    HistoryBlock again = blocks(decoded, false).get(0);
                    List<Reading> back = HistoryBlock.parse(channel, again.toBytes()).readings();
                    for (int i = 0; i < decoded.size(); i++) {
                        Reading a = decoded.get(i);
                        Reading b = back.get(i);
                        if (Double.doubleToRawLongBits(a.value()) != Double.doubleToRawLongBits(b.value())
                                || !a.timestamp().equals(b.timestamp()) || a.quality() != b.quality()
                                || !a.reason().equals(b.reason())) {
                            throw new AssertionError(channel + " reading " + i + ": " + a + " came back as " + b);
                        }
                    }
                    channelReadings += decoded.size();
                    channelStored += row.data().length;
                    channelNow += again.byteSize();
                }
                System.out.printf(Locale.ROOT, "  %-26s %7d readings  stored %6.3f  now %6.3f bytes/reading%n",
                        channel, channelReadings, (double) channelStored / channelReadings,
                        (double) channelNow / channelReadings);
                readings += channelReadings;
                stored += channelStored;
                now += channelNow;
            }
        }
        System.out.printf(Locale.ROOT, "  %-26s %7d readings  stored %6.3f  now %6.3f bytes/reading (%d -> %d bytes)%n",
                "all channels", readings, (double) stored / readings, (double) now / readings, stored, now);
    }

    private static void report(String name, List<Reading> readings) {
        long bytes = size(blocks(readings, false));
        long xorBytes = size(blocks(readings, true));
        System.out.printf(Locale.ROOT, "%-42s %7d readings %7d bytes %6.3f bytes/reading (XOR alone %6.3f)%n", name,
                readings.size(), bytes, (double) bytes / readings.size(), (double) xorBytes / readings.size());
    }

    private static long size(List<HistoryBlock> blocks) {
        long bytes = 0;
        for (HistoryBlock block : blocks) {
            bytes += block.byteSize();
        }
        return bytes;
    }

    private static List<HistoryBlock> blocks(List<Reading> readings) {
        return blocks(readings, false);
    }

    private static List<HistoryBlock> blocks(List<Reading> readings, boolean xorOnly) {
        List<HistoryBlock> blocks = new ArrayList<>();
        BlockEncoder encoder = null;
        for (Reading reading : readings) {
            if (encoder == null || !encoder.channel().equals(reading.channel()) || encoder.count() == BLOCK) {
                if (encoder != null) {
                    blocks.add(encoder.seal());
                }
                encoder = xorOnly ? BlockEncoder.xorOnly(reading.channel(), reading.unit())
                        : new BlockEncoder(reading.channel(), reading.unit());
            }
            encoder.append(reading);
        }
        blocks.add(encoder.seal());
        return blocks;
    }

    private static void throughput(List<List<Reading>> night) {
        List<Reading> all = new ArrayList<>();
        night.forEach(all::addAll);
        long sink = 0;
        double bestEncode = 0;
        double bestDecode = 0;
        for (int round = 0; round < 8; round++) {
            long start = System.nanoTime();
            List<HistoryBlock> blocks = blocks(all);
            long encoded = System.nanoTime();
            for (HistoryBlock block : blocks) {
                sink += HistoryBlock.parse("bench", block.toBytes()).readings().size();
            }
            long decoded = System.nanoTime();
            bestEncode = Math.max(bestEncode, all.size() / ((encoded - start) / 1e9));
            bestDecode = Math.max(bestDecode, all.size() / ((decoded - encoded) / 1e9));
        }
        System.out.printf(Locale.ROOT, "encode %.1f M readings/s, decode %.1f M readings/s (best of 8, %d)%n",
                bestEncode / 1e6, bestDecode / 1e6, sink);
    }
}
