package org.cryowarden.drivers.builtin;

import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.List;
import org.cryowarden.drivers.contract.DriverContract;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.spi.DriverFactory;
import org.cryowarden.drivers.testing.ScriptedTransport;
import org.cryowarden.drivers.testing.Sites;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.InstrumentDef;

class ScpiDriverContractTest extends DriverContract {

    @Override
    protected DriverFactory factory() {
        return new ScpiDriverFactory();
    }

    @Override
    protected InstrumentDef sampleInstrument() {
        return Sites.instrument("bridge", "scpi", Sites.mapping("terminator", "crlf", "timeout", "200ms"),
                Sites.point("stage-temp", Sites.mapping("query", "MEAS:TEMP? A")),
                Sites.point("magnet-current", Sites.mapping("query", "MEAS:CURR?")));
    }

    @Override
    protected DriverContext context() {
        return Sites.context(time, List.of(Sites.channel("stage-temp", Unit.KELVIN, Duration.ofSeconds(5)),
                Sites.channel("magnet-current", Unit.AMPERE, Duration.ofSeconds(1))), List.of());
    }

    @Override
    protected ScriptedTransport.Responder healthyDevice() {
        return written -> {
            String query = new String(written, StandardCharsets.US_ASCII).strip();
            String answer = switch (query) {
                case "*IDN?" -> "Northwind Cryo,TB-7,SN77,1.0";
                case "MEAS:TEMP? A" -> "+4.221E+00";
                case "MEAS:CURR?" -> "12.5";
                default -> "9.91E37";
            };
            return (answer + "\r\n").getBytes(StandardCharsets.US_ASCII);
        };
    }
}
