package org.cryowarden.drivers.builtin;

import java.io.IOException;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.OptionalDouble;
import org.cryowarden.drivers.scpi.ErrorEntry;
import org.cryowarden.drivers.scpi.Identity;
import org.cryowarden.drivers.scpi.ScpiCodec;
import org.cryowarden.drivers.scpi.ScpiNumbers;
import org.cryowarden.drivers.scpi.ScpiValue;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.spi.FaultCounters;
import org.cryowarden.drivers.spi.InstrumentDriver;
import org.cryowarden.drivers.spi.Transport;
import org.cryowarden.drivers.spi.WriteResult;
import org.cryowarden.drivers.text.Printable;
import org.cryowarden.drivers.text.TextExchange;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * A SCPI instrument: {@code *IDN?} at connect, one query per channel, NR1/NR2/NR3 answers, 9.91E37 and the
 * overflow values as BAD, and optionally the error queue drained after each query ({@code SYST:ERR?} until
 * {@code 0,"No error"}), an error there making the reading BAD.
 */
final class ScpiInstrument implements InstrumentDriver {

    private static final Logger LOG = LoggerFactory.getLogger(ScpiInstrument.class);
    /** Bound on error-queue entries read after one query, so a queue that never empties cannot stall the bus. */
    static final int MAX_ERRORS_DRAINED = 8;

    private final String id;
    private final TextConfig config;
    private final DriverContext context;
    private final FaultCounters counters = new FaultCounters();
    private Transport exchangeTransport;
    private TextExchange exchange;

    ScpiInstrument(String id, TextConfig config, DriverContext context) {
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
        TextExchange text = exchange(transport);
        text.discardInput();
        text.send(ScpiCodec.IDENTIFY);
        TextExchange.Received received = text.receive(config.timeout());
        if (!(received instanceof TextExchange.Received.Line line)) {
            counters.increment("identify_failed");
            LOG.warn("instrument '{}' did not answer *IDN? ({})", id, received);
            return Optional.empty();
        }
        Optional<Identity> identity = Identity.parse(line.text());
        if (identity.isEmpty()) {
            LOG.warn("instrument '{}' answered *IDN? with '{}', not four fields", id, Printable.of(line.text()));
            return Optional.of(Printable.of(line.text()));
        }
        return Optional.of(identity.get().format());
    }

    @Override
    public List<Reading> poll(List<String> channels, Transport transport) throws IOException {
        List<Reading> readings = new ArrayList<>(channels.size());
        for (String channel : channels) {
            Unit unit = context.unitOf(channel);
            TextPoint point = config.points().get(channel);
            if (point == null || point.output()) {
                readings.add(Reading.bad(channel, unit, context.time().wallNow(), "instrument '" + id
                        + "' has no query for channel '" + channel + "'"));
                continue;
            }
            readings.add(query(point, unit, transport));
        }
        return readings;
    }

    private Reading query(TextPoint point, Unit unit, Transport transport) throws IOException {
        TextExchange text = exchange(transport);
        String query = point.query().orElseThrow();
        text.discardInput();
        text.send(query);
        TextExchange.Received received = text.receive(config.timeout());
        Instant now = context.time().wallNow();
        if (!(received instanceof TextExchange.Received.Line line)) {
            return TextReplies.failed(point.id(), unit, now, received, "'" + query + "'", config.timeout(), counters);
        }
        Reading reading = toReading(point.id(), unit, now, query, ScpiNumbers.parse(line.text()));
        if (config.errorQueue()) {
            Optional<String> error = drainErrors(text);
            if (error.isPresent() && reading.quality().isGood()) {
                return Reading.bad(point.id(), unit, now, error.get() + " after '" + query + "'");
            }
        }
        return reading;
    }

