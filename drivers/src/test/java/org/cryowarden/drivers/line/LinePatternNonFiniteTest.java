package org.cryowarden.drivers.line;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

/**
 * A number too large for a double ("1e999") is not a value: it would become an infinite GOOD reading that
 * passes or fails every limit. Found by {@code LineFuzzTest}.
 */
class LinePatternNonFiniteTest {

    @Test
    void numberBeyondDoubleRangeIsNotANumber() {
        LinePattern pattern = LinePattern.compile("T=(?<value>\\S+)K").pattern().orElseThrow();

        assertThat(pattern.match("T=1e999K")).isEqualTo(new LinePattern.LineMatch.NotANumber("1e999"));
        assertThat(pattern.match("T=-1e999K")).isEqualTo(new LinePattern.LineMatch.NotANumber("-1e999"));
        assertThat(pattern.match("T=1e308K")).isEqualTo(new LinePattern.LineMatch.Value(1e308));
    }
}
