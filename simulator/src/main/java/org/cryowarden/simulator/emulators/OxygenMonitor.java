package org.cryowarden.simulator.emulators;

import org.cryowarden.drivers.modbus.ExceptionCode;
import org.cryowarden.drivers.modbus.ModbusTable;
import org.cryowarden.simulator.sensors.SensorSnapshot;

/**
 * A wall-mounted oxygen monitor with a Modbus register map of our own:
 * <ul>
 *   <li>input register 0: oxygen in 0.01 %vol (uint16; 2090 = 20.90 %vol);</li>
 *   <li>input register 1: status bits, bit 0 warning, bit 1 alarm;</li>
 *   <li>holding registers 0 and 1: warning and alarm set points in 0.1 %vol (defaults 195 and 180, the common
 *       19.5 % and 18 %), writable 0-250;</li>
 *   <li>discrete inputs 0 and 1: the warning and alarm relays.</li>
 * </ul>
 * Channel 0 for faults. The monitor's own alarms are part of the emulation only; cryowarden raises its own.
 */
public final class OxygenMonitor extends ModbusInstrument {

    private final String sensorId;
    private final int[] setPoints = {195, 180};

    public OxygenMonitor(String id, int unit, String sensorId, long seed) {
        super(id, unit, seed);
        this.sensorId = sensorId;
    }

    public String sensorId() {
        return sensorId;
    }

    private double percent(SensorSnapshot snapshot) {
        return Math.max(0, Math.min(25, faulted(0, snapshot.value(sensorId), snapshot.elapsedSeconds())));
    }

    @Override
    protected int[] read(ModbusTable table, int address, int count, SensorSnapshot snapshot) throws ModbusRefusal {
        int size = table == ModbusTable.COIL ? 0 : 2;
        if (size == 0) {
            throw illegalFunction(table);
        }
        if (address + count > size) {
            throw illegalAddress(table, Math.max(address, size));
        }
        double percent = percent(snapshot);
        boolean warning;
        boolean alarm;
        int[] setPointCopy;
        synchronized (setPoints) {
            setPointCopy = setPoints.clone();
        }
        warning = percent * 10 <= setPointCopy[0];
        alarm = percent * 10 <= setPointCopy[1];
        int[] all = switch (table) {
            case INPUT -> new int[] {(int) Math.round(percent * 100), (warning ? 1 : 0) | (alarm ? 2 : 0)};
            case HOLDING -> setPointCopy;
            case DISCRETE -> new int[] {warning ? 1 : 0, alarm ? 1 : 0};
            case COIL -> throw illegalFunction(table);
        };
        int[] values = new int[count];
        System.arraycopy(all, address, values, 0, count);
        return values;
    }

    @Override
    protected void checkWritable(ModbusTable table, int address, int count) throws ModbusRefusal {
        if (table != ModbusTable.HOLDING) {
            throw illegalFunction(table);
        }
        if (address + count > 2) {
            throw illegalAddress(table, Math.max(address, 2));
        }
    }

    @Override
    protected void checkRegisterValue(int address, int value) throws ModbusRefusal {
        if (value > 250) {
            throw new ModbusRefusal(ExceptionCode.ILLEGAL_DATA_VALUE, "set point " + value + " above 25.0 %vol");
        }
    }

    @Override
    protected void writeRegister(int address, int value) {
        synchronized (setPoints) {
            setPoints[address] = value;
        }
    }
}
