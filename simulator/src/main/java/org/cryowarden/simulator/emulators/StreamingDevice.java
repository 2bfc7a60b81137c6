package org.cryowarden.simulator.emulators;

import java.util.Locale;
import java.util.Optional;
import org.cryowarden.drivers.text.Terminator;
import org.cryowarden.simulator.sensors.SensorSnapshot;

/**
 * A device that prints one reading per period by itself, for the drivers' line protocol: the line is
 * {@code prefix + value + suffix} with the value in {@code %.1E} form ("P=2.4E-06 mbar" for a vacuum gauge).
 * The period runs on the simulated clock. Channel 0 for faults.
 */
public final class StreamingDevice extends Instrument {

    private final String sensorId;
    private final String prefix;
    private final String suffix;
    private final double periodSeconds;
    private final Terminator terminator;
    private double nextDue;

    public StreamingDevice(String id, String sensorId, String prefix, String suffix, double periodSeconds,
            Terminator terminator, long seed) {
        super(id, seed);
        this.sensorId = sensorId;
        this.prefix = prefix;
        this.suffix = suffix;
        this.periodSeconds = periodSeconds;
        this.terminator = terminator;
    }

    @Override
    public Protocol protocol() {
        return Protocol.LINE;
    }

    public Terminator terminator() {
        return terminator;
    }

    /** The line to print after this step, if one is due. Simulation thread only. */
    public Optional<String> lineDue(SensorSnapshot snapshot) {
        double now = snapshot.elapsedSeconds();
        if (now + 1e-9 < nextDue) {
            return Optional.empty();
        }
        nextDue = now + periodSeconds;
        return Optional.of(format(snapshot));
    }

    /** The line for the current reading. */
    public String format(SensorSnapshot snapshot) {
        double value = faulted(0, snapshot.value(sensorId), snapshot.elapsedSeconds());
        return prefix + String.format(Locale.ROOT, "%.1E", value) + suffix;
    }
}
