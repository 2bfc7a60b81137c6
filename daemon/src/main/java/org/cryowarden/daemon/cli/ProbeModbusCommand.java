package org.cryowarden.daemon.cli;

import java.io.IOException;
import java.time.Duration;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.cryowarden.drivers.modbus.FunctionCode;
import org.cryowarden.drivers.modbus.ModbusClient;
import org.cryowarden.drivers.modbus.ModbusReply;
import org.cryowarden.drivers.modbus.ModbusRequest;
import org.cryowarden.drivers.modbus.ModbusTable;
import org.cryowarden.drivers.modbus.RegisterCodec;
import org.cryowarden.drivers.modbus.RegisterType;
import org.cryowarden.drivers.modbus.WordOrder;
import org.cryowarden.drivers.spi.Transport;
import picocli.CommandLine;
import picocli.CommandLine.ArgGroup;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

/** {@code probe modbus}: one read or write against a Modbus RTU slave. */
@Command(name = "modbus", mixinStandardHelpOptions = true,
        description = "Read registers or coils, or write one, on a Modbus RTU slave.")
final class ProbeModbusCommand implements Callable<Integer> {

    /** The silence that ends a reply frame: generous, as a USB adapter or device server may chunk it. */
    private static final Duration SILENCE = Duration.ofMillis(50);

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Mixin
    LinkOptions link;

    @Option(names = "--unit", required = true, description = "slave address 1-247")
    int unit;

    @ArgGroup(exclusive = true, multiplicity = "1")
    Action action;

    static final class Action {
        @Option(names = "--read", paramLabel = "TABLE:ADDRESS:COUNT",
                description = "holding|input|coil|discrete, first address (0-based), how many registers or bits")
        String read;

        @Option(names = "--write-coil", paramLabel = "ADDRESS:on|off", description = "write one coil")
        String writeCoil;

        @Option(names = "--write-register", paramLabel = "ADDRESS:VALUE", description = "write one holding register (0-65535)")
        String writeRegister;
    }

    @Option(names = "--type", defaultValue = "uint16", description = "uint16, int16, uint32, int32 or float32 (default ${DEFAULT-VALUE})")
    String type;

    @Option(names = "--word-order", defaultValue = "big", description = "big or little, for 32-bit types (default ${DEFAULT-VALUE})")
    String wordOrder;

    @Override
    public Integer call() {
        CommandLine line = spec.commandLine();
        if (unit < 1 || unit > 247) {
            throw new CommandLine.ParameterException(line, "--unit must be 1-247, got " + unit);
        }
        RegisterType registerType = RegisterType.fromConfig(type).orElseThrow(() -> new CommandLine.ParameterException(
                line, "--type must be uint16, int16, uint32, int32 or float32, got '" + type + "'"));
        WordOrder order = WordOrder.fromConfig(wordOrder).orElseThrow(() -> new CommandLine.ParameterException(line,
                "--word-order must be big or little, got '" + wordOrder + "'"));
        ModbusRequest request = request(line, registerType);
        Duration timeout = link.timeout(line);
        ProbeReport report = new ProbeReport(link.json, link.verbose, line.getOut());
        try (Transport transport = link.transport(line)) {
            try {
                transport.reopen();
            } catch (IOException e) {
                return fail(report, e.getMessage());
            }
            ModbusClient.Exchange exchange;
            try {
                exchange = ModbusClient.forTransport(transport, SILENCE).transact(request, timeout, 0);
            } catch (IOException e) {
                return fail(report, e.getMessage());
            }
            report.sent(exchange.last().sent());
            report.received(exchange.last().received().bytes());
            report.json().put("request", request.describe());
            ModbusReply reply = exchange.reply();
            if (!reply.isOk()) {
                report.roundTrip(exchange.last().roundTrip());
                return fail(report, reply.reason());
            }
            if (reply instanceof ModbusReply.Values values) {
                var array = report.json().putArray("values");
                StringBuilder text = new StringBuilder();
                int[] raw = values.values();
                int step = request.function().readsRegisters() ? registerType.registers() : 1;
                for (int i = 0; i < raw.length; i += step) {
                    double value = request.function().readsRegisters() ? RegisterCodec.decode(raw, i, registerType, order)
                            : raw[i];
                    array.add(value);
                    text.append(text.length() == 0 ? "" : ", ").append(format(value));
                }
                report.line(request.describe() + ": " + text);
            } else {
                report.json().put("written", true);
                report.line(request.describe() + ": confirmed");
            }
            report.roundTrip(exchange.last().roundTrip());
            report.finish();
            return 0;
        }
    }

    private ModbusRequest request(CommandLine line, RegisterType registerType) {
        try {
            if (action.read != null) {
                String[] parts = action.read.split(":");
                if (parts.length != 3) {
                    throw new CommandLine.ParameterException(line, "--read must be TABLE:ADDRESS:COUNT, got '"
                            + action.read + "'");
                }
                ModbusTable table = ModbusTable.fromConfig(parts[0]).orElseThrow(() -> new CommandLine.ParameterException(
                        line, "--read table must be holding, input, coil or discrete, got '" + parts[0] + "'"));
                int address = Integer.parseInt(parts[1]);
                int count = Integer.parseInt(parts[2]);
                if (!table.holdsBits() && count % registerType.registers() != 0) {
                    throw new CommandLine.ParameterException(line, "--read count " + count + " is not a whole number of "
                            + registerType.configName() + " values (" + registerType.registers() + " registers each)");
                }
                FunctionCode function = table.readFunction();
                return ModbusRequest.read(unit, function, address, count);
            }
            if (action.writeCoil != null) {
                String[] parts = action.writeCoil.split(":");
                if (parts.length != 2 || !(parts[1].equals("on") || parts[1].equals("off"))) {
                    throw new CommandLine.ParameterException(line, "--write-coil must be ADDRESS:on or ADDRESS:off, got '"
                            + action.writeCoil + "'");
                }
                return ModbusRequest.writeSingleCoil(unit, Integer.parseInt(parts[0]), parts[1].equals("on"));
            }
            String[] parts = action.writeRegister.split(":");
            if (parts.length != 2) {
                throw new CommandLine.ParameterException(line, "--write-register must be ADDRESS:VALUE, got '"
                        + action.writeRegister + "'");
            }
            return ModbusRequest.writeSingleRegister(unit, Integer.parseInt(parts[0]), Integer.parseInt(parts[1]));
        } catch (NumberFormatException e) {
            throw new CommandLine.ParameterException(line, "not a whole number: " + e.getMessage());
        } catch (IllegalArgumentException e) {
            throw new CommandLine.ParameterException(line, e.getMessage());
        }
    }

    private int fail(ProbeReport report, String reason) {
        report.json().put("error", reason);
        report.finish();
        spec.commandLine().getErr().println("probe: " + reason);
        spec.commandLine().getErr().flush();
        return ProbeCommand.DEVICE_MISBEHAVED;
    }

    static String format(double value) {
        return value == Math.rint(value) && Math.abs(value) < 1e15 ? Long.toString((long) value)
                : String.format(Locale.ROOT, "%s", value);
    }
}
