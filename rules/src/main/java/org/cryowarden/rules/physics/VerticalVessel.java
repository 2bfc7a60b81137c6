package org.cryowarden.rules.physics;

/**
 * Liquid volume in a vertical cylindrical vessel (a dewar's inner vessel) as a function of the liquid height
 * measured from the lowest point of its bottom, and back: flat, hemispherical or torispherical bottom, then a
 * straight cylindrical shell. The volume is the integral of the exact cross-section area over height, in
 * closed form per zone (crown, knuckle, shell), so height and volume are continuous and smooth across the
 * crown-knuckle and knuckle-shell tangent lines. Geometry: common practice; the ASME flanged-and-dished
 * proportions (crown radius = diameter, knuckle radius = 6 % of diameter) follow the ASME Boiler and Pressure
 * Vessel Code, Section VIII Division 1, UG-32, applied here to the inside diameter.
 *
 * <p>Lengths in metres, volumes in m3. Heights above the top of the shell are refused (the top head is not
 * modelled: a dewar is never filled into it).
 */
public final class VerticalVessel {

    private final VesselHead head;
    private final double radius;
    private final double straightLength;
    private final double crownRadius;
    private final double knuckleRadius;
    /** Height of the crown-knuckle tangent line above the lowest point. */
    private final double crownTop;
    /** Height of the knuckle-shell tangent line (the head depth). */
    private final double headDepth;
    private final double headVolume;

    private VerticalVessel(VesselHead head, double diameter, double straightLength, double crownRadius,
            double knuckleRadius) {
        this.head = head;
        this.radius = RangeCheck.positive("vessel diameter", diameter, "m") / 2;
        this.straightLength = RangeCheck.nonNegative("straight shell length", straightLength, "m");
        this.crownRadius = crownRadius;
        this.knuckleRadius = knuckleRadius;
        switch (head) {
            case FLAT:
                crownTop = 0;
                headDepth = 0;
                break;
            case HEMISPHERICAL:
                crownTop = radius;
                headDepth = radius;
                break;
            case TORISPHERICAL:
            default:
                double centreDistance = Math.sqrt(sq(crownRadius - knuckleRadius) - sq(radius - knuckleRadius));
                headDepth = crownRadius - centreDistance;
                crownTop = crownRadius - crownRadius * centreDistance / (crownRadius - knuckleRadius);
                break;
        }
        this.headVolume = headVolumeBelow(headDepth);
    }

    public static VerticalVessel flatBottom(double diameter, double straightLength) {
        return new VerticalVessel(VesselHead.FLAT, diameter, straightLength, 0, 0);
    }

    public static VerticalVessel hemisphericalBottom(double diameter, double straightLength) {
        return new VerticalVessel(VesselHead.HEMISPHERICAL, diameter, straightLength, diameter / 2, diameter / 2);
    }

    /**
     * A torispherical bottom with a stated crown and knuckle radius.
     *
     * @throws OutOfRangeException unless 0 &lt; knuckle radius &lt; diameter / 2 &lt;= crown radius
     */
    public static VerticalVessel torisphericalBottom(double diameter, double straightLength, double crownRadius,
            double knuckleRadius) {
        RangeCheck.positive("vessel diameter", diameter, "m");
        RangeCheck.positive("knuckle radius", knuckleRadius, "m");
        RangeCheck.finite("crown radius", crownRadius);
        if (knuckleRadius >= diameter / 2 || crownRadius < diameter / 2) {
            throw new OutOfRangeException("a torispherical head needs 0 < knuckle radius < diameter/2 <= crown radius, got "
                    + "diameter " + RangeCheck.format(diameter) + " m, crown radius " + RangeCheck.format(crownRadius)
                    + " m, knuckle radius " + RangeCheck.format(knuckleRadius) + " m");
        }
        return new VerticalVessel(VesselHead.TORISPHERICAL, diameter, straightLength, crownRadius, knuckleRadius);
    }

    /** ASME flanged-and-dished proportions: crown radius = diameter, knuckle radius = 0.06 diameter. */
    public static VerticalVessel asmeFlangedAndDishedBottom(double diameter, double straightLength) {
        return torisphericalBottom(diameter, straightLength, diameter, 0.06 * diameter);
    }

    public VesselHead head() {
        return head;
    }

