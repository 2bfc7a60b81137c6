package org.cryowarden.rules.physics;

/** Prints a pressure in the unit a person would choose for its size (Pa below 1 kPa, kPa above). */
final class Pressures {

    private Pressures() {
    }

    static String describe(double pascal) {
        if (Math.abs(pascal) < 1000) {
            return RangeCheck.fixed(pascal, 2) + " Pa";
        }
        return RangeCheck.fixed(pascal / 1000, 3) + " kPa";
    }
}
