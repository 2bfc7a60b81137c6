package org.cryowarden.drivers.builtin;

import java.time.Duration;
import java.util.List;
import org.cryowarden.drivers.contract.DriverContract;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.spi.DriverFactory;
import org.cryowarden.drivers.testing.ModbusTestDevice;
import org.cryowarden.drivers.testing.ScriptedTransport;
import org.cryowarden.drivers.testing.Sites;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.InstrumentDef;

class ModbusRtuDriverContractTest extends DriverContract {

    @Override
    protected DriverFactory factory() {
        return new ModbusRtuDriverFactory();
    }

    @Override
    protected InstrumentDef sampleInstrument() {
        return Sites.instrument("dewar-scale", "modbus-rtu", Sites.mapping("unit", "9", "timeout", "100ms"),
                Sites.point("dewar-mass", Sites.mapping("table", "input", "address", "10", "type", "float32")),
                Sites.point("o2-hall", Sites.mapping("table", "input", "address", "20", "scale", "0.001",
                        "current_loop", Sites.mapping("range", List.of("0", "25")))));
    }

    @Override
    protected DriverContext context() {
        return Sites.context(time, List.of(Sites.channel("dewar-mass", Unit.KILOGRAM, Duration.ofSeconds(10)),
                Sites.channel("o2-hall", Unit.PERCENT_VOLUME, Duration.ofSeconds(2))), List.of());
    }

    @Override
    protected ScriptedTransport.Responder healthyDevice() {
        // 12000 * 0.001 = 12 mA, mid-scale of the loop; 0x4120 0x0000 is float32 10.0 (IEEE 754).
        return new ModbusTestDevice(9).input(10, 0x4120).input(11, 0x0000).input(20, 12_000);
    }
}
