package org.cryowarden.drivers.line;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

class LinePatternTest {

    @Test
    void valueGroupIsExtractedAsANumber() {
        LinePattern pattern = LinePattern.compile("O2=(?<value>[-0-9.]+)%").pattern().orElseThrow();

        assertThat(pattern.match("STAT OK O2=20.8% T=21C")).isEqualTo(new LinePattern.LineMatch.Value(20.8));
    }

    @Test
    void lineWithoutMatchOrWithoutNumberIsClassified() {
        LinePattern pattern = LinePattern.compile("LEVEL (?<value>\\S+) mm").pattern().orElseThrow();

        assertThat(pattern.match("ERR 7")).isEqualTo(new LinePattern.LineMatch.NoMatch("ERR 7"));
        assertThat(pattern.match("LEVEL ---- mm")).isEqualTo(new LinePattern.LineMatch.NotANumber("----"));
    }

    @Test
    void patternWithoutValueGroupIsRefusedWithAHint() {
        assertThat(LinePattern.compile("O2=([0-9.]+)").problem())
                .isEqualTo("has no named group 'value' (write (?<value>...) around the number)");
        assertThat(LinePattern.compile("O2=(?<val>[0-9.]+)").pattern()).isEmpty();
    }

    @Test
    void invalidRegexIsRefusedWithItsPosition() {
        assertThat(LinePattern.compile("O2=(?<value>[0-9.+").problem())
                .startsWith("is not a valid regular expression: Unclosed character class near index");
    }
}
