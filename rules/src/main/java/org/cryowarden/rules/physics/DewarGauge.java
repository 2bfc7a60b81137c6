package org.cryowarden.rules.physics;

import java.util.Objects;

/**
 * A level probe in a vessel: a reading in % of the probe's active length gives the liquid height (the probe's
 * bottom offset plus that fraction of its active length), and the vessel's geometry gives the litres at that
 * height. The same chain as the derived functions {@code probe_percent_height} and {@code litres_*}, for callers
 * outside the engine (the morning report's consumption figures). Geometry: see {@link VerticalVessel}.
 *
 * @param activeLengthMetres the probe's active (sensing) length
 * @param bottomOffsetMetres height of the probe's lowest sensing point above the vessel's lowest point
 */
public record DewarGauge(double activeLengthMetres, double bottomOffsetMetres, VerticalVessel vessel) {

    public DewarGauge {
        RangeCheck.positive("probe active length", activeLengthMetres, "m");
        RangeCheck.nonNegative("probe bottom offset", bottomOffsetMetres, "m");
        Objects.requireNonNull(vessel, "vessel");
    }

    /** Liquid height above the vessel's lowest point at a probe reading in %. */
    public double heightMetres(double percent) {
        RangeCheck.finite("level", percent);
        if (percent < 0 || percent > 100) {
            throw new OutOfRangeException("level " + RangeCheck.format(percent)
                    + " % is outside the probe's 0 to 100 %");
        }
        return bottomOffsetMetres + percent / 100.0 * activeLengthMetres;
    }

    /** Litres of liquid at a probe reading in %. */
    public double litres(double percent) {
        return vessel.volumeCubicMetres(heightMetres(percent)) * 1000.0;
    }
}
