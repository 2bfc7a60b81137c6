package org.cryowarden.drivers.builtin;

import java.util.Optional;
import org.cryowarden.drivers.analog.CurrentLoop;
import org.cryowarden.drivers.modbus.ModbusTable;
import org.cryowarden.drivers.modbus.RegisterType;
import org.cryowarden.drivers.modbus.WordOrder;

/**
 * One validated Modbus point: where the value lives and how raw register contents become the channel's value
 * ({@code raw * scale + offset}, then the 4-20 mA loop when {@code loop} is present).
 */
record ModbusPoint(String id, boolean output, ModbusTable table, int address, RegisterType type,
        WordOrder order, double scale, double offset, Optional<CurrentLoop> loop) {

    int quantity() {
        return table.holdsBits() ? 1 : type.registers();
    }
}
