package org.cryowarden.drivers.builtin;

import java.io.IOException;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.function.Consumer;
import java.util.OptionalDouble;
import org.cryowarden.drivers.analog.CurrentLoop;
import org.cryowarden.drivers.modbus.ModbusClient;
import org.cryowarden.drivers.modbus.ModbusReply;
import org.cryowarden.drivers.modbus.ModbusRequest;
import org.cryowarden.drivers.modbus.ModbusTable;
import org.cryowarden.drivers.modbus.RegisterCodec;
import org.cryowarden.drivers.modbus.RegisterType;
import org.cryowarden.drivers.modbus.FrameFault;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.spi.FaultCounters;
import org.cryowarden.drivers.spi.InstrumentDriver;
import org.cryowarden.drivers.spi.Transport;
import org.cryowarden.drivers.spi.WriteResult;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;

/**
 * One Modbus RTU slave: each point is read with its own request (function 01-04), writes use 05/06 (or 16 for
 * 32-bit values) and are read back. No reply reads STALE; every other fault BAD with the codec's reason.
 */
final class ModbusRtuInstrument implements InstrumentDriver {

    /**
     * The silence that ends a received frame on top of t3.5: USB adapters and device servers deliver one frame in
     * several chunks a few milliseconds apart (common practice; the FTDI latency timer defaults to 16 ms, from
     * memory), so the pure 3.5-character interval would cut frames short.
     */
    static final Duration SERIAL_SILENCE = Duration.ofMillis(20);
    static final Duration TCP_SILENCE = Duration.ofMillis(50);

    private final String id;
    private final ModbusRtuConfig config;
    private final DriverContext context;
    private final FaultCounters counters = new FaultCounters();
    private Transport clientTransport;
    private ModbusClient client;

    ModbusRtuInstrument(String id, ModbusRtuConfig config, DriverContext context) {
        this.id = id;
        this.config = config;
        this.context = context;
    }

    @Override
    public String instrumentId() {
        return id;
    }

    @Override
    public Optional<String> connect(Transport transport) {
        return Optional.empty();
    }

    @Override
    public List<Reading> poll(List<String> channels, Transport transport) throws IOException {
        List<Reading> readings = new ArrayList<>(channels.size());
        poll(channels, transport, readings::add);
        return readings;
    }

    /**
     * Reads the channels' points one request each. Once the unit has not answered one within its timeout, the
     * rest of this poll's points are not asked and read STALE with that reason: a unit slower than its timeout
     * sends its late reply while the master waits for the next one, and RTU frames carry no transaction number,
     * so a late reply of the same layout would be taken for the answer about another register (Modbus over Serial
     * Line V1.02, §2.4.1, the response time-out). Skipping also leaves the line to the neighbours instead of
     * spending a timeout on every point of a silent unit.
     */
    @Override
    public void poll(List<String> channels, Transport transport, Consumer<Reading> each) throws IOException {
        Optional<String> silent = Optional.empty();
        for (String channel : channels) {
            ModbusPoint point = config.points().get(channel);
            Unit unit = context.unitOf(channel);
            if (point == null || point.output()) {
                each.accept(Reading.bad(channel, unit, context.time().wallNow(), "instrument '" + id
                        + "' has no input point for channel '" + channel + "'"));
                continue;
            }
            if (silent.isPresent()) {
                counters.increment("not_asked");
                each.accept(Reading.stale(channel, unit, context.time().wallNow(), silent.get()
                        + "; not asked for " + readRequest(point).describe() + " until the next poll"));
                continue;
            }
            Reading reading = read(point, unit, transport);
            if (reading.quality() == Quality.STALE) { // read() gives STALE for no reply only
                silent = Optional.of(reading.reason());
            }
            each.accept(reading);
        }
    }

    private Reading read(ModbusPoint point, Unit unit, Transport transport) throws IOException {
        ModbusReply reply = counted(client(transport).transact(readRequest(point), config.timeout(),
                config.retries()));
        if (!(reply instanceof ModbusReply.Values values)) {
            boolean silent = reply instanceof ModbusReply.Fault fault && fault.fault() == FrameFault.NO_REPLY;
            return new Reading(point.id(), Double.NaN, unit, context.time().wallNow(),
                    silent ? Quality.STALE : Quality.BAD, reply.reason());
        }
        double raw = raw(point, values);
        if (!Double.isFinite(raw)) {
            counters.increment("not_a_number");
            return Reading.bad(point.id(), unit, context.time().wallNow(), "unit " + config.unit() + " register "
                    + point.address() + " holds a float32 " + raw);
        }
        double value = raw * point.scale() + point.offset();
        if (point.loop().isPresent()) {
            CurrentLoop.Value converted = point.loop().get().convert(value);
            if (converted.quality() != Quality.GOOD) {
                counters.increment(converted.quality() == Quality.BAD ? "loop_failure" : "loop_out_of_range");
            }
            return new Reading(point.id(), converted.value(), unit, context.time().wallNow(), converted.quality(),
                    converted.reason());
        }
        return Reading.good(point.id(), value, unit, context.time().wallNow());
    }

