package org.cryowarden.daemon.history;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Base64;
import java.util.List;
import org.cryowarden.rules.Reading;
import org.junit.jupiter.api.Test;

/**
 * Blocks written in format version 1 (before the lattice codings) still decode bit for bit: journals from older
 * runs stay replayable. The fixture holds four blocks the version-1 encoder wrote (an oxygen cell in exact decimals,
 * full-precision noise in XOR, nanosecond-jittered timestamps, NaN/infinities/-0.0 among decimals) and, after each,
 * the readings that went in (epoch seconds.nanos, raw value bits, quality, reason).
 */
class VersionOneBlockTest {

    @Test
    void versionOneBlocksDecodeToTheReadingsThatWentIn() throws IOException {
        int blocks = 0;
        for (Fixture fixture : fixtures()) {
            HistoryBlock block = HistoryBlock.parse("version 1 fixture " + blocks, fixture.data);
            assertThat(fixture.data[4]).isEqualTo((byte) 1);
            List<Reading> readings = block.readings();
            assertThat(readings).hasSameSizeAs(fixture.lines);
            for (int i = 0; i < readings.size(); i++) {
                Reading r = readings.get(i);
                String line = r.timestamp().getEpochSecond() + "." + r.timestamp().getNano() + " "
                        + Long.toHexString(Double.doubleToRawLongBits(r.value())) + " " + r.quality() + " "
                        + r.reason().replace(' ', '_');
                assertThat(line).as("reading %d of block %d", i, blocks).isEqualTo(fixture.lines.get(i));
            }
            blocks++;
        }
        assertThat(blocks).isEqualTo(4);
    }

    @Test
    void aVersionOneBlockEncodedAgainComesBackTheSameAndSmaller() throws IOException {
        Fixture oxygen = fixtures().get(0);
        List<Reading> readings = HistoryBlock.parse("oxygen", oxygen.data).readings();

        HistoryBlock again = Series.encode(readings);

        assertThat(again.toBytes()[4]).isEqualTo((byte) 2);
        List<Reading> back = again.readings();
        for (int i = 0; i < readings.size(); i++) {
            assertThat(Double.doubleToRawLongBits(back.get(i).value()))
                    .isEqualTo(Double.doubleToRawLongBits(readings.get(i).value()));
            assertThat(back.get(i).timestamp()).isEqualTo(readings.get(i).timestamp());
        }
        assertThat(again.byteSize()).isLessThan(oxygen.data.length);
    }

    private record Fixture(byte[] data, List<String> lines) {
    }

    private static List<Fixture> fixtures() throws IOException {
        List<Fixture> fixtures = new ArrayList<>();
        try (BufferedReader in = new BufferedReader(new InputStreamReader(
                VersionOneBlockTest.class.getResourceAsStream("version-1-blocks.txt"), StandardCharsets.UTF_8))) {
            String line;
            while ((line = in.readLine()) != null) {
                if (line.startsWith("block ")) {
                    fixtures.add(new Fixture(Base64.getDecoder().decode(line.substring(6)), new ArrayList<>()));
                } else {
                    fixtures.get(fixtures.size() - 1).lines.add(line);
                }
            }
        }
        return fixtures;
    }

}
