package org.cryowarden.simulator.emulators;

import java.util.List;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.drivers.modbus.ModbusTable;
import org.cryowarden.simulator.model.Actuators;
import org.cryowarden.simulator.sensors.SensorSnapshot;

/**
 * A Modbus relay module: coils that act on the model through {@link Actuators} (an exhaust fan, a fill valve, a
 * heater) and discrete inputs that read back the plant (a fan's airflow switch, a key switch). Coil states
 * persist in the module, so a read of the coils returns what was last written.
 */
public final class RelayModule extends ModbusInstrument {

    /** One coil; {@code actuator} is the model output it drives, empty for one that acts on nothing modelled. */
    public record Coil(int address, Optional<String> actuator, boolean initial) {
        public Coil {
            Objects.requireNonNull(actuator, "actuator");
        }
    }

    /** One discrete input: it reads an actuator's state, or a constant when {@code actuator} is empty. */
    public record DiscreteInput(int address, Optional<String> actuator, boolean constant) {
        public DiscreteInput {
            Objects.requireNonNull(actuator, "actuator");
        }
    }

    private final List<Coil> coils;
    private final List<DiscreteInput> inputs;
    private final Actuators actuators;
    private final boolean[] coilStates;

    public RelayModule(String id, int unit, List<Coil> coils, List<DiscreteInput> inputs, Actuators actuators,
            long seed) {
        super(id, unit, seed);
        this.coils = List.copyOf(coils);
        this.inputs = List.copyOf(inputs);
        this.actuators = actuators;
        int size = 0;
        for (Coil coil : this.coils) {
            size = Math.max(size, coil.address() + 1);
        }
        this.coilStates = new boolean[size];
        for (Coil coil : this.coils) {
            coilStates[coil.address()] = coil.initial();
            coil.actuator().ifPresent(key -> actuators.set(key, coil.initial()));
        }
    }

    public List<Coil> coils() {
        return coils;
    }

    /** Sets a coil as a master's write would (the timeline uses this for scripted outputs). */
    public void setCoil(int address, boolean on) {
        Coil coil = coil(address).orElseThrow(() -> new IllegalArgumentException("no coil " + address + " on " + id()));
        synchronized (coilStates) {
            coilStates[address] = on;
        }
        coil.actuator().ifPresent(key -> actuators.set(key, on));
    }

    public boolean coilState(int address) {
        synchronized (coilStates) {
            return coilStates[address];
        }
    }

    private Optional<Coil> coil(int address) {
        return coils.stream().filter(c -> c.address() == address).findFirst();
    }

    @Override
    protected int[] read(ModbusTable table, int address, int count, SensorSnapshot snapshot) throws ModbusRefusal {
        int[] values = new int[count];
        for (int i = 0; i < count; i++) {
            int at = address + i;
            switch (table) {
                case COIL -> {
                    if (coil(at).isEmpty()) {
                        throw illegalAddress(table, at);
                    }
                    values[i] = coilState(at) ? 1 : 0;
                }
                case DISCRETE -> {
                    DiscreteInput input = inputs.stream().filter(d -> d.address() == at).findFirst()
                            .orElseThrow(() -> illegalAddress(table, at));
                    boolean state = input.actuator().map(key -> actuators.isOn(key, false)).orElse(input.constant());
                    values[i] = faulted(at, state ? 1 : 0, snapshot.elapsedSeconds()) >= 0.5 ? 1 : 0;
                }
                default -> throw illegalFunction(table);
            }
        }
        return values;
    }

    @Override
    protected void checkWritable(ModbusTable table, int address, int count) throws ModbusRefusal {
        if (table != ModbusTable.COIL) {
            throw illegalFunction(table);
        }
        for (int i = 0; i < count; i++) {
            if (coil(address + i).isEmpty()) {
                throw illegalAddress(table, address + i);
            }
        }
    }

    @Override
    protected void writeCoil(int address, boolean on) {
        setCoil(address, on);
    }
}
