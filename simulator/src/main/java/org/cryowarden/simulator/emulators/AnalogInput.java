package org.cryowarden.simulator.emulators;

import java.util.Objects;
import org.cryowarden.drivers.analog.CurrentLoop;
import org.cryowarden.drivers.modbus.RegisterType;
import org.cryowarden.drivers.modbus.WordOrder;

/**
 * One input of an analog input module: the 4-20 mA loop of a transmitter reading {@code sensorId}, scaled by
 * {@code loop}, held in input registers from {@code address} as {@code type}; {@code milliampsPerCount} is what
 * one register count means (0.001 for a module that reports microamps, 1 for float32 milliamps).
 */
public record AnalogInput(int address, String sensorId, CurrentLoop loop, RegisterType type, WordOrder wordOrder,
        double milliampsPerCount) {

    public AnalogInput {
        Objects.requireNonNull(sensorId, "sensorId");
        Objects.requireNonNull(loop, "loop");
        Objects.requireNonNull(type, "type");
        Objects.requireNonNull(wordOrder, "wordOrder");
        if (!(milliampsPerCount > 0)) {
            throw new IllegalArgumentException("scale must be positive, got " + milliampsPerCount);
        }
    }
}
