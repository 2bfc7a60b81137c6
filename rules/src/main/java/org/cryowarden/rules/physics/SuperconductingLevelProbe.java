package org.cryowarden.rules.physics;

/**
 * A superconducting wire level probe: the part of the wire below the liquid is superconducting (zero
 * resistance) and the part above is normal, so the measured resistance falls linearly as the liquid rises:
 * {@code submerged fraction = 1 - R / R_full}, with R_full the resistance of the whole active length in the
 * cold vapour. Common practice (the principle of every helium level meter); no published table is involved.
 *
 * <p>In He II the superfluid film climbs the wire and cools it, so the probe can read high below 2.1768 K.
 */
public final class SuperconductingLevelProbe {

    private final double fullResistanceOhm;
    private final double activeLengthMetres;
    private final double bottomOffsetMetres;

    /**
     * @param fullResistanceOhm  resistance of the whole active length when none of it is submerged
     * @param activeLengthMetres the sensitive length of the wire
     * @param bottomOffsetMetres height of the lower end of the active length above the vessel's lowest point
     */
    public SuperconductingLevelProbe(double fullResistanceOhm, double activeLengthMetres, double bottomOffsetMetres) {
        this.fullResistanceOhm = RangeCheck.positive("probe full-length resistance", fullResistanceOhm, "ohm");
        this.activeLengthMetres = RangeCheck.positive("probe active length", activeLengthMetres, "m");
        this.bottomOffsetMetres = RangeCheck.nonNegative("probe bottom offset", bottomOffsetMetres, "m");
    }

    /**
     * Submerged fraction of the active length, 0 to 1.
     *
     * @throws OutOfRangeException for a resistance below 0 or above the full-length resistance (an open or
     *                             mis-configured probe), or NaN
     */
    public double submergedFraction(double measuredOhm) {
        RangeCheck.finite("probe resistance", measuredOhm);
        if (measuredOhm < 0 || measuredOhm > fullResistanceOhm) {
            throw new OutOfRangeException("probe resistance " + RangeCheck.format(measuredOhm)
                    + " ohm is outside 0 ohm to " + RangeCheck.format(fullResistanceOhm)
                    + " ohm (the full-length resistance)");
        }
        return 1 - measuredOhm / fullResistanceOhm;
    }

    /** Liquid height above the vessel's lowest point, in metres (the probe's bottom offset plus the wetted length). */
    public double liquidHeightMetres(double measuredOhm) {
        return bottomOffsetMetres + submergedFraction(measuredOhm) * activeLengthMetres;
    }

    public double fullResistanceOhm() {
        return fullResistanceOhm;
    }

    public double activeLengthMetres() {
        return activeLengthMetres;
    }

    public double bottomOffsetMetres() {
        return bottomOffsetMetres;
    }
}
