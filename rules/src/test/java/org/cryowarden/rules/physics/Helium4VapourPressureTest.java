package org.cryowarden.rules.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class Helium4VapourPressureTest {

    @Test
    void normalBoilingPointIsAt4point2221Kelvin() {
        // ITS-90 (Preston-Thomas, Metrologia 27 (1990)): 101 325 Pa gives 4.2221 K for helium-4
        HeliumSaturation bath = Helium4VapourPressure.temperature(101_325);
        assertThat(bath.temperatureKelvin()).isCloseTo(4.2221, within(0.00005));
        assertThat(bath.phase()).isEqualTo(HeliumPhase.HE_I);
    }

    @Test
    void lambdaPointIsNear5point04Kilopascal() {
        // ITS-90 (Metrologia 27 (1990)): the lambda point 2.1768 K where both helium-4 ranges meet, about 5.04 kPa
        assertThat(Helium4VapourPressure.LAMBDA_PASCAL).isCloseTo(5040, within(5.0));
        assertThat(Helium4VapourPressure.pressure(2.1768)).isCloseTo(Helium4VapourPressure.LAMBDA_PASCAL, within(1e-6));
    }

    @Test
    void bothRangesAgreeAtTheLambdaPointWithinATenthOfAMillikelvin() {
        // ITS-90: the two helium-4 equations are continuous at 2.1768 K; requirement 0.1 mK
        double p = Helium4VapourPressure.LAMBDA_PASCAL;
        double lower = Helium4VapourPressure.LOWER.temperature(p);
        double upper = Helium4VapourPressure.UPPER.temperature(p);
        assertThat(lower - upper).isCloseTo(0, within(1e-4));
        assertThat(upper).isCloseTo(2.1768, within(1e-9));
        double justBelow = Helium4VapourPressure.temperature(Math.nextDown(p)).temperatureKelvin();
        double at = Helium4VapourPressure.temperature(p).temperatureKelvin();
        assertThat(Math.abs(justBelow - at)).isLessThan(1e-4);
    }

    @Test
    void phaseIsHeliumTwoBelowTheLambdaPressureAndHeliumOneAtIt() {
        double p = Helium4VapourPressure.LAMBDA_PASCAL;
        assertThat(Helium4VapourPressure.temperature(p * 0.999).phase()).isEqualTo(HeliumPhase.HE_II);
        assertThat(Helium4VapourPressure.temperature(p).phase()).isEqualTo(HeliumPhase.HE_I);
        assertThat(Helium4VapourPressure.phase(2.1767)).isEqualTo(HeliumPhase.HE_II);
        assertThat(Helium4VapourPressure.phase(2.1768)).isEqualTo(HeliumPhase.HE_I);
        assertThat(HeliumPhase.HE_II.label()).isEqualTo("He II");
    }

    @Test
    void pressureToTemperatureToPressureRoundTripsOverTheWholeRange() {
        // inversion target from the task: 0.01 mK; tested on a 0.1 mK grid over 1.25 K to 5.0 K
        for (int step = 0; step <= 37_500; step++) {
            double kelvin = Math.min(1.25 + step * 1e-4, 5.0);
            double pascal = Helium4VapourPressure.pressure(kelvin);
            double back = Helium4VapourPressure.temperature(pascal).temperatureKelvin();
            assertThat(back).as("T at %s K", kelvin).isCloseTo(kelvin, within(kelvin < 2.1768 ? 1e-5 : 1e-8));
        }
    }

    @Test
    void temperatureRisesMonotonicallyWithPressure() {
        double previous = 0;
        for (int step = 0; step <= 10_000; step++) {
            double pascal = Helium4VapourPressure.MIN_PASCAL
                    * Math.pow(Helium4VapourPressure.MAX_PASCAL / Helium4VapourPressure.MIN_PASCAL, step / 10_000.0);
            double kelvin = Helium4VapourPressure.temperature(Math.min(pascal, Helium4VapourPressure.MAX_PASCAL))
                    .temperatureKelvin();
            assertThat(kelvin).isGreaterThan(previous);
            previous = kelvin;
        }
    }

    @Test
    void rangeEndsAreAcceptedExactly() {
        assertThat(Helium4VapourPressure.temperature(Helium4VapourPressure.MIN_PASCAL).temperatureKelvin())
                .isCloseTo(1.25, within(1e-9));
        assertThat(Helium4VapourPressure.temperature(Helium4VapourPressure.MAX_PASCAL).temperatureKelvin())
                .isCloseTo(5.0, within(1e-9));
        assertThat(Helium4VapourPressure.MIN_PASCAL).isCloseTo(114.73, within(0.01));
        assertThat(Helium4VapourPressure.MAX_PASCAL).isCloseTo(196_016.5, within(0.1));
    }

    @Test
    void pressureOutsideTheRangeIsRefusedWithTheRange() {
        assertThatThrownBy(() -> Helium4VapourPressure.temperature(250_000))
                .isInstanceOf(OutOfRangeException.class)
                .hasMessage("pressure 250.000 kPa is outside the ITS-90 helium-4 vapour-pressure range 114.73 Pa to "
                        + "196.017 kPa (1.25 K to 5.0 K)");
        assertThatThrownBy(() -> Helium4VapourPressure.temperature(Helium4VapourPressure.MIN_PASCAL * (1 - 1e-9)))
                .isInstanceOf(OutOfRangeException.class);
        assertThatThrownBy(() -> Helium4VapourPressure.temperature(Double.NaN))
                .hasMessage("helium-4 vapour pressure must be a finite number, got NaN");
    }

    @Test
    void conversionRoundingAtARangeEndIsNotAnError() {
        // 5 K written as 5000 mK or reached through a unit conversion may land an ulp outside
        assertThat(Helium4VapourPressure.pressure(Math.nextUp(5.0))).isEqualTo(Helium4VapourPressure.pressure(5.0));
        assertThat(Helium4VapourPressure.temperature(Math.nextUp(Helium4VapourPressure.MAX_PASCAL)).temperatureKelvin())
                .isCloseTo(5.0, within(1e-9));
    }

    @Test
    void temperatureOutsideTheRangeIsRefusedWithTheRange() {
        assertThatThrownBy(() -> Helium4VapourPressure.pressure(5.2))
                .isInstanceOf(OutOfRangeException.class)
                .hasMessage("temperature 5.2 K is outside the ITS-90 helium-4 vapour-pressure range 1.25 K to 5.0 K");
        assertThatThrownBy(() -> Helium4VapourPressure.pressure(1.2499999))
                .isInstanceOf(OutOfRangeException.class);
    }
}
