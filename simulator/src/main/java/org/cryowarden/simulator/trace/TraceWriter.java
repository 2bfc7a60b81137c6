package org.cryowarden.simulator.trace;

import java.io.BufferedWriter;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.util.Locale;
import org.cryowarden.simulator.StepListener;
import org.cryowarden.simulator.model.PlantState;
import org.cryowarden.simulator.model.RoomState;
import org.cryowarden.simulator.model.VesselState;
import org.cryowarden.simulator.sensors.SensorSnapshot;

/**
 * Writes the true physical state after every step as CSV, for comparing what a daemon saw with what happened.
 * Columns: {@code time} (ISO-8601 UTC), {@code elapsed_s}, then per vessel {@code <id>.liquid_L},
 * {@code <id>.height_m}, {@code <id>.pressure_kPa} (absolute), {@code <id>.bath_K}, {@code <id>.heat_W},
 * {@code <id>.relief_open}, {@code <id>.burst_open}, {@code <id>.to_recovery_kg}, {@code <id>.to_room_kg}, and
 * per room {@code <id>.oxygen_pct}, {@code <id>.helium_pct}, {@code <id>.nitrogen_pct},
 * {@code <id>.outflow_m3_per_h}, {@code <id>.exhaust_fan}.
 */
public final class TraceWriter implements StepListener, AutoCloseable {

    private final BufferedWriter out;
    private boolean headerWritten;

    public TraceWriter(Writer out) {
        this.out = new BufferedWriter(out, 1 << 16);
    }

    @Override
    public void afterStep(PlantState state, SensorSnapshot sensors) {
        try {
            if (!headerWritten) {
                header(state);
                headerWritten = true;
            }
            StringBuilder line = new StringBuilder(256);
            line.append(state.time()).append(',').append(num(state.elapsed().toNanos() / 1e9));
            for (VesselState v : state.vessels()) {
                line.append(',').append(num(v.liquidLitres())).append(',').append(num(v.liquidHeightMetres()))
                        .append(',').append(num(v.pressurePascal() / 1000)).append(',').append(num(v.bathKelvin()))
                        .append(',').append(num(v.heatLoadWatts())).append(',').append(v.reliefOpen() ? 1 : 0)
                        .append(',').append(v.burstDiscOpen() ? 1 : 0).append(',').append(num(v.toRecoveryKg()))
                        .append(',').append(num(v.toRoomKg()));
            }
            for (RoomState r : state.rooms()) {
                line.append(',').append(num(r.oxygenFraction() * 100)).append(',').append(num(r.heliumFraction() * 100))
                        .append(',').append(num(r.nitrogenFraction() * 100)).append(',')
                        .append(num(r.outflowCubicMetresPerSecond() * 3600)).append(',')
                        .append(r.exhaustFanOn() ? 1 : 0);
            }
            out.write(line.append('\n').toString());
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write the trace: " + e.getMessage(), e);
        }
    }

    private void header(PlantState state) throws IOException {
        StringBuilder line = new StringBuilder("time,elapsed_s");
        for (VesselState v : state.vessels()) {
            for (String column : new String[] {"liquid_L", "height_m", "pressure_kPa", "bath_K", "heat_W",
                "relief_open", "burst_open", "to_recovery_kg", "to_room_kg"}) {
                line.append(',').append(v.id()).append('.').append(column);
            }
        }
        for (RoomState r : state.rooms()) {
            for (String column : new String[] {"oxygen_pct", "helium_pct", "nitrogen_pct", "outflow_m3_per_h",
                "exhaust_fan"}) {
                line.append(',').append(r.id()).append('.').append(column);
            }
        }
        out.write(line.append('\n').toString());
    }

    private static String num(double value) {
        return String.format(Locale.ROOT, "%.6g", value);
    }

    @Override
    public void close() throws IOException {
        out.close();
    }
}
