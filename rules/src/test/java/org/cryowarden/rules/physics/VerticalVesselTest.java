package org.cryowarden.rules.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class VerticalVesselTest {

    @Test
    void flatBottomIsAPlainCylinder() {
        VerticalVessel vessel = VerticalVessel.flatBottom(0.5, 1.0);
        assertThat(vessel.volumeCubicMetres(0.4)).isCloseTo(Math.PI * 0.25 * 0.25 * 0.4, within(1e-15));
        assertThat(vessel.capacityCubicMetres()).isCloseTo(Math.PI * 0.0625, within(1e-15));
    }

    @Test
    void hemisphericalBottomHoldsTwoThirdsPiRCubed() {
        // sphere-cap volume pi h^2 (3a - h) / 3, elementary geometry (common practice)
        VerticalVessel vessel = VerticalVessel.hemisphericalBottom(0.6, 1.0);
        double a = 0.3;
        assertThat(vessel.volumeCubicMetres(a)).isCloseTo(2.0 / 3 * Math.PI * a * a * a, within(1e-14));
        assertThat(vessel.volumeCubicMetres(0.1)).isCloseTo(Math.PI * 0.01 * (3 * a - 0.1) / 3, within(1e-14));
        assertThat(vessel.volumeCubicMetres(0.8)).isCloseTo(2.0 / 3 * Math.PI * a * a * a + Math.PI * a * a * 0.5,
                within(1e-14));
    }

    @Test
    void asmeFlangedAndDishedHeadHasTheHandbookDepthAndVolume() {
        // ASME F&D (crown = D, knuckle = 0.06 D): depth about 0.1693 D and volume about 0.0809 D^3
        // (pressure-vessel handbook figures, from memory)
        VerticalVessel vessel = VerticalVessel.asmeFlangedAndDishedBottom(1.0, 2.0);
        assertThat(vessel.headDepthMetres()).isCloseTo(0.1693, within(0.0005));
        assertThat(vessel.volumeCubicMetres(vessel.headDepthMetres())).isCloseTo(0.0809, within(0.0005));
    }

    @Test
    void volumeAndSurfaceAreaAreContinuousAtTheKnuckleAndShellTangentLines() {
        VerticalVessel vessel = VerticalVessel.asmeFlangedAndDishedBottom(0.8, 1.2);
        for (double line : new double[] {vessel.crownTopMetres(), vessel.headDepthMetres()}) {
            double eps = 1e-9;
            double below = vessel.volumeCubicMetres(line - eps);
            double above = vessel.volumeCubicMetres(line + eps);
            assertThat(above - below).isBetween(0.0, 2 * eps * vessel.surfaceAreaSquareMetres(line) * 1.0001);
            assertThat(vessel.surfaceAreaSquareMetres(line - eps))
                    .isCloseTo(vessel.surfaceAreaSquareMetres(line + eps), within(1e-6));
        }
    }

    @Test
    void volumeIsTheIntegralOfTheSurfaceArea() {
        VerticalVessel vessel = VerticalVessel.torisphericalBottom(1.2, 1.0, 1.0, 0.15);
        int steps = 200_000;
        double dh = vessel.totalHeightMetres() / steps;
        double sum = 0;
        for (int i = 0; i < steps; i++) {
            sum += vessel.surfaceAreaSquareMetres((i + 0.5) * dh) * dh;
        }
        assertThat(vessel.capacityCubicMetres()).isCloseTo(sum, within(1e-8));
    }

    @Test
    void heightToVolumeToHeightRoundTripsInEveryZone() {
        for (VerticalVessel vessel : new VerticalVessel[] {
            VerticalVessel.flatBottom(0.5, 1.0),
            VerticalVessel.hemisphericalBottom(0.5, 1.0),
            VerticalVessel.asmeFlangedAndDishedBottom(0.5, 1.0)}) {
            for (int step = 0; step <= 10_000; step++) {
                double h = vessel.totalHeightMetres() * step / 10_000.0;
                assertThat(vessel.heightMetres(vessel.volumeCubicMetres(h))).isCloseTo(h, within(2e-9));
            }
        }
    }

    @Test
    void outsideTheVesselIsRefused() {
        VerticalVessel vessel = VerticalVessel.flatBottom(0.5, 1.0);
        assertThatThrownBy(() -> vessel.volumeCubicMetres(1.2))
                .isInstanceOf(OutOfRangeException.class)
                .hasMessage("liquid height 1.2 m is outside 0 m to 1 m (bottom to top of the straight shell)");
        assertThatThrownBy(() -> vessel.heightMetres(1))
                .hasMessage("liquid volume 1000 L is outside 0 L to 196.35 L (the capacity)");
        assertThatThrownBy(() -> VerticalVessel.torisphericalBottom(1.0, 1.0, 0.4, 0.1))
                .hasMessage("a torispherical head needs 0 < knuckle radius < diameter/2 <= crown radius, got diameter 1 m, "
                        + "crown radius 0.4 m, knuckle radius 0.1 m");
    }
}
