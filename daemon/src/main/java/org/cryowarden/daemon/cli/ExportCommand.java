package org.cryowarden.daemon.cli;

import java.io.BufferedWriter;
import java.io.IOException;
import java.io.OutputStreamWriter;
import java.io.PrintWriter;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.Callable;
import org.cryowarden.daemon.history.CorruptBlockException;
import org.cryowarden.daemon.journal.BlockRow;
import org.cryowarden.daemon.journal.HistoryTable;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.daemon.journal.JournalSettings;
import org.cryowarden.daemon.replay.JournalHistory;
import org.cryowarden.rules.Reading;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * {@code cryowarden export --journal FILE --channel ID... [--since TIME] [--until TIME] --format csv
 * [--aggregate 1min] [--out FILE]}: the raw history of some channels as CSV (RFC 4180), one reading per row in time
 * order, or per-interval aggregates of them; streamed, one history block per channel in memory, with a progress
 * line on stderr every few seconds of a long export.
 */
@Command(
        name = "export",
        description = {
            "Export the raw history of channels from a journal as CSV: every reading, or aggregates per interval.",
            "Exit codes: 0 done, 2 bad arguments or files, 1 internal failure."
        },
        mixinStandardHelpOptions = true)
final class ExportCommand implements Callable<Integer> {

    static final int BAD_INPUT = 2;
    private static final long PROGRESS_EVERY_NANOS = 2_000_000_000L;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Option(names = "--journal", required = true, paramLabel = "FILE", description = "the daemon's journal")
    Path journalFile;

    @Option(names = "--channel", required = true, arity = "1..*", paramLabel = "ID",
            description = "the channels to export; repeat the option or list several")
    List<String> channels = new ArrayList<>();

    @Option(names = "--since", paramLabel = "TIME", description = "start, UTC, e.g. 2025-01-15T22:00:00Z")
    String since;

    @Option(names = "--until", paramLabel = "TIME", description = "end, UTC (inclusive)")
    String until;

    @Option(names = "--format", required = true, paramLabel = "FORMAT", description = "csv (the only one)")
    String format;

    @Option(names = "--aggregate", paramLabel = "DURATION",
            description = "write min, mean and max of the GOOD readings per interval (e.g. 1min) instead of readings")
    String aggregate;

    @Option(names = "--out", paramLabel = "FILE", description = "write to FILE instead of standard output")
    Path outFile;

    @Override
    public Integer call() throws Exception {
        PrintWriter err = spec.commandLine().getErr();
        Optional<Instant> from;
        Optional<Instant> to;
        Optional<Duration> interval;
        try {
            if (!format.equals("csv")) {
                throw new IllegalArgumentException("--format must be csv, got '" + format + "'");
            }
            from = TimeArgument.parse("--since", since);
            to = TimeArgument.parse("--until", until);
            interval = aggregate == null ? Optional.empty()
                    : Optional.of(TimeArgument.duration("--aggregate", aggregate));
            if (from.isPresent() && to.isPresent() && to.get().isBefore(from.get())) {
                throw new IllegalArgumentException("--until " + to.get() + " is before --since " + from.get());
            }
        } catch (IllegalArgumentException e) {
            return fail(err, e.getMessage());
        }
        if (!Files.isRegularFile(journalFile)) {
            return fail(err, "no journal at " + journalFile + ": name the daemon's journal file");
        }
        try (Journal journal = Journal.open(journalFile, JournalSettings.defaults())) {
            List<String> known = journal.history().channels();
            for (String channel : channels) {
                if (!known.contains(channel)) {
                    return fail(err, "channel '" + channel + "' has no history in " + journalFile
                            + (known.isEmpty() ? " (the journal holds no raw history)"
                                    : "; channels with history: " + String.join(", ", known)));
                }
            }
            Optional<HistoryTable.Span> span = journal.history().span();
            Instant start = from.orElse(span.map(HistoryTable.Span::first).orElse(Instant.EPOCH));
            Instant end = to.orElse(span.map(HistoryTable.Span::last).orElse(Instant.EPOCH));
            long expected = 0;
            for (String channel : channels) {
                for (BlockRow row : journal.history().blocks(channel, start, end)) {
                    expected += row.count();
                }
            }
            Iterator<Reading> readings = new JournalHistory(journal).readings(channels, start, end);
            Writer sink = outFile == null ? spec.commandLine().getOut()
                    : new BufferedWriter(new OutputStreamWriter(Files.newOutputStream(outFile),
                            StandardCharsets.UTF_8), 1 << 16);
            long rows;
            long readCount;
            try {
                Progress progress = new Progress(err, expected);
                if (interval.isPresent()) {
                    rows = aggregates(readings, interval.get(), sink, progress);
                } else {
                    rows = raw(readings, sink, progress);
                }
                readCount = progress.count;
                sink.flush();
            } catch (CorruptBlockException e) {
                return fail(err, e.getMessage() + "; the export stops there");
            } finally {
                if (outFile != null) {
                    sink.close();
                }
            }
            if (outFile != null) {
                err.printf(Locale.ROOT, "export: %d rows (%d readings of %d channels) written to %s%n", rows,
                        readCount, channels.size(), outFile);
                err.flush();
            }
            return 0;
        } catch (JournalException e) {
            return fail(err, e.getMessage());
        } catch (IOException e) {
            return fail(err, "cannot write " + outFile + ": " + e.getMessage());
        }
    }

