package org.cryowarden.daemon.cli;

import java.io.IOException;
import java.time.Duration;
import java.util.Optional;
import java.util.concurrent.Callable;
import org.cryowarden.drivers.line.LinePattern;
import org.cryowarden.drivers.spi.Transport;
import org.cryowarden.drivers.text.Printable;
import org.cryowarden.drivers.text.Terminator;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

/** {@code probe line}: optionally send a query, read one line and pick the value out with a pattern. */
@Command(name = "line", mixinStandardHelpOptions = true,
        description = "Read one text line (after an optional query) and extract the value with a regex.")
final class ProbeLineCommand implements Callable<Integer> {

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Mixin
    LinkOptions link;

    @Option(names = "--query", description = "text to send first; without it, wait for the device to print a line")
    String query;

    @Option(names = "--pattern", required = true, description = "regex with a named group 'value', e.g. 'O2=(?<value>[0-9.]+)'")
    String pattern;

    @Option(names = "--terminator", defaultValue = "lf", description = "lf or crlf (default ${DEFAULT-VALUE})")
    String terminator;

    @Override
    public Integer call() {
        CommandLine line = spec.commandLine();
        Terminator ending = TextProbe.terminator(terminator, line);
        LinePattern.Result compiled = LinePattern.compile(pattern);
        if (compiled.pattern().isEmpty()) {
            throw new CommandLine.ParameterException(line, "--pattern " + compiled.problem());
        }
        Duration timeout = link.timeout(line);
        ProbeReport report = new ProbeReport(link.json, link.verbose, line.getOut());
        try (Transport transport = link.transport(line)) {
            TextProbe.Outcome outcome;
            try {
                transport.reopen();
                outcome = TextProbe.exchange(transport, ending, Optional.ofNullable(query), timeout, report);
            } catch (IOException e) {
                return TextProbe.fail(line, report, e.getMessage());
            }
            if (outcome.line().isEmpty()) {
                return TextProbe.fail(line, report, outcome.failure());
            }
            String text = outcome.line().get();
            report.json().put("line", text);
            LinePattern.LineMatch match = compiled.pattern().get().match(text);
            if (!(match instanceof LinePattern.LineMatch.Value value)) {
                return TextProbe.fail(line, report, match instanceof LinePattern.LineMatch.NotANumber notNumber
                        ? "value '" + Printable.of(notNumber.text()) + "' in line '" + Printable.of(text) + "' is not a number"
                        : "line '" + Printable.of(text) + "' does not match pattern " + pattern);
            }
            report.json().putArray("values").add(value.value());
            report.line(text);
            report.line("value: " + ProbeModbusCommand.format(value.value()));
            report.roundTrip(outcome.roundTrip());
            report.finish();
            return 0;
        }
    }
}
