package org.cryowarden.rules.physics;

import java.util.OptionalDouble;

/**
 * Oxygen fraction in a perfectly mixed room while an inert gas is released into it and after the release
 * ends. Source: Fermilab ES&H Manual (FESHM) chapter 4240, Oxygen Deficiency Hazards, perfect-mixing
 * solutions, with room volume V, release rate R and ventilation rate Q:
 * <ul>
 *   <li>supply fan: C(t) = 0.21 [Q + R e^(-(Q+R) t / V)] / (Q + R), steady state 0.21 Q / (Q + R);</li>
 *   <li>exhaust fan, Q &gt; R: C(t) = 0.21 [1 - (R/Q)(1 - e^(-Q t / V))], steady state 0.21 (1 - R/Q);</li>
 *   <li>exhaust fan with Q &lt;= R, or no ventilation: C(t) = 0.21 e^(-R t / V);</li>
 *   <li>after the release ends at t_e: C(t) = 0.21 - (0.21 - C_e) e^(-Q (t - t_e) / V).</li>
 * </ul>
 * An instantaneous spill of gas volume V_g is the limit of the no-ventilation solution with R t = V_g, so
 * C = 0.21 e^(-V_g / V) right after it (derived here from the manual's solution, not quoted from it), then the
 * recovery above. Oxygen fractions are by volume; 0.21 is the manual's value for air.
 *
 * <p>Times are in seconds, volumes in m3, rates in m3/s of gas at room conditions. This is an estimate for
 * planning, not a substitute for fixed oxygen monitors.
 */
public final class OxygenDilution {

    /** Oxygen fraction of fresh air used by the FESHM 4240 solutions. */
    public static final double AIR_OXYGEN_FRACTION = 0.21;

    private final double roomVolume;
    private final double releaseRate;
    private final double ventilationRate;
    private final Ventilation ventilation;
    private final double releaseSeconds;
    /** Oxygen fraction at the start of the recovery; for a spill the state just after it. */
    private final double fractionAtEnd;
    private final boolean spill;

    private OxygenDilution(double roomVolume, double releaseRate, double ventilationRate, Ventilation ventilation,
            double releaseSeconds, boolean spill, double spillGas) {
        this.roomVolume = roomVolume;
        this.releaseRate = releaseRate;
        this.ventilationRate = ventilationRate;
        this.ventilation = ventilation;
        this.releaseSeconds = releaseSeconds;
        this.spill = spill;
        this.fractionAtEnd = spill
                ? AIR_OXYGEN_FRACTION * Math.exp(-spillGas / roomVolume)
                : duringRelease(releaseSeconds);
    }

    /**
     * A release at a steady rate for a stated time ({@code Double.POSITIVE_INFINITY} for one that goes on).
     *
     * @throws OutOfRangeException for a room volume that is not positive, a negative rate or duration, or a
     *                             ventilation rate with {@link Ventilation#NONE}
     */
    public static OxygenDilution release(double roomCubicMetres, double releaseCubicMetresPerSecond,
            Ventilation ventilation, double ventilationCubicMetresPerSecond, double durationSeconds) {
        checkRoom(roomCubicMetres, ventilation, ventilationCubicMetresPerSecond);
        RangeCheck.nonNegative("release rate", releaseCubicMetresPerSecond, "m3/s");
        if (Double.isNaN(durationSeconds) || durationSeconds < 0) {
            throw new OutOfRangeException("release duration must not be negative, got " + durationSeconds + " s");
        }
        return new OxygenDilution(roomCubicMetres, releaseCubicMetresPerSecond, ventilationCubicMetresPerSecond,
                ventilation, durationSeconds, false, 0);
    }

    /**
     * An instantaneous release of {@code gasCubicMetres} (a spilled liquid, already expanded to room conditions)
     * at time 0, followed by recovery under the stated ventilation.
     */
    public static OxygenDilution spill(double roomCubicMetres, double gasCubicMetres, Ventilation ventilation,
            double ventilationCubicMetresPerSecond) {
        checkRoom(roomCubicMetres, ventilation, ventilationCubicMetresPerSecond);
        RangeCheck.nonNegative("spilled gas volume", gasCubicMetres, "m3");
        return new OxygenDilution(roomCubicMetres, 0, ventilationCubicMetresPerSecond, ventilation, 0, true,
                gasCubicMetres);
    }

    private static void checkRoom(double room, Ventilation ventilation, double q) {
        RangeCheck.positive("room volume", room, "m3");
        RangeCheck.nonNegative("ventilation rate", q, "m3/s");
        if (ventilation == Ventilation.NONE && q != 0) {
            throw new OutOfRangeException("a ventilation rate of " + RangeCheck.format(q)
                    + " m3/s needs a supply or exhaust fan; with no ventilation the rate is 0");
        }
    }

    /** The oxygen fraction (0.21 = fresh air) at {@code seconds} after the release began. */
    public double fractionAt(double seconds) {
        if (Double.isNaN(seconds) || seconds < 0) {
            throw new OutOfRangeException("time must not be negative, got " + seconds + " s");
        }
        if (!spill && seconds <= releaseSeconds) {
            return duringRelease(seconds);
        }
        double sinceEnd = seconds - releaseSeconds;
        return AIR_OXYGEN_FRACTION - (AIR_OXYGEN_FRACTION - fractionAtEnd)
                * Math.exp(-ventilationRate * sinceEnd / roomVolume);
    }

    /** The lowest fraction reached: at the end of the release (the steady state for one that never ends). */
    public double minimumFraction() {
        return fractionAtEnd;
    }

    /** When the minimum is reached, seconds after the start; infinite for a release that never ends. */
    public double timeOfMinimumSeconds() {
        return releaseSeconds;
    }

    /** The fraction the room tends to while the release goes on; empty for a spill. */
    public OptionalDouble steadyStateFraction() {
        if (spill) {
            return OptionalDouble.empty();
        }
        return OptionalDouble.of(duringRelease(Double.POSITIVE_INFINITY));
    }

    /** The time constant of the release phase, V over the rate in the exponent, in seconds. */
    public double releaseTimeConstantSeconds() {
        return roomVolume / exponentRate();
    }

    public boolean isSpill() {
        return spill;
    }

    private double exponentRate() {
        switch (ventilation) {
            case SUPPLY:
                return ventilationRate + releaseRate;
            case EXHAUST:
                return ventilationRate > releaseRate ? ventilationRate : releaseRate;
            case NONE:
            default:
                return releaseRate;
        }
    }

    private double duringRelease(double t) {
        double q = ventilationRate;
        double r = releaseRate;
        double v = roomVolume;
        if (r == 0) {
            return AIR_OXYGEN_FRACTION;
        }
        if (ventilation == Ventilation.SUPPLY) {
            double decay = Double.isInfinite(t) ? 0 : Math.exp(-(q + r) * t / v);
            return AIR_OXYGEN_FRACTION * (q + r * decay) / (q + r);
        }
        if (ventilation == Ventilation.EXHAUST && q > r) {
            double decay = Double.isInfinite(t) ? 0 : Math.exp(-q * t / v);
            return AIR_OXYGEN_FRACTION * (1 - (r / q) * (1 - decay));
        }
        return Double.isInfinite(t) ? 0 : AIR_OXYGEN_FRACTION * Math.exp(-r * t / v);
    }
}
