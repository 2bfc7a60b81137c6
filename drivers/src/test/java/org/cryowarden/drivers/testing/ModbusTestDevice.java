package org.cryowarden.drivers.testing;

import java.util.HashMap;
import java.util.Map;
import java.util.Random;
import org.cryowarden.drivers.modbus.ExceptionCode;
import org.cryowarden.drivers.modbus.ModbusRequest;
import org.cryowarden.drivers.modbus.ModbusSlaveCodec;
import org.cryowarden.drivers.modbus.SlaveRequest;

/**
 * A Modbus slave for tests, built on the slave side of our codec: holding/input registers and coils in maps, and
 * a behaviour that can be switched mid-run (answer, stay silent, answer garbage, corrupt the CRC, answer as
 * another unit, refuse with an exception). Thread-safe: a pseudo-terminal pump thread calls {@link #respond}.
 */
public final class ModbusTestDevice implements ScriptedTransport.Responder {

    public enum Behaviour { ANSWER, SILENT, GARBAGE, BAD_CRC, WRONG_UNIT, BUSY }

    private final int unit;
    private final Map<Integer, Integer> holding = new HashMap<>();
    private final Map<Integer, Integer> input = new HashMap<>();
    private final Map<Integer, Integer> coils = new HashMap<>();
    private final Random random = new Random(7);
    private Behaviour behaviour = Behaviour.ANSWER;
    private int requests;

    public ModbusTestDevice(int unit) {
        this.unit = unit;
    }

    public synchronized ModbusTestDevice holding(int address, int value) {
        holding.put(address, value);
        return this;
    }

    public synchronized ModbusTestDevice input(int address, int value) {
        input.put(address, value);
        return this;
    }

    public synchronized int holdingValue(int address) {
        return holding.getOrDefault(address, 0);
    }

    public synchronized int coilValue(int address) {
        return coils.getOrDefault(address, 0);
    }

    public synchronized void behave(Behaviour next) {
        behaviour = next;
    }

    public synchronized int requests() {
        return requests;
    }

    @Override
    public synchronized byte[] respond(byte[] frame) {
        requests++;
        SlaveRequest parsed = ModbusSlaveCodec.parseRequest(frame, frame.length);
        if (behaviour == Behaviour.SILENT) {
            return new byte[0];
        }
        if (behaviour == Behaviour.GARBAGE) {
            byte[] garbage = new byte[3 + random.nextInt(12)];
            random.nextBytes(garbage);
            return garbage;
        }
        byte[] answer;
        if (parsed instanceof SlaveRequest.Refused refused) {
            answer = refused.unit() == unit ? ModbusSlaveCodec.encodeException(unit, refused.functionCode(),
                    refused.exception()) : new byte[0];
        } else if (parsed instanceof SlaveRequest.Accepted accepted && accepted.request().unit() == unit) {
            answer = serve(accepted.request());
        } else {
            return new byte[0];
        }
        if (behaviour == Behaviour.BAD_CRC && answer.length > 0) {
            answer[answer.length - 1] ^= 0x5A;
        }
        if (behaviour == Behaviour.WRONG_UNIT && answer.length > 0) {
            answer = ModbusSlaveCodec.encodeException(unit + 1, 0x03, ExceptionCode.SERVER_DEVICE_BUSY);
        }
        return answer;
    }

    private byte[] serve(ModbusRequest request) {
        if (behaviour == Behaviour.BUSY) {
            return ModbusSlaveCodec.encodeException(unit, request.function().code(), ExceptionCode.SERVER_DEVICE_BUSY);
        }
        int[] values = new int[request.quantity()];
        switch (request.function()) {
            case READ_HOLDING_REGISTERS, READ_INPUT_REGISTERS -> {
                Map<Integer, Integer> table = request.function().code() == 3 ? holding : input;
                for (int i = 0; i < values.length; i++) {
                    Integer value = table.get(request.address() + i);
                    if (value == null) {
                        return ModbusSlaveCodec.encodeException(unit, request.function().code(),
                                ExceptionCode.ILLEGAL_DATA_ADDRESS);
                    }
                    values[i] = value;
                }
                return ModbusSlaveCodec.encodeReadResponse(request, values);
            }
            case READ_COILS, READ_DISCRETE_INPUTS -> {
                for (int i = 0; i < values.length; i++) {
                    values[i] = coils.getOrDefault(request.address() + i, 0);
                }
                return ModbusSlaveCodec.encodeReadResponse(request, values);
            }
            case WRITE_SINGLE_COIL, WRITE_MULTIPLE_COILS -> {
                int[] written = request.values();
                for (int i = 0; i < written.length; i++) {
                    coils.put(request.address() + i, written[i]);
                }
                return ModbusSlaveCodec.encodeWriteResponse(request);
            }
            case WRITE_SINGLE_REGISTER, WRITE_MULTIPLE_REGISTERS -> {
                int[] written = request.values();
                for (int i = 0; i < written.length; i++) {
                    holding.put(request.address() + i, written[i]);
                }
                return ModbusSlaveCodec.encodeWriteResponse(request);
            }
        }
        throw new AssertionError(request);
    }
}
