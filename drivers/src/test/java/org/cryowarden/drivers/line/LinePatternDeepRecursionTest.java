package org.cryowarden.drivers.line;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

class LinePatternDeepRecursionTest {

    @Test
    void patternThatRecursesPerCharacterOnALongLineIsANoMatchNotACrash() {
        // An alternation under a quantifier recurses once per repetition in java.util.regex (common practice:
        // a known property of backtracking matchers); 200 000 digits overflow a default thread stack.
        LinePattern pattern = LinePattern.compile("^V=(?<value>(\\d|\\.)+)$").pattern().orElseThrow();
        String line = "V=" + "1".repeat(200_000);

        assertThat(pattern.match(line)).isInstanceOf(LinePattern.LineMatch.NoMatch.class);
        assertThat(pattern.match("V=12.5")).isEqualTo(new LinePattern.LineMatch.Value(12.5));
    }
}
