package org.cryowarden.drivers.scpi;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Lines as long as a text instrument accepts (4096 bytes) go through the SCPI parsers without overflowing the
 * stack: regular expressions with a repeated alternation used to recurse once per character. Found by
 * {@link ScpiFuzzTest}.
 */
class ScpiLongLinesTest {

    @Test
    void errorEntryWithFourThousandCharactersOfTextIsParsed() {
        String text = "x".repeat(4000);

        assertThat(ErrorEntry.parse("-350,\"" + text + "\"")).contains(new ErrorEntry(-350, text));
    }

    @Test
    void errorEntryWithTwoThousandDoubledQuotesIsParsed() {
        // IEEE 488.2-1992, §7.7.5: a quote inside a string is sent doubled.
        assertThat(ErrorEntry.parse("-100,\"" + "\"\"".repeat(2000) + "\""))
                .contains(new ErrorEntry(-100, "\"".repeat(2000)));
    }

    @Test
    void headerWithTwoThousandNodesIsParsed() {
        String header = String.join(":", java.util.Collections.nCopies(2000, "A"));

        assertThat(ScpiCodec.parseProgramMessage(header + "? 1"))
                .contains(List.of(new ScpiCommand(header, true, List.of("1"))));
    }
}
