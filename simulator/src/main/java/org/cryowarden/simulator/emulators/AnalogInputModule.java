package org.cryowarden.simulator.emulators;

import java.util.List;
import org.cryowarden.drivers.analog.CurrentLoop;
import org.cryowarden.drivers.modbus.ModbusTable;
import org.cryowarden.drivers.modbus.RegisterCodec;
import org.cryowarden.simulator.sensors.SensorSnapshot;

/**
 * A Modbus analog input module carrying 4-20 mA transmitters: each input's register(s) hold the loop current
 * for its sensor's value, through the drivers' {@link CurrentLoop} scaling and {@link RegisterCodec} layout. A
 * transmitter saturates at the ends of the NE 43 measuring range (3.8 and 20.5 mA); a wire-break fault reads
 * 0 mA. Only input registers exist; the channel number of an input for faults is its address.
 */
public final class AnalogInputModule extends ModbusInstrument {

    private final List<AnalogInput> inputs;

    public AnalogInputModule(String id, int unit, List<AnalogInput> inputs, long seed) {
        super(id, unit, seed);
        this.inputs = List.copyOf(inputs);
    }

    public List<AnalogInput> inputs() {
        return inputs;
    }

    /** The loop current an input carries now, mA. */
    public double milliamps(AnalogInput input, SensorSnapshot snapshot) {
        if (hasFault(FaultKind.WIRE_BREAK, input.address())) {
            return 0;
        }
        double value = faulted(input.address(), snapshot.value(input.sensorId()), snapshot.elapsedSeconds());
        double current = input.loop().milliampsFor(value);
        if (Double.isNaN(current)) {
            return 0;
        }
        return Math.max(CurrentLoop.RANGE_LOW_MA, Math.min(CurrentLoop.RANGE_HIGH_MA, current));
    }

    @Override
    protected int[] read(ModbusTable table, int address, int count, SensorSnapshot snapshot) throws ModbusRefusal {
        if (table != ModbusTable.INPUT) {
            throw illegalFunction(table);
        }
        int[] values = new int[count];
        int at = address;
        while (at < address + count) {
            AnalogInput input = inputAt(at);
            if (input == null) {
                throw illegalAddress(table, at);
            }
            double raw = milliamps(input, snapshot) / input.milliampsPerCount();
            int[] registers = RegisterCodec.encode(raw, input.type(), input.wordOrder());
            for (int i = 0; i < registers.length; i++) {
                int register = input.address() + i;
                if (register >= address && register < address + count) {
                    values[register - address] = registers[i];
                }
            }
            at = input.address() + registers.length;
        }
        return values;
    }

    private AnalogInput inputAt(int register) {
        for (AnalogInput input : inputs) {
            if (register >= input.address() && register < input.address() + input.type().registers()) {
                return input;
            }
        }
        return null;
    }
}