    private static long raw(Iterator<Reading> readings, Writer out, Progress progress) throws IOException {
        out.write("time,channel,value,unit,quality,reason\n");
        long rows = 0;
        StringBuilder line = new StringBuilder(96);
        while (readings.hasNext()) {
            Reading r = readings.next();
            line.setLength(0);
            line.append(r.timestamp()).append(',').append(csv(r.channel())).append(',').append(number(r.value()))
                    .append(',').append(csv(r.unit().symbol())).append(',')
                    .append(r.quality().name().toLowerCase(Locale.ROOT)).append(',').append(csv(r.reason()))
                    .append('\n');
            out.write(line.toString());
            rows++;
            progress.step();
        }
        return rows;
    }

    /** Per channel and interval: min, mean and max of the GOOD readings; intervals on the epoch's grid. */
    private static long aggregates(Iterator<Reading> readings, Duration interval, Writer out, Progress progress)
            throws IOException {
        out.write("start,channel,unit,min,mean,max,good,total\n");
        long step = interval.toNanos();
        Map<String, Bucket> open = new LinkedHashMap<>();
        long openStart = Long.MIN_VALUE;
        long rows = 0;
        while (readings.hasNext()) {
            Reading r = readings.next();
            long nanos = r.timestamp().getEpochSecond() * 1_000_000_000L + r.timestamp().getNano();
            long bucketStart = Math.floorDiv(nanos, step) * step;
            if (bucketStart != openStart) {
                rows += write(open, openStart, out);
                open.clear();
                openStart = bucketStart;
            }
            open.computeIfAbsent(r.channel(), c -> new Bucket(r.unit().symbol())).add(r);
            progress.step();
        }
        rows += write(open, openStart, out);
        return rows;
    }

    private static long write(Map<String, Bucket> buckets, long startNanos, Writer out) throws IOException {
        if (buckets.isEmpty()) {
            return 0;
        }
        Instant start = Instant.ofEpochSecond(Math.floorDiv(startNanos, 1_000_000_000L),
                Math.floorMod(startNanos, 1_000_000_000L));
        for (Map.Entry<String, Bucket> entry : buckets.entrySet()) {
            Bucket b = entry.getValue();
            out.write(start + "," + csv(entry.getKey()) + "," + csv(b.unit) + ","
                    + (b.good == 0 ? "" : number(b.min)) + "," + (b.good == 0 ? "" : number(b.sum / b.good)) + ","
                    + (b.good == 0 ? "" : number(b.max)) + "," + b.good + "," + b.total + "\n");
        }
        return buckets.size();
    }

    private static final class Bucket {
        final String unit;
        double min = Double.POSITIVE_INFINITY;
        double max = Double.NEGATIVE_INFINITY;
        double sum;
        long good;
        long total;

        Bucket(String unit) {
            this.unit = unit;
        }

        void add(Reading r) {
            total++;
            if (r.quality().isGood() && !Double.isNaN(r.value())) {
                good++;
                min = Math.min(min, r.value());
                max = Math.max(max, r.value());
                sum += r.value();
            }
        }
    }

    /** Progress on stderr every few seconds of real time, so a short export prints none. */
    private static final class Progress {
        private final PrintWriter err;
        private final long expected;
        private final long began = System.nanoTime();
        private long last = began;
        long count;

        Progress(PrintWriter err, long expected) {
            this.err = err;
            this.expected = expected;
        }

        void step() {
            count++;
            if ((count & 0xFFF) == 0) {
                long now = System.nanoTime();
                if (now - last >= PROGRESS_EVERY_NANOS) {
                    last = now;
                    err.printf(Locale.ROOT, "export: %d of %d readings (%.0f%%), %.0f s%n", count, expected,
                            expected == 0 ? 100.0 : 100.0 * count / expected, (now - began) / 1e9);
                    err.flush();
                }
            }
        }
    }

    /** Lossless: the shortest text that reads back as the same double; empty for NaN (a BAD reading's value). */
    private static String number(double value) {
        return Double.isNaN(value) ? "" : Double.toString(value);
    }

    /** A field quoted as RFC 4180 asks when it holds a comma, a quote or a line break. */
    static String csv(String field) {
        if (field.indexOf(',') < 0 && field.indexOf('"') < 0 && field.indexOf('\n') < 0 && field.indexOf('\r') < 0) {
            return field;
        }
        return '"' + field.replace("\"", "\"\"") + '"';
    }

    private static int fail(PrintWriter err, String message) {
        err.println("export: " + message);
        err.flush();
        return BAD_INPUT;
    }
}