    @Override
    public WriteResult write(String output, double value, Transport transport) throws IOException {
        ModbusPoint point = config.points().get(output);
        if (point == null || !point.output()) {
            return WriteResult.failed(output, value, "instrument '" + id + "' has no output '" + output + "'");
        }
        ModbusClient modbus = client(transport);
        ModbusRequest request;
        if (point.table() == ModbusTable.COIL) {
            request = ModbusRequest.writeSingleCoil(config.unit(), point.address(), value != 0);
        } else {
            double raw = (value - point.offset()) / point.scale();
            if (!RegisterCodec.fits(raw, point.type())) {
                return WriteResult.failed(output, value, value + " does not fit a " + point.type().configName()
                        + " register with scale " + point.scale() + " and offset " + point.offset());
            }
            int[] registers = RegisterCodec.encode(raw, point.type(), point.order());
            request = registers.length == 1
                    ? ModbusRequest.writeSingleRegister(config.unit(), point.address(), registers[0])
                    : ModbusRequest.writeMultipleRegisters(config.unit(), point.address(), registers);
        }
        ModbusReply reply = counted(modbus.transact(request, config.timeout(), config.retries()));
        if (!reply.isOk()) {
            return WriteResult.failed(output, value, reply.reason());
        }
        ModbusReply back = counted(modbus.transact(readRequest(point), config.timeout(), config.retries()));
        if (!(back instanceof ModbusReply.Values values)) {
            return new WriteResult(output, value, OptionalDouble.empty(), false, "write confirmed but readback failed: "
                    + back.reason());
        }
        double raw = raw(point, values);
        double read = point.table().holdsBits() ? raw : raw * point.scale() + point.offset();
        double expected = point.table().holdsBits() ? (value != 0 ? 1 : 0) : value;
        double tolerance = point.type() == RegisterType.FLOAT32 ? Math.abs(expected) * 1e-6 + 1e-9
                : Math.abs(point.scale()) / 2 + 1e-12;
        if (Math.abs(read - expected) > tolerance) {
            counters.increment("readback_mismatch");
            return new WriteResult(output, value, OptionalDouble.of(read), false, "readback " + read
                    + " differs from the value written (" + expected + ")");
        }
        return WriteResult.confirmed(output, value, OptionalDouble.of(read));
    }

    @Override
    public Map<String, Long> counters() {
        return counters.snapshot();
    }

    /**
     * The exchange's outcome, counted under its key; frames from other units discarded on the way (late replies
     * of a neighbour) are counted as "foreign_frame", so a slow neighbour shows on this line's counters.
     */
    private ModbusReply counted(ModbusClient.Exchange exchange) {
        for (ModbusClient.Attempt attempt : exchange.attempts()) {
            for (int i = 0; i < attempt.foreignUnits().size(); i++) {
                counters.increment("foreign_frame");
            }
        }
        ModbusReply reply = exchange.reply();
        counters.increment(reply.counterKey());
        return reply;
    }

    /** The request that reads a point: its table's read function over its registers or bits. */
    private ModbusRequest readRequest(ModbusPoint point) {
        return ModbusRequest.read(config.unit(), point.table().readFunction(), point.address(), point.quantity());
    }

    /** The point's value as the slave holds it: a bit as 0/1, registers decoded but not yet scaled. */
    private static double raw(ModbusPoint point, ModbusReply.Values values) {
        return point.table().holdsBits() ? values.values()[0]
                : RegisterCodec.decode(values.values(), 0, point.type(), point.order());
    }

    private ModbusClient client(Transport transport) {
        if (client == null || clientTransport != transport) {
            clientTransport = transport;
            client = ModbusClient.forTransport(transport,
                    transport.baudRate().isPresent() ? SERIAL_SILENCE : TCP_SILENCE);
        }
        return client;
    }
}