    private Reading toReading(String channel, Unit unit, Instant now, String query, ScpiValue value) {
        if (value instanceof ScpiValue.Number number) {
            counters.increment("ok");
            return Reading.good(channel, number.value(), unit, now);
        }
        if (value instanceof ScpiValue.NotANumber) {
            counters.increment("not_a_number");
            return Reading.bad(channel, unit, now, "instrument reported not-a-number (9.91E37) for '" + query + "'");
        }
        if (value instanceof ScpiValue.Overflow overflow) {
            counters.increment("overflow");
            return Reading.bad(channel, unit, now, "instrument reported " + (overflow.positive() ? "positive" : "negative")
                    + " overflow (" + (overflow.positive() ? "" : "-") + "9.9E37) for '" + query + "'");
        }
        counters.increment("malformed");
        return Reading.bad(channel, unit, now, "reply to '" + query + "' is not a number: '"
                + Printable.of(((ScpiValue.Malformed) value).text()) + "'");
    }

    /** Reads the error queue until it is empty; returns the first error, if any. */
    private Optional<String> drainErrors(TextExchange text) throws IOException {
        Optional<String> first = Optional.empty();
        for (int i = 0; i < MAX_ERRORS_DRAINED; i++) {
            text.send(ScpiCodec.NEXT_ERROR);
            TextExchange.Received received = text.receive(config.timeout());
            if (!(received instanceof TextExchange.Received.Line line)) {
                counters.increment("error_queue_unreadable");
                return first.or(() -> Optional.of("no answer to SYST:ERR?"));
            }
            Optional<ErrorEntry> entry = ErrorEntry.parse(line.text());
            if (entry.isEmpty()) {
                counters.increment("error_queue_unreadable");
                return first.or(() -> Optional.of("unreadable SYST:ERR? answer '" + Printable.of(line.text()) + "'"));
            }
            if (entry.get().isNoError()) {
                return first;
            }
            counters.increment("instrument_error");
            LOG.warn("instrument '{}' reports error {}", id, entry.get().format());
            if (first.isEmpty()) {
                first = Optional.of("instrument error " + entry.get().format());
            }
        }
        return first;
    }

    @Override
    public WriteResult write(String output, double value, Transport transport) throws IOException {
        TextPoint point = config.points().get(output);
        if (point == null || !point.output()) {
            return WriteResult.failed(output, value, "instrument '" + id + "' has no output '" + output + "'");
        }
        TextExchange text = exchange(transport);
        text.discardInput();
        String written = value == Math.rint(value) && Math.abs(value) < 1e15 ? Long.toString((long) value)
                : String.format(Locale.ROOT, "%s", value);
        text.send(point.command().orElseThrow().replace("{value}", written));
        if (config.errorQueue()) {
            Optional<String> error = drainErrors(text);
            if (error.isPresent()) {
                return WriteResult.failed(output, value, error.get());
            }
        }
        if (point.readback().isEmpty()) {
            return WriteResult.confirmed(output, value, OptionalDouble.empty());
        }
        text.send(point.readback().get());
        TextExchange.Received received = text.receive(config.timeout());
        if (received instanceof TextExchange.Received.Line line
                && ScpiNumbers.parse(line.text()) instanceof ScpiValue.Number number) {
            if (Math.abs(number.value() - value) > Math.abs(value) * 1e-6 + 1e-9) {
                counters.increment("readback_mismatch");
                return new WriteResult(output, value, OptionalDouble.of(number.value()), false, "readback "
                        + number.value() + " differs from the value written (" + written + ")");
            }
            return WriteResult.confirmed(output, value, OptionalDouble.of(number.value()));
        }
        return new WriteResult(output, value, OptionalDouble.empty(), false, "no numeric answer to readback '"
                + point.readback().get() + "'");
    }

    @Override
    public Map<String, Long> counters() {
        return counters.snapshot();
    }

    private TextExchange exchange(Transport transport) {
        if (exchange == null || exchangeTransport != transport) {
            exchangeTransport = transport;
            exchange = new TextExchange(transport, config.terminator(), config.maxLine());
        }
        return exchange;
    }
}
