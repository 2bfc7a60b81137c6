package org.cryowarden.rules.trend;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

/**
 * The Theil-Sen estimator (Theil 1950; Sen 1968): slope = median of pairwise slopes, intercept = median of
 * y - slope x. Check values worked by hand below each case.
 */
class TheilSenTest {

    @Test
    void exactLineIsRecoveredExactly() {
        // y = 3 - 0.5 x.
        TheilSen.Line line = TheilSen.of(new double[] {0, 1, 2, 3, 4}, new double[] {3, 2.5, 2, 1.5, 1});
        assertThat(line.slope()).isEqualTo(-0.5);
        assertThat(line.intercept()).isEqualTo(3.0);
    }

    @Test
    void oneWildPointDoesNotMoveTheSlope() {
        // Points of y = x with (2, 100) instead of (2, 2). Pairwise slopes: (0,1) 1, (0,2) 50, (0,3) 1, (0,4) 1,
        // (1,2) 98, (1,3) 1, (1,4) 1, (2,3) -97, (2,4) -48, (3,4) 1: sorted -97 -48 1 1 1 1 1 1 50 98, median 1.
        // Residuals y - x: 0 0 98 0 0, median 0.
        TheilSen.Line line = TheilSen.of(new double[] {0, 1, 2, 3, 4}, new double[] {0, 1, 100, 3, 4});
        assertThat(line.slope()).isEqualTo(1.0);
        assertThat(line.intercept()).isEqualTo(0.0);
    }

    @Test
    void evenCountTakesTheMeanOfTheTwoMiddleSlopes() {
        // (0,0) (1,1) (2,4): slopes 1, 2, 3 -> median 2. Residuals 0, -1, 0 -> median 0.
        TheilSen.Line three = TheilSen.of(new double[] {0, 1, 2}, new double[] {0, 1, 4});
        assertThat(three.slope()).isEqualTo(2.0);
        assertThat(three.intercept()).isEqualTo(0.0);
        // Medians of an even count: the mean of the middle two.
        assertThat(TheilSen.medianOf(4, 1, 3, 2)).isEqualTo(2.5);
        assertThat(TheilSen.medianOf(7)).isEqualTo(7.0);
        assertThat(TheilSen.medianOf(5, 5, 5, 1, 9, 5)).isEqualTo(5.0);
    }

    @Test
    void pointsAtOneInstantHaveNoSlope() {
        assertThat(TheilSen.of(new double[] {1, 1}, new double[] {2, 3})).isNull();
    }

    @Test
    void mediansMatchASortOnAwkwardInputs() {
        // Against the definition: sort and take the middle (mean of the two middle for even counts).
        double[] values = new double[101];
        for (int i = 0; i < values.length; i++) {
            values[i] = ((i * 37) % 101) / 7.0 - (i % 3 == 0 ? 5 : 0);
        }
        double[] sorted = values.clone();
        java.util.Arrays.sort(sorted);
        assertThat(TheilSen.medianOf(values)).isEqualTo(sorted[50]);
        double[] even = java.util.Arrays.copyOf(values, 100);
        double[] evenSorted = even.clone();
        java.util.Arrays.sort(evenSorted);
        assertThat(TheilSen.medianOf(even)).isCloseTo((evenSorted[49] + evenSorted[50]) / 2, within(0.0));
    }
}
