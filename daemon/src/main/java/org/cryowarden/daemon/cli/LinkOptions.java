package org.cryowarden.daemon.cli;

import java.time.Duration;
import org.cryowarden.drivers.spi.Transport;
import org.cryowarden.drivers.transport.SerialSettings;
import org.cryowarden.drivers.transport.SerialTransport;
import org.cryowarden.drivers.transport.TcpSettings;
import org.cryowarden.drivers.transport.TcpTransport;
import org.cryowarden.rules.DurationSyntax;
import picocli.CommandLine;
import picocli.CommandLine.ArgGroup;
import picocli.CommandLine.Option;

/** How {@code probe} reaches the device: a serial port with line settings, or a serial device server over TCP. */
final class LinkOptions {

    @ArgGroup(exclusive = true, multiplicity = "1")
    Link link;

    static final class Link {
        @Option(names = "--port", paramLabel = "PATH", description = "serial port, e.g. /dev/ttyUSB0")
        String port;

        @Option(names = "--tcp", paramLabel = "HOST:PORT", description = "serial device server, e.g. 10.0.4.17:4001")
        String tcp;
    }

    @Option(names = "--baud", defaultValue = "9600", description = "line speed (default ${DEFAULT-VALUE})")
    int baud;

    @Option(names = "--parity", defaultValue = "none", description = "none, even or odd (default ${DEFAULT-VALUE})")
    String parity;

    @Option(names = "--data-bits", defaultValue = "8", description = "5-8 (default ${DEFAULT-VALUE})")
    int dataBits;

    @Option(names = "--stop-bits", defaultValue = "1", description = "1 or 2 (default ${DEFAULT-VALUE})")
    int stopBits;

    @Option(names = "--timeout", defaultValue = "1s", description = "reply timeout (default ${DEFAULT-VALUE})")
    String timeout;

    @Option(names = "--json", description = "print one JSON object")
    boolean json;

    @Option(names = {"-v", "--verbose"}, description = "show the raw bytes sent and received")
    boolean verbose;

    /** The transport described by the options, not yet open; bad values are parameter errors (exit 2). */
    Transport transport(CommandLine line) {
        if (link.tcp != null) {
            int colon = link.tcp.lastIndexOf(':');
            int port = -1;
            if (colon > 0) {
                try {
                    port = Integer.parseInt(link.tcp.substring(colon + 1));
                } catch (NumberFormatException e) {
                    port = -1;
                }
            }
            if (port < 1 || port > 65535) {
                throw new CommandLine.ParameterException(line, "--tcp must be HOST:PORT with a port 1-65535, got '"
                        + link.tcp + "'");
            }
            return new TcpTransport(new TcpSettings(link.tcp.substring(0, colon), port, Duration.ofSeconds(3)));
        }
        SerialSettings.Parity parsedParity = switch (parity) {
            case "none" -> SerialSettings.Parity.NONE;
            case "even" -> SerialSettings.Parity.EVEN;
            case "odd" -> SerialSettings.Parity.ODD;
            default -> throw new CommandLine.ParameterException(line, "--parity must be none, even or odd, got '"
                    + parity + "'");
        };
        if (baud < 50 || baud > 4_000_000) {
            throw new CommandLine.ParameterException(line, "--baud must be 50-4000000, got " + baud);
        }
        if (dataBits < 5 || dataBits > 8) {
            throw new CommandLine.ParameterException(line, "--data-bits must be 5-8, got " + dataBits);
        }
        if (stopBits != 1 && stopBits != 2) {
            throw new CommandLine.ParameterException(line, "--stop-bits must be 1 or 2, got " + stopBits);
        }
        return new SerialTransport(new SerialSettings(link.port, baud, dataBits, parsedParity, stopBits,
                SerialSettings.FlowControl.NONE));
    }

    Duration timeout(CommandLine line) {
        try {
            Duration parsed = DurationSyntax.parse(timeout);
            if (parsed.isZero() || parsed.compareTo(Duration.ofMinutes(1)) > 0) {
                throw new CommandLine.ParameterException(line, "--timeout must be between 1ms and 1min, got " + timeout);
            }
            return parsed;
        } catch (IllegalArgumentException e) {
            throw new CommandLine.ParameterException(line, "--timeout: " + e.getMessage());
        }
    }
}
