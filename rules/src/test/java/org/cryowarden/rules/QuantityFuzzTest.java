package org.cryowarden.rules;

import static org.assertj.core.api.Assertions.assertThat;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.nio.charset.StandardCharsets;
import java.time.Duration;

/**
 * Coverage-guided fuzzing with Jazzer of the two value syntaxes of every file and command: a quantity parses
 * to a finite number with a unit, or is refused with an {@link IllegalArgumentException} that says what was
 * wrong; a duration parses to at most 100 years, or is refused likewise. Nothing else is thrown and no text
 * takes long (a fuzzing run gives each input 10 s: -timeout=10).
 */
class QuantityFuzzTest {

    private static final Duration HUNDRED_YEARS = Duration.ofSeconds((long) (100 * 365.25 * 86400));

    @FuzzTest(maxDuration = "10s")
    void quantityParsesToAFiniteValueOrExplains(byte[] input) {
        String text = new String(input, StandardCharsets.UTF_8);
        Quantity quantity;
        try {
            quantity = Quantity.parse(text);
        } catch (IllegalArgumentException refused) {
            assertThat(refused.getMessage()).isNotBlank();
            return;
        }
        assertThat(Double.isFinite(quantity.value())).isTrue();
        // What cryowarden prints reads back as the same quantity.
        assertThat(Quantity.parse(quantity.toString())).isEqualTo(quantity);
        for (Dimension dimension : Dimension.values()) {
            try {
                assertThat(Quantity.parse(text, dimension).unit().dimension()).isEqualTo(dimension);
            } catch (IllegalArgumentException refused) {
                assertThat(refused.getMessage()).startsWith("expected ");
            }
        }
    }

    @FuzzTest(maxDuration = "10s")
    void durationParsesToAtMostAHundredYearsOrExplains(byte[] input) {
        String text = new String(input, StandardCharsets.UTF_8);
        Duration duration;
        try {
            duration = DurationSyntax.parse(text);
        } catch (IllegalArgumentException refused) {
            assertThat(refused.getMessage()).isNotBlank();
            return;
        }
        assertThat(duration).isBetween(Duration.ZERO, HUNDRED_YEARS);
        if (duration.toNanos() % 1_000_000 == 0) {
            // Whole milliseconds print in the same syntax and read back unchanged.
            assertThat(DurationSyntax.parse(DurationSyntax.format(duration))).isEqualTo(duration);
        }
    }
}
