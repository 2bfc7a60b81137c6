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

class LineDriverContractTest extends DriverContract {

    @Override
    protected DriverFactory factory() {
        return new LineDriverFactory();
    }

    @Override
    protected InstrumentDef sampleInstrument() {
        return Sites.instrument("o2-monitor", "line", Sites.mapping("mode", "query", "timeout", "200ms"),
                Sites.point("o2-lab", Sites.mapping("query", "READ", "pattern", "O2 (?<value>[0-9.]+) %")));
    }

    @Override
    protected DriverContext context() {
        return Sites.context(time, List.of(Sites.channel("o2-lab", Unit.PERCENT_VOLUME, Duration.ofSeconds(1))),
                List.of());
    }

    @Override
    protected ScriptedTransport.Responder healthyDevice() {
        return written -> "O2 20.9 %\n".getBytes(StandardCharsets.US_ASCII);
    }
}