    /** Depth of the bottom head (0 for a flat bottom). */
    public double headDepthMetres() {
        return headDepth;
    }

    /** Height of the crown-knuckle tangent line (equal to the head depth for a hemisphere, 0 for flat). */
    public double crownTopMetres() {
        return crownTop;
    }

    /** Height from the lowest point to the top of the straight shell. */
    public double totalHeightMetres() {
        return headDepth + straightLength;
    }

    /** Volume when filled to the top of the straight shell. */
    public double capacityCubicMetres() {
        return headVolume + Math.PI * radius * radius * straightLength;
    }

    /**
     * Liquid volume at a height above the lowest point.
     *
     * @throws OutOfRangeException below 0 or above the top of the shell
     */
    public double volumeCubicMetres(double heightMetres) {
        RangeCheck.finite("liquid height", heightMetres);
        if (heightMetres < 0 || heightMetres > totalHeightMetres()) {
            throw new OutOfRangeException("liquid height " + RangeCheck.format(heightMetres) + " m is outside 0 m to "
                    + RangeCheck.format(totalHeightMetres()) + " m (bottom to top of the straight shell)");
        }
        if (heightMetres <= headDepth) {
            return headVolumeBelow(heightMetres);
        }
        return headVolume + Math.PI * radius * radius * (heightMetres - headDepth);
    }

    /**
     * Liquid height for a volume (the inverse of {@link #volumeCubicMetres}), to 1 nm.
     *
     * @throws OutOfRangeException below 0 or above the capacity
     */
    public double heightMetres(double volumeCubicMetres) {
        RangeCheck.finite("liquid volume", volumeCubicMetres);
        if (volumeCubicMetres < 0 || volumeCubicMetres > capacityCubicMetres()) {
            throw new OutOfRangeException("liquid volume " + RangeCheck.format(volumeCubicMetres * 1000)
                    + " L is outside 0 L to " + RangeCheck.format(capacityCubicMetres() * 1000) + " L (the capacity)");
        }
        if (volumeCubicMetres >= headVolume) {
            return Math.min(totalHeightMetres(), headDepth + (volumeCubicMetres - headVolume) / (Math.PI * radius * radius));
        }
        double lo = 0;
        double hi = headDepth;
        while (hi - lo > 1e-9) {
            double mid = 0.5 * (lo + hi);
            if (headVolumeBelow(mid) < volumeCubicMetres) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return 0.5 * (lo + hi);
    }

    /** Cross-section area of the liquid surface at a height (continuous: the zones meet tangentially). */
    public double surfaceAreaSquareMetres(double heightMetres) {
        double h = heightMetres;
        if (h >= headDepth) {
            return Math.PI * radius * radius;
        }
        if (h <= crownTop) {
            return Math.PI * (2 * crownRadius * h - h * h);
        }
        double u = headDepth - h;
        double r = radius - knuckleRadius + Math.sqrt(sq(knuckleRadius) - u * u);
        return Math.PI * r * r;
    }

    /** Volume of the head below height h (0 <= h <= head depth), in closed form. */
    private double headVolumeBelow(double h) {
        if (head == VesselHead.FLAT) {
            return 0;
        }
        double crownHeight = Math.min(h, crownTop);
        double volume = Math.PI * (crownRadius * crownHeight * crownHeight - crownHeight * crownHeight * crownHeight / 3);
        if (h > crownTop) {
            // knuckle: r(z) = c + sqrt(k^2 - u^2), u = headDepth - z, integrated from u(h) up to u(crownTop)
            volume += knuckleIntegral(headDepth - crownTop) - knuckleIntegral(headDepth - h);
        }
        return volume;
    }

    /** Antiderivative in u of pi (c + sqrt(k^2 - u^2))^2, c = radius - knuckle radius. */
    private double knuckleIntegral(double u) {
        double c = radius - knuckleRadius;
        double k = knuckleRadius;
        double root = Math.sqrt(Math.max(0, k * k - u * u));
        double circleArea = 0.5 * (u * root + k * k * Math.asin(Math.min(1, u / k)));
        return Math.PI * (c * c * u + 2 * c * circleArea + k * k * u - u * u * u / 3);
    }

    private static double sq(double x) {
        return x * x;
    }
}
