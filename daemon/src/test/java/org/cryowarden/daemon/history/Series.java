package org.cryowarden.daemon.history;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.cryowarden.drivers.analog.CurrentLoop;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;

/**
 * Invented, seeded instrument series for the history tests and the size report: what a night of 1 Hz polling in
 * a small cryogenics lab looks like. Values are quantized to the resolution an instrument prints, as a driver
 * parsing "62.4" gets them.
 */
final class Series {

    static final Instant DUSK = Instant.parse("2025-01-15T18:00:00Z");
    static final int NIGHT = 12 * 3600;

    private Series() {
    }

    /** A helium dewar level falling 1 %/h from 62 % with noise of 0.05 %, printed to 0.1 %. */
    static List<Reading> driftingLevel(long seed) {
        Random random = new Random(seed);
        List<Reading> readings = new ArrayList<>(NIGHT);
        for (int t = 0; t < NIGHT; t++) {
            double level = 62.0 - t / 3600.0 + random.nextGaussian() * 0.05;
            readings.add(good("level_d1", quantize(level, 1), Unit.PERCENT, DUSK.plusSeconds(t)));
        }
        return readings;
    }

    /** An oxygen cell at 20.9 %vol with noise of 0.03 %vol, printed to 0.01 %vol. */
    static List<Reading> oxygenCell(long seed) {
        Random random = new Random(seed);
        List<Reading> readings = new ArrayList<>(NIGHT);
        for (int t = 0; t < NIGHT; t++) {
            double o2 = 20.9 + random.nextGaussian() * 0.03;
            readings.add(good("o2_a", quantize(o2, 2), Unit.PERCENT_VOLUME, DUSK.plusSeconds(t)));
        }
        return readings;
    }

    /** A bath pressure that does not move. */
    static List<Reading> constant() {
        List<Reading> readings = new ArrayList<>(NIGHT);
        for (int t = 0; t < NIGHT; t++) {
            readings.add(good("p_bath", 1050, Unit.MILLIBAR, DUSK.plusSeconds(t)));
        }
        return readings;
    }

    /** A heater stepped through 0, 2.5, 5 and 7.5 W every 15 minutes. */
    static List<Reading> stepped() {
        List<Reading> readings = new ArrayList<>(NIGHT);
        for (int t = 0; t < NIGHT; t++) {
            readings.add(good("heater", 2.5 * ((t / 900) % 4), Unit.WATT, DUSK.plusSeconds(t)));
        }
        return readings;
    }

    /** Full-precision noise, as an unquantized analog conversion would give: the worst case for any codec. */
    static List<Reading> rawNoise(long seed) {
        Random random = new Random(seed);
        List<Reading> readings = new ArrayList<>(NIGHT);
        for (int t = 0; t < NIGHT; t++) {
            readings.add(good("t_stage", 4.2 + random.nextGaussian() * 0.001, Unit.KELVIN, DUSK.plusSeconds(t)));
        }
        return readings;
    }

    /** The same readings with their timestamps moved by up to {@code jitter} either way, truncated to {@code step}. */
    static List<Reading> jittered(List<Reading> readings, Duration jitter, Duration step, long seed) {
        Random random = new Random(seed);
        List<Reading> result = new ArrayList<>(readings.size());
        long stepNanos = step.toNanos();
        for (Reading reading : readings) {
            long offset = (long) ((random.nextDouble() * 2 - 1) * jitter.toNanos());
            offset -= Math.floorMod(offset, stepNanos);
            result.add(new Reading(reading.channel(), reading.value(), reading.unit(),
                    reading.timestamp().plusNanos(offset), reading.quality(), reading.reason()));
        }
        return result;
    }

    static double quantize(double value, int decimals) {
        double scale = Math.pow(10, decimals);
        return Math.round(value * scale) / scale;
    }

    static Reading good(String channel, double value, Unit unit, Instant at) {
        return Reading.good(channel, value, unit, at);
    }

    static HistoryBlock encode(List<Reading> readings) {
        BlockEncoder encoder = new BlockEncoder(readings.get(0).channel(), readings.get(0).unit());
        readings.forEach(encoder::append);
        return encoder.snapshot();
    }
    /**
     * An oxygen cell at 20.9 %vol with noise of 0.03 %vol behind a 4-20 mA transmitter read as a 16-bit register
     * in µA (scale 0.001) and scaled on 0-25 %vol by the driver's own loop conversion: k/640 give or take an ulp.
     */
    static List<Reading> loopOxygen(long seed) {
        Random random = new Random(seed);
        CurrentLoop loop = new CurrentLoop(0, 25);
        List<Reading> readings = new ArrayList<>(NIGHT);
        for (int t = 0; t < NIGHT; t++) {
            double o2 = 20.9 + random.nextGaussian() * 0.03;
            long register = Math.round(loop.milliampsFor(o2) * 1000);
            readings.add(good("o2_loop", loop.convert(register * 0.001).value(), Unit.PERCENT_VOLUME,
                    DUSK.plusSeconds(t)));
        }
        return readings;
    }

    /** A bath pressure near 1 kPa(g) with noise of 0.05 behind a 4-20 mA loop read as a float32 register in mA. */
    static List<Reading> loopPressure(long seed) {
        Random random = new Random(seed);
        CurrentLoop loop = new CurrentLoop(0, 100);
        List<Reading> readings = new ArrayList<>(NIGHT);
        for (int t = 0; t < NIGHT; t++) {
            float milliamps = (float) loop.milliampsFor(1.0 + random.nextGaussian() * 0.05);
            readings.add(good("p_bath", loop.convert(milliamps).value(), Unit.KILOPASCAL_GAUGE,
                    DUSK.plusSeconds(t)));
        }
        return readings;
    }
}
