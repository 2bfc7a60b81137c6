package org.cryowarden.drivers.text;

import static org.assertj.core.api.Assertions.assertThat;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import org.cryowarden.drivers.line.LinePattern;

/**
 * Coverage-guided fuzzing of line assembly and the line protocol's patterns with Jazzer. The assembler is
 * checked against a plain reference model of its contract (cut at LF, drop one CR before it, refuse lines over
 * the limit and report how many bytes were dropped), whatever the chunking; each line is then matched against
 * patterns of the kind site files use, which must classify it without throwing and never yield a value that
 * is not finite.
 *
 * <p>Input layout: byte 0 picks the line limit (16-271 bytes), byte 1 the chunk size (1-64 bytes), the rest is
 * the byte stream.
 */
class LineFuzzTest {

    /** Patterns as site files write them (see the line driver's {@code pattern} setting). */
    private static final List<LinePattern> PATTERNS = List.of(
            compile("O2=(?<value>[0-9.]+)%"),
            compile("T=(?<value>\\S+)K"),
            compile("^\\s*(?<value>[-+0-9.eE]+)\\s*(mbar|bar)?\\s*$"),
            compile("LVL (?<value>.*) mm"),
            compile("(?<value>[^,]*),(?<status>[A-Z]+)"));

    @FuzzTest(maxDuration = "10s")
    void assemblerCutsAnyStreamIntoLinesAndPatternsClassifyThem(byte[] input) {
        if (input.length < 2) {
            return;
        }
        int limit = 16 + (input[0] & 0xFF);
        int chunk = 1 + (input[1] & 0x3F);
        byte[] stream = java.util.Arrays.copyOfRange(input, 2, input.length);
        LineAssembler assembler = new LineAssembler(limit);

        List<LineEvent> events = new ArrayList<>();
        for (int offset = 0; offset < stream.length; offset += chunk) {
            events.addAll(assembler.feed(stream, offset, Math.min(chunk, stream.length - offset)));
        }

        assertThat(events).isEqualTo(expectedEvents(stream, limit));
        for (LineEvent event : events) {
            if (event instanceof LineEvent.Line line) {
                for (LinePattern pattern : PATTERNS) {
                    LinePattern.LineMatch match = pattern.match(line.text());
                    if (match instanceof LinePattern.LineMatch.Value value) {
                        assertThat(Double.isFinite(value.value())).as("value of %s", line).isTrue();
                    }
                    assertThat(match.toString()).isNotEmpty();
                }
            }
        }
        assembler.partial().ifPresent(partial -> assertThat(partial).isNotEmpty());
    }

    /** The contract, written the slow obvious way: segments between LFs, one trailing CR dropped. */
    private static List<LineEvent> expectedEvents(byte[] stream, int limit) {
        List<LineEvent> events = new ArrayList<>();
        int start = 0;
        for (int i = 0; i < stream.length; i++) {
            if (stream[i] != '\n') {
                continue;
            }
            int length = i - start;
            int content = length > 0 && stream[i - 1] == '\r' ? length - 1 : length;
            if (content <= limit) {
                events.add(new LineEvent.Line(new String(stream, start, content, StandardCharsets.ISO_8859_1)));
            } else {
                events.add(new LineEvent.Oversized(length, limit));
            }
            start = i + 1;
        }
        return events;
    }

    private static LinePattern compile(String regex) {
        return LinePattern.compile(regex).pattern().orElseThrow();
    }
}
