package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.util.Random;
import org.junit.jupiter.api.Test;

class TextsTest {

    /** The reference: the double's exact decimal value rounded half up to six digits (java.math.BigDecimal). */
    private static String reference(double value) {
        return new BigDecimal(value).round(new MathContext(6, RoundingMode.HALF_UP)).stripTrailingZeros()
                .toPlainString();
    }

    @Test
    void numbersShowSixSignificantDigitsWithoutTrailingZerosOrExponent() {
        // Plain-text forms as an operator reads them (common practice).
        assertThat(Texts.number(19.4)).isEqualTo("19.4");
        assertThat(Texts.number(0.000125)).isEqualTo("0.000125");
        assertThat(Texts.number(101325)).isEqualTo("101325");
        assertThat(Texts.number(-2.5)).isEqualTo("-2.5");
        assertThat(Texts.number(1234567)).isEqualTo("1234570");
        assertThat(Texts.number(999999.7)).isEqualTo("1000000");
        assertThat(Texts.number(0.1 + 0.2)).isEqualTo("0.3");
        assertThat(Texts.number(0)).isEqualTo("0");
    }

    @Test
    void roundingTiesGoByTheExactBinaryValue() {
        // Exact binary64 values as java.math.BigDecimal expands them: 1.000005 is stored as 1.00000500000000003...,
        // just above the tie, 2.000005 as 2.00000499999999981..., 0.1234565 as 0.12345649999999999...
        assertThat(Texts.number(1.000005)).isEqualTo("1.00001");
        assertThat(Texts.number(2.000005)).isEqualTo("2");
        assertThat(Texts.number(0.1234565)).isEqualTo("0.123456");
        assertThat(Texts.number(1234565)).isEqualTo("1234570");
    }

    @Test
    void everyMagnitudeReadsAsTheExactDecimalRoundingDoes() {
        Random random = new Random(18_2_2016L);
        for (int i = 0; i < 200_000; i++) {
            double value;
            switch (i % 5) {
                case 4 -> {
                    // Whole numbers of digits and decade boundaries, one ulp either side.
                    double whole = (random.nextBoolean() ? 1 : random.nextInt(1_000_001)) * Math.pow(10,
                            random.nextInt(24) - 10);
                    value = switch (random.nextInt(3)) {
                        case 0 -> Math.nextDown(whole);
                        case 1 -> Math.nextUp(whole);
                        default -> whole;
                    };
                }
                case 0 -> value = Double.longBitsToDouble(random.nextLong());
                case 1 -> value = (random.nextDouble() - 0.5) * Math.pow(10, random.nextInt(40) - 20);
                case 2 -> value = Math.round(random.nextDouble() * 1e7) / Math.pow(10, random.nextInt(12));
                default -> value = (random.nextInt(2_000_001) - 1_000_000 + 0.5) / Math.pow(10, random.nextInt(9));
            }
            if (!Double.isFinite(value) || value == 0) {
                continue;
            }
            assertThat(Texts.number(value)).as("%s", value).isEqualTo(reference(value));
        }
    }
}
