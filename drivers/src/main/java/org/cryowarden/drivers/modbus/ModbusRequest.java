package org.cryowarden.drivers.modbus;

import java.util.Arrays;
import java.util.Objects;

/**
 * One Modbus request as both sides see it: the master encodes it with {@link #encode()}, the slave gets it back
 * from {@link ModbusSlaveCodec#parseRequest}. PDU layouts from the Modbus Application Protocol Specification
 * V1.1b3, §6.1-§6.6, §6.11 and §6.12; the RTU frame (address, PDU, CRC) from Modbus over Serial Line V1.02, §2.3.
 *
 * @param unit     slave address 0-247 (0 is broadcast, only for writes)
 * @param function the function code
 * @param address  first coil or register, 0-65535 (the PDU address, zero-based)
 * @param quantity how many coils or registers (1 for the single writes)
 * @param values   for writes: coil states as 0/1 or register values 0-65535; empty for reads
 */
public record ModbusRequest(int unit, FunctionCode function, int address, int quantity, int[] values) {

    public ModbusRequest {
        Objects.requireNonNull(function, "function");
        values = values.clone();
        if (unit < 0 || unit > 247) {
            throw new IllegalArgumentException("Modbus unit must be 0-247, got " + unit);
        }
        if (unit == 0 && function.isRead()) {
            throw new IllegalArgumentException("broadcast (unit 0) is only allowed for writes, not " + function);
        }
        if (address < 0 || address > 0xFFFF) {
            throw new IllegalArgumentException("Modbus address must be 0-65535, got " + address);
        }
        if (quantity < function.minQuantity() || quantity > function.maxQuantity()) {
            throw new IllegalArgumentException(function + " quantity must be " + function.minQuantity() + "-"
                    + function.maxQuantity() + ", got " + quantity);
        }
        if (address + quantity > 0x10000) {
            throw new IllegalArgumentException("Modbus address range " + address + "+" + quantity + " passes 65535");
        }
        int expectedValues = function.isRead() ? 0 : quantity;
        if (values.length != expectedValues) {
            throw new IllegalArgumentException(function + " needs " + expectedValues + " values, got " + values.length);
        }
        for (int value : values) {
            boolean bits = function == FunctionCode.WRITE_SINGLE_COIL || function == FunctionCode.WRITE_MULTIPLE_COILS;
            if (bits ? value != 0 && value != 1 : value < 0 || value > 0xFFFF) {
                throw new IllegalArgumentException(function + " value out of range: " + value);
            }
        }
    }

    public static ModbusRequest read(int unit, FunctionCode function, int address, int quantity) {
        if (!function.isRead()) {
            throw new IllegalArgumentException(function + " is not a read");
        }
        return new ModbusRequest(unit, function, address, quantity, new int[0]);
    }

    public static ModbusRequest writeSingleCoil(int unit, int address, boolean on) {
        return new ModbusRequest(unit, FunctionCode.WRITE_SINGLE_COIL, address, 1, new int[] {on ? 1 : 0});
    }

    public static ModbusRequest writeSingleRegister(int unit, int address, int value) {
        return new ModbusRequest(unit, FunctionCode.WRITE_SINGLE_REGISTER, address, 1, new int[] {value});
    }

    public static ModbusRequest writeMultipleCoils(int unit, int address, boolean[] states) {
        int[] values = new int[states.length];
        for (int i = 0; i < states.length; i++) {
            values[i] = states[i] ? 1 : 0;
        }
        return new ModbusRequest(unit, FunctionCode.WRITE_MULTIPLE_COILS, address, states.length, values);
    }

    public static ModbusRequest writeMultipleRegisters(int unit, int address, int[] registers) {
        return new ModbusRequest(unit, FunctionCode.WRITE_MULTIPLE_REGISTERS, address, registers.length, registers);
    }

    @Override
    public int[] values() {
        return values.clone();
    }

    /** The PDU: function code and data, without address and CRC. */
    public byte[] pdu() {
        ByteWriter out = new ByteWriter();
        out.u8(function.code());
        out.u16(address);
        switch (function) {
            case READ_COILS, READ_DISCRETE_INPUTS, READ_HOLDING_REGISTERS, READ_INPUT_REGISTERS -> out.u16(quantity);
            case WRITE_SINGLE_COIL -> out.u16(values[0] == 1 ? 0xFF00 : 0x0000);
            case WRITE_SINGLE_REGISTER -> out.u16(values[0]);
            case WRITE_MULTIPLE_COILS -> {
                out.u16(quantity);
                byte[] packed = BitPacking.pack(values);
                out.u8(packed.length);
                out.bytes(packed);
            }
            case WRITE_MULTIPLE_REGISTERS -> {
                out.u16(quantity);
                out.u8(quantity * 2);
                for (int value : values) {
                    out.u16(value);
                }
            }
        }
        return out.toArray();
    }

    /** The complete RTU frame: unit, PDU, CRC low byte, CRC high byte. */
    public byte[] encode() {
        byte[] pdu = pdu();
        byte[] body = new byte[pdu.length + 1];
        body[0] = (byte) unit;
        System.arraycopy(pdu, 0, body, 1, pdu.length);
        return ModbusCrc.append(body);
    }

    /** The length in bytes of the normal (non-exception) RTU response frame to this request. */
    public int responseLength() {
        return switch (function) {
            case READ_COILS, READ_DISCRETE_INPUTS -> 5 + (quantity + 7) / 8;
            case READ_HOLDING_REGISTERS, READ_INPUT_REGISTERS -> 5 + 2 * quantity;
            case WRITE_SINGLE_COIL, WRITE_SINGLE_REGISTER, WRITE_MULTIPLE_COILS, WRITE_MULTIPLE_REGISTERS -> 8;
        };
    }

    /** Short text for logs and reasons: "read holding 100+2 from unit 3". */
    public String describe() {
        String what = switch (function) {
            case READ_COILS -> "read coils";
            case READ_DISCRETE_INPUTS -> "read discrete inputs";
            case READ_HOLDING_REGISTERS -> "read holding registers";
            case READ_INPUT_REGISTERS -> "read input registers";
            case WRITE_SINGLE_COIL -> "write coil";
            case WRITE_SINGLE_REGISTER -> "write register";
            case WRITE_MULTIPLE_COILS -> "write coils";
            case WRITE_MULTIPLE_REGISTERS -> "write registers";
        };
        return what + " " + address + (quantity > 1 ? "+" + quantity : "") + " at unit " + unit;
    }

    @Override
    public boolean equals(Object other) {
        return other instanceof ModbusRequest that && unit == that.unit && function == that.function
                && address == that.address && quantity == that.quantity && Arrays.equals(values, that.values);
    }

    @Override
    public int hashCode() {
        return Objects.hash(unit, function, address, quantity, Arrays.hashCode(values));
    }

    @Override
    public String toString() {
        return "ModbusRequest[" + describe() + (values.length > 0 ? " values " + Arrays.toString(values) : "") + "]";
    }
}
