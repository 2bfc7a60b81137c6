package org.cryowarden.rules.physics;

/**
 * ODH class of an area from its fatality rate phi per hour. Source: Fermilab ES&H Manual (FESHM) chapter 4240,
 * Oxygen Deficiency Hazards: class 0 below 1e-7 /h, 1 from 1e-7, 2 from 1e-5, 3 from 1e-3, 4 from 1e-1 (each
 * class includes its lower bound). The controls each class requires are the facility's to set.
 */
public enum OdhClass {
    CLASS_0(0, 0),
    CLASS_1(1, 1e-7),
    CLASS_2(2, 1e-5),
    CLASS_3(3, 1e-3),
    CLASS_4(4, 1e-1);

    private final int number;
    private final double fromPerHour;

    OdhClass(int number, double fromPerHour) {
        this.number = number;
        this.fromPerHour = fromPerHour;
    }

    public int number() {
        return number;
    }

    /** The lowest fatality rate of this class, per hour. */
    public double fromPerHour() {
        return fromPerHour;
    }

    /**
     * @throws OutOfRangeException for a negative or non-finite rate
     */
    public static OdhClass of(double fatalityRatePerHour) {
        RangeCheck.nonNegative("fatality rate", fatalityRatePerHour, "/h");
        OdhClass result = CLASS_0;
        for (OdhClass candidate : values()) {
            if (fatalityRatePerHour >= candidate.fromPerHour) {
                result = candidate;
            }
        }
        return result;
    }

    @Override
    public String toString() {
        return "ODH class " + number;
    }
}
