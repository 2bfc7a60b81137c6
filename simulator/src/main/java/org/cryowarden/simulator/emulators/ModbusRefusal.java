package org.cryowarden.simulator.emulators;

import org.cryowarden.drivers.modbus.ExceptionCode;

/** A request a slave refuses with a Modbus exception response (Modbus Application Protocol V1.1b3, §7). */
final class ModbusRefusal extends Exception {

    private final ExceptionCode code;

    ModbusRefusal(ExceptionCode code, String detail) {
        super(detail, null, false, false);
        this.code = code;
    }

    ExceptionCode code() {
        return code;
    }
}
