package org.cryowarden.simulator.sensors;

import java.util.Optional;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.physics.CalibrationTable;
import org.cryowarden.simulator.model.Vessel;

/**
 * A cryogenic resistance thermometer with a calibration table (the bath, or a magnet's winding): the true
 * temperature becomes a resistance by inverting the table (bisection on {@link CalibrationTable#value}, which is
 * monotone), relative noise is added to the resistance, and the value is the table's temperature at that
 * resistance, as the instrument would compute it. Outside the table the resistance is held at its end.
 */
public final class CalibratedThermometer extends Sensor {

    private final Vessel vessel;
    private final Optional<String> magnetId;
    private final CalibrationTable table;
    private final double relativeNoise;

    public CalibratedThermometer(String id, Vessel vessel, Optional<String> magnetId, CalibrationTable table,
            double relativeNoise, long seed) {
        super(id, Unit.KELVIN, seed);
        this.vessel = vessel;
        this.magnetId = magnetId;
        this.table = table;
        this.relativeNoise = relativeNoise;
    }

    public CalibrationTable table() {
        return table;
    }

    @Override
    public void sample(double now, double dt) {
        double kelvin = magnetId.map(vessel::magnetKelvin).orElseGet(vessel::bathKelvin);
        double ohm = resistanceAt(table, kelvin) * (1 + gaussian(relativeNoise));
        raw = Math.max(table.minRaw(), Math.min(table.maxRaw(), ohm));
        value = table.value(raw);
    }

    /** The raw value at which the table gives {@code value}, clamped to the table's ends. */
    static double resistanceAt(CalibrationTable table, double value) {
        double lo = table.minRaw();
        double hi = table.maxRaw();
        boolean rising = table.value(hi) > table.value(lo);
        if (rising ? value <= table.value(lo) : value >= table.value(lo)) {
            return lo;
        }
        if (rising ? value >= table.value(hi) : value <= table.value(hi)) {
            return hi;
        }
        for (int i = 0; i < 100 && hi - lo > 1e-9 * hi; i++) {
            double mid = 0.5 * (lo + hi);
            if (table.value(mid) < value == rising) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return 0.5 * (lo + hi);
    }
}
