package org.cryowarden.rules.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class ChebyshevSeriesTest {

    private static final double[] COEFFICIENTS = {5.5, -3.2, 0.41, -0.07, 0.012, -0.002};

    @Test
    void equalsTheDefinitionCosineOfIArccos() {
        // T_i(k) = cos(i arccos k), Abramowitz & Stegun 22.3.15; k scaled from Z in [ZL, ZU]
        ChebyshevSeries series = new ChebyshevSeries(2.0, 3.5, COEFFICIENTS, ChebyshevVariable.LOG10_RAW);
        for (double z = 2.0; z <= 3.5; z += 0.01) {
            double k = ((z - 2.0) - (3.5 - z)) / 1.5;
            double expected = 0;
            for (int i = 0; i < COEFFICIENTS.length; i++) {
                expected += COEFFICIENTS[i] * Math.cos(i * Math.acos(Math.max(-1, Math.min(1, k))));
            }
            assertThat(series.value(Math.pow(10, Math.min(z, 3.5)))).isCloseTo(expected, within(1e-9));
        }
    }

    @Test
    void rangeEndsMapToMinusOneAndOne() {
        // T_i(1) = 1 and T_i(-1) = (-1)^i (Abramowitz & Stegun 22.4)
        ChebyshevSeries series = new ChebyshevSeries(0.5, 1.7, COEFFICIENTS, ChebyshevVariable.RAW);
        double sum = 0;
        double alternating = 0;
        for (int i = 0; i < COEFFICIENTS.length; i++) {
            sum += COEFFICIENTS[i];
            alternating += (i % 2 == 0 ? 1 : -1) * COEFFICIENTS[i];
        }
        assertThat(series.value(1.7)).isCloseTo(sum, within(1e-12));
        assertThat(series.value(0.5)).isCloseTo(alternating, within(1e-12));
    }

    @Test
    void outsideTheFitRangeIsRefused() {
        ChebyshevSeries series = new ChebyshevSeries(2.0, 3.5, COEFFICIENTS, ChebyshevVariable.LOG10_RAW);
        assertThatThrownBy(() -> series.value(10_000))
                .isInstanceOf(OutOfRangeException.class)
                .hasMessage("log10 of the reading 4 is outside the Chebyshev fit range 2 to 3.5");
        assertThatThrownBy(() -> series.value(-1))
                .hasMessage("raw value -1 must be positive for a series in log10 of the reading");
    }
}
