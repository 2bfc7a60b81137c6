package org.cryowarden.simulator;

/**
 * How fast simulated time runs against real time: {@code speed} simulated seconds per real second, or as fast as
 * the machine can step ({@link #FAST}).
 */
public record Pace(double speed) {

    public static final Pace FAST = new Pace(Double.POSITIVE_INFINITY);

    public Pace {
        if (!(speed > 0)) {
            throw new IllegalArgumentException("speed must be positive, got " + speed);
        }
    }

    public static Pace realTime() {
        return new Pace(1);
    }

    public static Pace times(double speed) {
        return new Pace(speed);
    }

    public boolean isFast() {
        return Double.isInfinite(speed);
    }
}
