package org.cryowarden.rules.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class BoilOffTest {

    private static final double ATMOSPHERE = 101_325;

    @Test
    void oneWattBoilsAboutOnePointThreeNineLitresOfHeliumPerHour() {
        // Arp & McCarty, NIST TN 1334: rho_l = 125 kg/m3, L = 20.75 kJ/kg -> 1 W boils about 1.39 L/h
        assertThat(BoilOff.liquidLitresPerHour(Cryogen.HELIUM, 1)).isCloseTo(1.39, within(0.005));
    }

    @Test
    void oneWattBoilsAboutTwentyTwoMillilitresOfNitrogenPerHour() {
        // Jacobsen et al., J. Phys. Chem. Ref. Data 15 (1986): rho_l = 806 kg/m3, L = 199 kJ/kg -> about 22 mL/h
        assertThat(BoilOff.liquidLitresPerHour(Cryogen.NITROGEN, 1) * 1000).isCloseTo(22.4, within(0.1));
    }

    @Test
    void gasFlowIsTheLiquidFlowTimesTheExpansionRatio() {
        double liquid = BoilOff.liquidLitresPerHour(Cryogen.HELIUM, 10) / 1000;
        double gas = BoilOff.gasCubicMetresPerHour(Cryogen.HELIUM, 10, 273.15, ATMOSPHERE);
        assertThat(gas).isCloseTo(liquid * GasExpansion.ratio(Cryogen.HELIUM, 273.15, ATMOSPHERE), within(1e-12));
        // 1 L/h of helium -> about 0.70 m3/h at 0 °C (Arp & McCarty, NIST TN 1334: gas 0.1785 kg/m3)
        assertThat(gas).isCloseTo(13.88 * 0.700, within(0.05));
    }

    @Test
    void oneLitreOfLiquidHeliumMakesAboutPointSevenCubicMetresAtZeroCelsius() {
        // Arp & McCarty, NIST TN 1334: 125 kg/m3 liquid, 0.1785 kg/m3 gas at 0 °C, 1 atm -> about 0.70 m3
        assertThat(GasExpansion.gasCubicMetres(Cryogen.HELIUM, 1e-3, 273.15, ATMOSPHERE)).isCloseTo(0.70, within(0.005));
        // same source: 0.166 kg/m3 at 21 °C, 1 atm -> about 0.75 m3
        assertThat(GasExpansion.gasCubicMetres(Cryogen.HELIUM, 1e-3, 294.15, ATMOSPHERE)).isCloseTo(0.75, within(0.005));
    }

    @Test
    void quotedRatiosAreSeventyFahrenheitFigures() {
        // 1:757 helium and 1:694 nitrogen at 70 °F (21.1 °C), cryogen-facility data sheets from TN 1334 and
        // Jacobsen et al. (1986); ideal gas within 0.5 %
        assertThat(GasExpansion.ratio(Cryogen.HELIUM, 294.26, ATMOSPHERE)).isCloseTo(757, within(757 * 0.005));
        assertThat(GasExpansion.ratio(Cryogen.NITROGEN, 294.26, ATMOSPHERE)).isCloseTo(694, within(694 * 0.005));
    }

    @Test
    void idealGasReproducesTheTabulatedDensities() {
        // Arp & McCarty (helium) and Jacobsen et al. (nitrogen), 1 atm: 0.1785 / 0.166 and 1.25 / 1.16 kg/m3
        assertThat(Cryogen.HELIUM.gasDensityKgPerCubicMetre(273.15, ATMOSPHERE)).isCloseTo(0.1785, within(0.0005));
        assertThat(Cryogen.HELIUM.gasDensityKgPerCubicMetre(294.15, ATMOSPHERE)).isCloseTo(0.166, within(0.0005));
        assertThat(Cryogen.NITROGEN.gasDensityKgPerCubicMetre(273.15, ATMOSPHERE)).isCloseTo(1.25, within(0.005));
        assertThat(Cryogen.NITROGEN.gasDensityKgPerCubicMetre(294.15, ATMOSPHERE)).isCloseTo(1.16, within(0.005));
    }

    @Test
    void gasConditionsOutsideTheIdealGasRangeAreRefused() {
        assertThatThrownBy(() -> BoilOff.gasCubicMetresPerHour(Cryogen.HELIUM, 1, 77, ATMOSPHERE))
                .isInstanceOf(OutOfRangeException.class)
                .hasMessage("gas temperature -196.15 °C is outside the range -50 °C to 60 °C of the room-condition "
                        + "gas properties");
        assertThatThrownBy(() -> BoilOff.gasCubicMetresPerHour(Cryogen.HELIUM, 1, 293.15, 300e3))
                .hasMessage("gas pressure 300.000 kPa is outside the range 50 kPa to 200 kPa (absolute) of the "
                        + "room-condition gas properties");
        assertThatThrownBy(() -> BoilOff.liquidLitresPerHour(Cryogen.HELIUM, -1))
                .hasMessage("heat load must not be negative, got -1 W");
    }
}
