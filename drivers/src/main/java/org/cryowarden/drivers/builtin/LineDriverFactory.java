package org.cryowarden.drivers.builtin;

import java.util.List;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.spi.DriverFactory;
import org.cryowarden.drivers.spi.InstrumentDriver;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.model.InstrumentDef;

/** The built-in {@code line} driver: devices that answer (or print) text lines, read with a regular expression. */
public final class LineDriverFactory implements DriverFactory {

    @Override
    public String id() {
        return "line";
    }

    @Override
    public String version() {
        return BuiltinVersion.get();
    }

    @Override
    public String description() {
        return "text lines: optional query, regex with a named group 'value', query or stream mode";
    }

    @Override
    public List<ConfigProblem> validate(InstrumentDef instrument, DriverContext context) {
        return TextConfig.readLine(instrument, context).problems();
    }

    @Override
    public InstrumentDriver create(InstrumentDef instrument, DriverContext context) {
        TextConfig.Parsed parsed = TextConfig.readLine(instrument, context);
        return new LineInstrument(instrument.id(), parsed.config().orElseThrow(() -> new IllegalArgumentException(
                "instrument '" + instrument.id() + "' does not validate: " + parsed.problems())), context);
    }
}
