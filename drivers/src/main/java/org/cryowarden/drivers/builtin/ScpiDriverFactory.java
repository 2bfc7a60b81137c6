package org.cryowarden.drivers.builtin;

import java.util.List;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.spi.DriverFactory;
import org.cryowarden.drivers.spi.InstrumentDriver;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.model.InstrumentDef;

/** The built-in {@code scpi} driver: IEEE 488.2 / SCPI instruments over a serial line or a socket. */
public final class ScpiDriverFactory implements DriverFactory {

    @Override
    public String id() {
        return "scpi";
    }

    @Override
    public String version() {
        return BuiltinVersion.get();
    }

    @Override
    public String description() {
        return "SCPI text instruments: *IDN? at connect, one query per channel, NR1/NR2/NR3, error queue";
    }

    @Override
    public List<ConfigProblem> validate(InstrumentDef instrument, DriverContext context) {
        return TextConfig.readScpi(instrument, context).problems();
    }

    @Override
    public InstrumentDriver create(InstrumentDef instrument, DriverContext context) {
        TextConfig.Parsed parsed = TextConfig.readScpi(instrument, context);
        return new ScpiInstrument(instrument.id(), parsed.config().orElseThrow(() -> new IllegalArgumentException(
                "instrument '" + instrument.id() + "' does not validate: " + parsed.problems())), context);
    }
}
