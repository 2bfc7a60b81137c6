package org.cryowarden.drivers.text;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.util.List;
import org.junit.jupiter.api.Test;

class LineAssemblerTest {

    @Test
    void linesEndAtLfAndLoseATrailingCr() {
        LineAssembler assembler = new LineAssembler(32);

        assertThat(feed(assembler, "1.5\r\n2.5\n3")).containsExactly(new LineEvent.Line("1.5"), new LineEvent.Line("2.5"));
        assertThat(assembler.partial()).contains("3");
        assertThat(feed(assembler, ".5\n")).containsExactly(new LineEvent.Line("3.5"));
        assertThat(assembler.partial()).isEmpty();
    }

    @Test
    void oversizedLineIsDroppedUpToItsTerminatorAndReported() {
        LineAssembler assembler = new LineAssembler(4);

        assertThat(feed(assembler, "1234\r\n123456789\nok\n"))
                .containsExactly(new LineEvent.Line("1234"), new LineEvent.Oversized(9, 4), new LineEvent.Line("ok"));
    }

    @Test
    void endlessGarbageNeverGrowsBeyondTheLimit() {
        LineAssembler assembler = new LineAssembler(8);
        for (int i = 0; i < 10_000; i++) {
            assertThat(feed(assembler, "xxxxxxxxxx")).isEmpty();
        }
        assertThat(assembler.partial()).contains("(100000 bytes of an oversized line)");
    }

    private static List<LineEvent> feed(LineAssembler assembler, String text) {
        byte[] bytes = text.getBytes(StandardCharsets.ISO_8859_1);
        return assembler.feed(bytes, 0, bytes.length);
    }
}
