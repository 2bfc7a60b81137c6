package org.cryowarden.drivers.builtin;

import java.io.IOException;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.drivers.line.LinePattern;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.spi.FaultCounters;
import org.cryowarden.drivers.spi.InstrumentDriver;
import org.cryowarden.drivers.spi.Transport;
import org.cryowarden.drivers.spi.WriteResult;
import org.cryowarden.drivers.text.Printable;
import org.cryowarden.drivers.text.TextExchange;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;

/**
 * A simple text device. In query mode each channel sends its query and matches the one reply line; in stream
 * mode the device prints lines by itself and each poll takes the newest matching line, waiting up to the
 * timeout for one.
 */
final class LineInstrument implements InstrumentDriver {

    private final String id;
    private final TextConfig config;
    private final DriverContext context;
    private final FaultCounters counters = new FaultCounters();
    private Transport exchangeTransport;
    private TextExchange exchange;

    LineInstrument(String id, TextConfig config, DriverContext context) {
        this.id = id;
        this.config = config;
        this.context = context;
    }

    @Override
    public String instrumentId() {
        return id;
    }

    @Override
    public Optional<String> connect(Transport transport) throws IOException {
        exchange(transport).discardInput();
        return Optional.empty();
    }

    @Override
    public List<Reading> poll(List<String> channels, Transport transport) throws IOException {
        return config.stream() ? pollStream(channels, transport) : pollQueries(channels, transport);
    }

    private List<Reading> pollQueries(List<String> channels, Transport transport) throws IOException {
        List<Reading> readings = new ArrayList<>(channels.size());
        TextExchange text = exchange(transport);
        for (String channel : channels) {
            Unit unit = context.unitOf(channel);
            TextPoint point = config.points().get(channel);
            if (point == null) {
                readings.add(Reading.bad(channel, unit, context.time().wallNow(), "instrument '" + id
                        + "' has no point for channel '" + channel + "'"));
                continue;
            }
            String query = point.query().orElseThrow();
            text.discardInput();
            text.send(query);
            TextExchange.Received received = text.receive(config.timeout());
            Instant now = context.time().wallNow();
            if (received instanceof TextExchange.Received.Line line) {
                readings.add(match(point, unit, line.text(), now));
            } else {
                readings.add(TextReplies.failed(channel, unit, now, received, "'" + query + "'", config.timeout(),
                        counters));
            }
        }
        return readings;
    }

    private List<Reading> pollStream(List<String> channels, Transport transport) throws IOException {
        TextExchange text = exchange(transport);
        Map<String, Reading> latest = new HashMap<>();
        Map<String, Reading> failures = new HashMap<>();
        TextExchange.Received last = null;
        long deadline = System.nanoTime() + config.timeout().toNanos();
        while (true) {
            // First everything buffered since the last poll (the newest line wins), then wait for what is missing.
            boolean missing = channels.stream().anyMatch(c -> !latest.containsKey(c));
            long remaining = deadline - System.nanoTime();
            TextExchange.Received received = missing ? text.receive(Duration.ofNanos(Math.max(0, remaining)))
                    : text.receiveNow().orElse(null);
            if (received == null || received instanceof TextExchange.Received.Timeout) {
                last = received;
                break;
            }
            Instant now = context.time().wallNow();
            if (received instanceof TextExchange.Received.Line line) {
                for (String channel : channels) {
                    TextPoint point = config.points().get(channel);
                    if (point == null) {
                        continue;
                    }
                    Reading reading = match(point, context.unitOf(channel), line.text(), null, now);
                    if (reading != null) {
                        latest.put(channel, reading);
                        failures.remove(channel);
                    }
                }
            } else if (received instanceof TextExchange.Received.Oversized oversized) {
                counters.increment("oversized_line");
                for (String channel : channels) {
                    if (!latest.containsKey(channel)) {
                        failures.put(channel, Reading.bad(channel, context.unitOf(channel), now, "line longer than "
                                + oversized.limit() + " bytes (" + oversized.droppedBytes() + " dropped)"));
                    }
                }
            }
        }
        List<Reading> readings = new ArrayList<>(channels.size());
        Instant now = context.time().wallNow();
        for (String channel : channels) {
            Reading reading = latest.get(channel);
            if (reading == null) {
                reading = failures.get(channel);
            }
            if (reading == null) {
                reading = TextReplies.failed(channel, context.unitOf(channel), now, last == null
                        ? new TextExchange.Received.Timeout(Optional.empty()) : last,
                        "a line matching " + patternOf(channel), config.timeout(), counters);
            } else if (reading.quality().isGood()) {
                counters.increment("ok");
            }
            readings.add(reading);
        }
        return readings;
    }

    private Reading match(TextPoint point, Unit unit, String line, Instant now) {
        Reading reading = match(point, unit, line, "no_match", now);
        if (reading.quality().isGood()) {
            counters.increment("ok");
        }
        return reading;
    }

    /** The reading a line gives for a point; in stream mode ({@code noMatchCounter} null) null when it does not match. */
    private Reading match(TextPoint point, Unit unit, String line, String noMatchCounter, Instant now) {
        LinePattern pattern = point.pattern().orElseThrow();
        LinePattern.LineMatch match = pattern.match(line);
        if (match instanceof LinePattern.LineMatch.Value value) {
            return Reading.good(point.id(), value.value(), unit, now);
        }
        if (match instanceof LinePattern.LineMatch.NotANumber text) {
            counters.increment("not_a_number");
            return Reading.bad(point.id(), unit, now, "value '" + Printable.of(text.text()) + "' in line '"
                    + Printable.of(line) + "' is not a number");
        }
        if (noMatchCounter == null) {
            return null;
        }
        counters.increment(noMatchCounter);
        return Reading.bad(point.id(), unit, now, "line '" + Printable.of(line) + "' does not match pattern "
                + pattern.regex());
    }

    @Override
    public WriteResult write(String output, double value, Transport transport) {
        return WriteResult.failed(output, value, "the line driver has no outputs");
    }

    @Override
    public Map<String, Long> counters() {
        return counters.snapshot();
    }

    private String patternOf(String channel) {
        TextPoint point = config.points().get(channel);
        return point == null ? "(none)" : point.pattern().map(LinePattern::regex).orElse("(none)");
    }

    private TextExchange exchange(Transport transport) {
        if (exchange == null || exchangeTransport != transport) {
            exchangeTransport = transport;
            exchange = new TextExchange(transport, config.terminator(), config.maxLine());
        }
        return exchange;
    }
}
