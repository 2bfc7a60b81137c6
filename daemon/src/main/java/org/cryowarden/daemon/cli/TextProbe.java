package org.cryowarden.daemon.cli;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.Optional;
import org.cryowarden.drivers.spi.Transport;
import org.cryowarden.drivers.text.Printable;
import org.cryowarden.drivers.text.Terminator;
import org.cryowarden.drivers.text.TextExchange;

/** One text exchange for {@code probe scpi} and {@code probe line}: optional query, one line back, or why not. */
final class TextProbe {

    private TextProbe() {
    }

    /** The reply line, or the reason there is none (the caller exits 3 with it). */
    record Outcome(Optional<String> line, String failure, Duration roundTrip) {
    }

    static Outcome exchange(Transport transport, Terminator terminator, Optional<String> query, Duration timeout,
            ProbeReport report) throws IOException {
        TextExchange text = new TextExchange(transport, terminator, 4096);
        text.discardInput();
        long start = System.nanoTime();
        if (query.isPresent()) {
            report.sent(text.send(query.get()));
        }
        TextExchange.Received received = text.receive(timeout);
        Duration roundTrip = Duration.ofNanos(System.nanoTime() - start);
        String asked = query.map(q -> "'" + q + "'").orElse("(listening)");
        if (received instanceof TextExchange.Received.Line line) {
            report.received((line.text() + "\n").getBytes(StandardCharsets.ISO_8859_1));
            return new Outcome(Optional.of(line.text()), "", roundTrip);
        }
        if (received instanceof TextExchange.Received.Oversized oversized) {
            return new Outcome(Optional.empty(), "reply to " + asked + " longer than " + oversized.limit() + " bytes",
                    roundTrip);
        }
        Optional<String> partial = ((TextExchange.Received.Timeout) received).partial();
        partial.ifPresent(p -> report.received(p.getBytes(StandardCharsets.ISO_8859_1)));
        return new Outcome(Optional.empty(), partial.map(p -> "partial reply to " + asked + " without terminator after "
                + timeout.toMillis() + " ms: '" + Printable.of(p) + "'")
                .orElse("no reply to " + asked + " within " + timeout.toMillis() + " ms"), roundTrip);
    }

    static Terminator terminator(String name, picocli.CommandLine line) {
        return Terminator.fromConfig(name).orElseThrow(() -> new picocli.CommandLine.ParameterException(line,
                "--terminator must be lf or crlf, got '" + name + "'"));
    }

    static int fail(picocli.CommandLine line, ProbeReport report, String reason) {
        report.json().put("error", reason);
        report.finish();
        line.getErr().println("probe: " + reason);
        line.getErr().flush();
        return ProbeCommand.DEVICE_MISBEHAVED;
    }
}
