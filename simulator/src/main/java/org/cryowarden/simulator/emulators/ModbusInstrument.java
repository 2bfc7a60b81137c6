package org.cryowarden.simulator.emulators;

import org.cryowarden.drivers.modbus.ExceptionCode;
import org.cryowarden.drivers.modbus.FunctionCode;
import org.cryowarden.drivers.modbus.ModbusRequest;
import org.cryowarden.drivers.modbus.ModbusSlaveCodec;
import org.cryowarden.drivers.modbus.ModbusTable;
import org.cryowarden.simulator.sensors.SensorSnapshot;

/**
 * A Modbus RTU slave at one unit address. The port hands it requests parsed by the drivers'
 * {@link ModbusSlaveCodec}; it answers with a normal response or an exception response encoded by the same codec:
 * ILLEGAL DATA ADDRESS for addresses it does not have, ILLEGAL FUNCTION for a table it does not have or cannot
 * write (Modbus Application Protocol Specification V1.1b3, §7).
 */
public abstract class ModbusInstrument extends Instrument {

    private final int unit;

    protected ModbusInstrument(String id, int unit, long seed) {
        super(id, seed);
        if (unit < 1 || unit > 247) {
            throw new IllegalArgumentException("Modbus unit must be 1-247, got " + unit);
        }
        this.unit = unit;
    }

    @Override
    public Protocol protocol() {
        return Protocol.MODBUS_RTU;
    }

    public int unit() {
        return unit;
    }

    /** The reply frame to a request for this unit (or a broadcast, whose reply the port does not send). */
    public final byte[] serve(ModbusRequest request, SensorSnapshot snapshot) {
        FunctionCode function = request.function();
        try {
            switch (function) {
                case READ_COILS, READ_DISCRETE_INPUTS, READ_HOLDING_REGISTERS, READ_INPUT_REGISTERS -> {
                    ModbusTable table = switch (function) {
                        case READ_COILS -> ModbusTable.COIL;
                        case READ_DISCRETE_INPUTS -> ModbusTable.DISCRETE;
                        case READ_HOLDING_REGISTERS -> ModbusTable.HOLDING;
                        default -> ModbusTable.INPUT;
                    };
                    int[] values = read(table, request.address(), request.quantity(), snapshot);
                    return ModbusSlaveCodec.encodeReadResponse(request, values);
                }
                case WRITE_SINGLE_COIL, WRITE_MULTIPLE_COILS -> {
                    int[] values = request.values();
                    checkWritable(ModbusTable.COIL, request.address(), values.length);
                    for (int i = 0; i < values.length; i++) {
                        writeCoil(request.address() + i, values[i] == 1);
                    }
                    return ModbusSlaveCodec.encodeWriteResponse(request);
                }
                case WRITE_SINGLE_REGISTER, WRITE_MULTIPLE_REGISTERS -> {
                    int[] values = request.values();
                    checkWritable(ModbusTable.HOLDING, request.address(), values.length);
                    for (int i = 0; i < values.length; i++) {
                        checkRegisterValue(request.address() + i, values[i]);
                    }
                    for (int i = 0; i < values.length; i++) {
                        writeRegister(request.address() + i, values[i]);
                    }
                    return ModbusSlaveCodec.encodeWriteResponse(request);
                }
            }
            throw new AssertionError(function);
        } catch (ModbusRefusal refusal) {
            return ModbusSlaveCodec.encodeException(request.unit(), function.code(), refusal.code());
        }
    }

    /** Values of {@code count} consecutive addresses of a table. */
    protected abstract int[] read(ModbusTable table, int address, int count, SensorSnapshot snapshot)
            throws ModbusRefusal;

    /** Refuses a write to a table or addresses the instrument does not have. */
    protected void checkWritable(ModbusTable table, int address, int count) throws ModbusRefusal {
        throw illegalFunction(table);
    }

    /** Refuses a register value the instrument does not accept (ILLEGAL DATA VALUE). */
    protected void checkRegisterValue(int address, int value) throws ModbusRefusal {
    }

    protected void writeCoil(int address, boolean on) {
        throw new IllegalStateException("checkWritable admitted a coil write it cannot do");
    }

    protected void writeRegister(int address, int value) {
        throw new IllegalStateException("checkWritable admitted a register write it cannot do");
    }

    protected static ModbusRefusal illegalFunction(ModbusTable table) {
        return new ModbusRefusal(ExceptionCode.ILLEGAL_FUNCTION, "no " + table.configName() + " table");
    }

    protected static ModbusRefusal illegalAddress(ModbusTable table, int address) {
        return new ModbusRefusal(ExceptionCode.ILLEGAL_DATA_ADDRESS, "no " + table.configName() + " " + address);
    }
}
