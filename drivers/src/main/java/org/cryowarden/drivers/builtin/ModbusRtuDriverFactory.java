package org.cryowarden.drivers.builtin;

import java.util.List;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.spi.DriverFactory;
import org.cryowarden.drivers.spi.InstrumentDriver;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.model.InstrumentDef;

/** The built-in {@code modbus-rtu} driver: Modbus RTU slaves on a serial line or behind a serial device server. */
public final class ModbusRtuDriverFactory implements DriverFactory {

    @Override
    public String id() {
        return "modbus-rtu";
    }

    @Override
    public String version() {
        return BuiltinVersion.get();
    }

    @Override
    public String description() {
        return "Modbus RTU master (functions 01-06, 15, 16), register types, 4-20 mA loops with NAMUR NE 43";
    }

    @Override
    public List<ConfigProblem> validate(InstrumentDef instrument, DriverContext context) {
        return ModbusRtuConfig.read(instrument, context).problems();
    }

    @Override
    public InstrumentDriver create(InstrumentDef instrument, DriverContext context) {
        ModbusRtuConfig.Parsed parsed = ModbusRtuConfig.read(instrument, context);
        return new ModbusRtuInstrument(instrument.id(), parsed.config().orElseThrow(() ->
                new IllegalArgumentException("instrument '" + instrument.id() + "' does not validate: "
                        + parsed.problems())), context);
    }
}
