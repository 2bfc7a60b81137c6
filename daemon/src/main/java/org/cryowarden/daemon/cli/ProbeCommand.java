package org.cryowarden.daemon.cli;

import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * {@code cryowarden probe}: talk to one device without a site file, for the engineer at the rack. Exit codes: 0 the
 * device answered, 2 bad arguments, 3 the device misbehaved (timeout, CRC error, exception response, no match) or
 * the link could not be opened, with the reason on stderr.
 */
@Command(name = "probe", mixinStandardHelpOptions = true,
        description = "Talk to one device directly (no site file): Modbus RTU, SCPI or a text line protocol.",
        subcommands = {ProbeModbusCommand.class, ProbeScpiCommand.class, ProbeLineCommand.class})
final class ProbeCommand implements Runnable {

    static final int DEVICE_MISBEHAVED = 3;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Override
    public void run() {
        throw new CommandLine.ParameterException(spec.commandLine(), "name a protocol: probe modbus, probe scpi or "
                + "probe line");
    }
}
