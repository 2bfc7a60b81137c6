package org.cryowarden.simulator.sensors;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.physics.CalibrationPoint;
import org.cryowarden.rules.physics.CalibrationTable;
import org.cryowarden.rules.physics.Interpolation;

/**
 * Calibration tables for the demo's cryogenic thermometers. INVENTED for the simulator: they have the shape of a
 * negative-temperature-coefficient ceramic sensor (resistance falling steeply with temperature, straight-ish on
 * log-log paper) but belong to no real sensor and must never be used to calibrate one.
 */
public final class DemoCalibrations {

    /** (ohm, K) pairs, invented. */
    private static final Map<String, double[][]> TABLES = Map.of(
            "demo-ceramic-a", new double[][] {
                {32000, 1.4}, {12500, 2.0}, {5200, 3.0}, {2900, 4.2}, {1800, 6.0}, {1050, 10}, {560, 20},
                {300, 40}, {150, 77}, {85, 150}, {48, 300}, {44, 325}},
            "demo-ceramic-b", new double[][] {
                {41000, 1.4}, {15800, 2.0}, {6400, 3.0}, {3500, 4.2}, {2150, 6.0}, {1240, 10}, {650, 20},
                {345, 40}, {171, 77}, {96, 150}, {54, 300}, {50, 325}});

    private DemoCalibrations() {
    }

    public static List<String> names() {
        return TABLES.keySet().stream().sorted().toList();
    }

    public static Optional<CalibrationTable> table(String name) {
        double[][] pairs = TABLES.get(name);
        if (pairs == null) {
            return Optional.empty();
        }
        List<CalibrationPoint> points = new ArrayList<>(pairs.length);
        for (double[] pair : pairs) {
            points.add(new CalibrationPoint(pair[0], pair[1]));
        }
        return Optional.of(new CalibrationTable(points, Interpolation.LOG_LOG, Unit.OHM, Unit.KELVIN));
    }
}
