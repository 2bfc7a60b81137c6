package org.cryowarden.daemon.cli;

import java.io.IOException;
import java.time.Duration;
import java.util.Optional;
import java.util.concurrent.Callable;
import org.cryowarden.drivers.scpi.ScpiNumbers;
import org.cryowarden.drivers.scpi.ScpiValue;
import org.cryowarden.drivers.spi.Transport;
import org.cryowarden.drivers.text.Terminator;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

/** {@code probe scpi}: send one SCPI query and print the response. */
@Command(name = "scpi", mixinStandardHelpOptions = true, description = "Send one SCPI query and print the response.")
final class ProbeScpiCommand implements Callable<Integer> {

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Mixin
    LinkOptions link;

    @Option(names = "--query", required = true, description = "the query, e.g. '*IDN?'")
    String query;

    @Option(names = "--terminator", defaultValue = "lf", description = "lf or crlf (default ${DEFAULT-VALUE})")
    String terminator;

    @Override
    public Integer call() {
        CommandLine line = spec.commandLine();
        Terminator ending = TextProbe.terminator(terminator, line);
        if (query.isBlank() || query.contains("\n") || query.contains("\r")) {
            throw new CommandLine.ParameterException(line, "--query must be one line of text");
        }
        Duration timeout = link.timeout(line);
        ProbeReport report = new ProbeReport(link.json, link.verbose, line.getOut());
        try (Transport transport = link.transport(line)) {
            TextProbe.Outcome outcome;
            try {
                transport.reopen();
                outcome = TextProbe.exchange(transport, ending, Optional.of(query), timeout, report);
            } catch (IOException e) {
                return TextProbe.fail(line, report, e.getMessage());
            }
            report.json().put("query", query);
            if (outcome.line().isEmpty()) {
                return TextProbe.fail(line, report, outcome.failure());
            }
            String response = outcome.line().get();
            report.json().put("response", response);
            if (ScpiNumbers.parse(response) instanceof ScpiValue.Number number) {
                report.json().put("value", number.value());
            }
            report.line(response);
            report.roundTrip(outcome.roundTrip());
            report.finish();
            return 0;
        }
    }
}
