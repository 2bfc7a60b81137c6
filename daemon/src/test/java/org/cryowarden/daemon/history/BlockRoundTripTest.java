package org.cryowarden.daemon.history;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.junit.jupiter.api.Test;

/**
 * Every reading comes back from a stored block exactly: each double bit for bit (NaN payloads, -0.0, infinities
 * included, IEEE 754-2019 section 3.4 binary64 encodings), each timestamp to the nanosecond, each quality and reason.
 */
class BlockRoundTripTest {

    private static final Instant T0 = Series.DUSK;

    @Test
    void randomBitPatternsComeBackBitExact() {
        Random random = new Random(20250115L);
        List<Reading> readings = new ArrayList<>();
        for (int i = 0; i < 5000; i++) {
            double value = Double.longBitsToDouble(random.nextLong());
            readings.add(new Reading("t_stage", value, Unit.KELVIN, T0.plusSeconds(i),
                    Double.isFinite(value) ? Quality.GOOD : Quality.BAD, Double.isFinite(value) ? "" : "no value"));
        }

        assertRoundTrip(readings);
    }

    @Test
    void latticeValuesWithUlpCorrectionsNearAndBeyondTheLimitComeBackBitExact() {
        Random random = new Random(640);
        List<Reading> readings = new ArrayList<>();
        for (int i = 0; i < 5000; i++) {
            double onLattice = (13_000 + random.nextInt(200)) / 640.0;
            long ulps = i % 50 == 0 ? random.nextInt(1 << 20) - (1 << 19) : random.nextInt(37) - 18;
            double value = Double.longBitsToDouble(Double.doubleToRawLongBits(onLattice) + ulps);
            readings.add(Reading.good("o2_loop", value, Unit.PERCENT_VOLUME, T0.plusSeconds(i)));
        }

        assertRoundTrip(readings);
        assertRoundTrip(Series.loopOxygen(3));
        assertRoundTrip(Series.loopPressure(4));
    }

    @Test
    void constantSeriesComesBackAndCostsTwoBitsPerReading() {
        List<Reading> readings = Series.constant();

        HistoryBlock block = assertRoundTrip(readings);

        // Pelkonen et al. 2015, section 4.1: a delta-of-delta of 0 is the single bit '0', an unchanged value the
        // single bit '0' (on a lattice: a zero difference, Rice code '0'); so 43,199 readings after the first cost
        // 2 bits each, plus the header and the first value (under 80 bytes).
        assertThat(block.byteSize()).isLessThan(43_199 * 2 / 8 + 80);
    }

    @Test
    void steppedNoisyAndDriftingSeriesComeBack() {
        assertRoundTrip(Series.stepped());
        assertRoundTrip(Series.oxygenCell(1));
        assertRoundTrip(Series.driftingLevel(2));
        assertRoundTrip(Series.rawNoise(3));
    }

    @Test
    void specialValuesComeBackBitExactAmongOrdinaryOnes() {
        double[] specials = {Double.NaN, Double.longBitsToDouble(0x7ff0000000000001L),
                Double.longBitsToDouble(0xfff8000000abcdefL), Double.longBitsToDouble(0x7ff7ffffffffffffL),
                Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY, -0.0, 0.0, Double.MIN_VALUE, -Double.MIN_VALUE,
                Double.MAX_VALUE, -Double.MAX_VALUE, Double.MIN_NORMAL, 1e-300, 9.007199254740993e15, 20.93};
        List<Reading> readings = new ArrayList<>();
        int t = 0;
        for (int round = 0; round < 3; round++) {
            for (double special : specials) {
                readings.add(new Reading("o2_a", 20.9, Unit.PERCENT_VOLUME, T0.plusSeconds(t++), Quality.GOOD, ""));
                readings.add(new Reading("o2_a", special, Unit.PERCENT_VOLUME, T0.plusSeconds(t++), Quality.UNCERTAIN,
                        "special " + Double.doubleToRawLongBits(special)));
                readings.add(new Reading("o2_a", special, Unit.PERCENT_VOLUME, T0.plusSeconds(t++), Quality.UNCERTAIN,
                        "special " + Double.doubleToRawLongBits(special)));
            }
        }

        assertRoundTrip(readings);
    }

    @Test
    void aBadSensorAllNightFallsBackToXorAndStillComesBack() {
        List<Reading> readings = new ArrayList<>();
        for (int t = 0; t < 3600; t++) {
            readings.add(Reading.bad("o2_b", Unit.PERCENT_VOLUME, T0.plusSeconds(t), "timeout after 500 ms"));
        }

        HistoryBlock block = assertRoundTrip(readings);

        // One quality run and a repeated NaN: about 2 bits per reading (Pelkonen et al. 2015, section 4.1).
        assertThat(block.byteSize()).isLessThan(3599 * 2 / 8 + 96);
    }

    @Test
    void irregularTimestampsComeBackToTheNanosecond() {
        Random random = new Random(7);
        List<Reading> readings = new ArrayList<>();
        Instant at = T0;
        for (int i = 0; i < 4000; i++) {
            long step = switch (i % 5) {
                case 0 -> 1_000_000_000L;
                case 1 -> 1_000_000_000L + random.nextInt(40_000_000) - 20_000_000;
                case 2 -> random.nextInt(1000) * 1_000L;
                case 3 -> 0;
                default -> random.nextInt(3) == 0 ? 86_400_000_000_000L * 3 : random.nextInt(999_999_999) + 1;
            };
            at = at.plusNanos(step);
            readings.add(Reading.good("p_bath", 1000 + i % 7, Unit.MILLIBAR, at));
        }

        assertRoundTrip(readings);
    }

    @Test
    void wholeSecondsThenMillisecondsThenNanosecondsReencodeAndComeBack() {
        List<Reading> readings = new ArrayList<>();
        for (int t = 0; t < 100; t++) {
            readings.add(Reading.good("p_bath", 1050, Unit.MILLIBAR, T0.plusSeconds(t)));
        }
        readings.add(Reading.good("p_bath", 1050.5, Unit.MILLIBAR, T0.plusMillis(100_250)));
        readings.add(Reading.good("p_bath", 1050.25, Unit.MILLIBAR, T0.plusNanos(101_250_000_001L)));
        readings.add(Reading.good("p_bath", Math.PI, Unit.MILLIBAR, T0.plusSeconds(102)));

        assertRoundTrip(readings);
    }

    @Test
    void qualityAndReasonRunsComeBack() {
        List<Reading> readings = new ArrayList<>();
        for (int t = 0; t < 600; t++) {
            Instant at = T0.plusSeconds(t);
            if (t >= 100 && t < 160) {
                readings.add(Reading.bad("level_d1", Unit.PERCENT, at, t < 130 ? "bad CRC" : "timeout after 500 ms"));
            } else if (t >= 300 && t < 305) {
                readings.add(new Reading("level_d1", 61.5, Unit.PERCENT, at, Quality.UNCERTAIN, "3.7 mA below range"));
            } else if (t == 400) {
                readings.add(Reading.stale("level_d1", Unit.PERCENT, at, "no reading for 5s"));
            } else {
                readings.add(Reading.good("level_d1", 62 - t * 0.001, Unit.PERCENT, at));
            }
        }

        assertRoundTrip(readings);
    }

    @Test
    void appendingContinuesAfterASnapshotAndSealStartsAFreshBlock() {
        List<Reading> readings = Series.oxygenCell(11).subList(0, 200);
        BlockEncoder encoder = new BlockEncoder("o2_a", Unit.PERCENT_VOLUME);
        readings.subList(0, 120).forEach(encoder::append);
        HistoryBlock early = encoder.snapshot();
        readings.subList(120, 150).forEach(encoder::append);
        HistoryBlock sealed = encoder.seal();
        readings.subList(150, 200).forEach(encoder::append);
        HistoryBlock next = encoder.snapshot();

        assertSameReadings(reparse(early).readings(), readings.subList(0, 120));
        assertSameReadings(reparse(sealed).readings(), readings.subList(0, 150));
        assertSameReadings(reparse(next).readings(), readings.subList(150, 200));
        assertThat(next.first()).isEqualTo(readings.get(150).timestamp());
        assertThat(next.last()).isEqualTo(readings.get(199).timestamp());
        assertThat(next.count()).isEqualTo(50);
        assertThat(next.channel()).isEqualTo("o2_a");
        assertThat(next.unit()).isEqualTo(Unit.PERCENT_VOLUME);
    }

    @Test
    void equalTimestampsAreKeptInTheOrderGiven() {
        List<Reading> readings = List.of(Reading.good("o2_a", 20.9, Unit.PERCENT_VOLUME, T0),
                Reading.good("o2_a", 20.8, Unit.PERCENT_VOLUME, T0),
                Reading.good("o2_a", 20.7, Unit.PERCENT_VOLUME, T0.plusSeconds(1)));

        assertRoundTrip(readings);
    }

    @Test
    void earlierReadingIsRefusedWithBothInstants() {
        BlockEncoder encoder = new BlockEncoder("o2_a", Unit.PERCENT_VOLUME);
        encoder.append(Reading.good("o2_a", 20.9, Unit.PERCENT_VOLUME, T0.plusSeconds(10)));

        assertThatThrownBy(() -> encoder.append(Reading.good("o2_a", 20.9, Unit.PERCENT_VOLUME, T0.plusSeconds(9))))
                .isInstanceOf(IllegalArgumentException.class)
                .hasMessage("reading of o2_a at 2025-01-15T18:00:09Z is earlier than the previous one at "
                        + "2025-01-15T18:00:10Z: a history block takes readings in time order");
        assertThat(encoder.count()).isEqualTo(1);
    }

    @Test
    void readingOfAnotherChannelOrUnitIsRefused() {
        BlockEncoder encoder = new BlockEncoder("o2_a", Unit.PERCENT_VOLUME);

        assertThatThrownBy(() -> encoder.append(Reading.good("o2_b", 20.9, Unit.PERCENT_VOLUME, T0)))
                .hasMessage("reading of channel 'o2_b' does not belong in the history block of 'o2_a'");
        assertThatThrownBy(() -> encoder.append(Reading.good("o2_a", 0.209, Unit.PERCENT, T0)))
                .hasMessage("reading of o2_a is in % but its history block is in %vol");
        assertThatThrownBy(encoder::snapshot).isInstanceOf(IllegalStateException.class)
                .hasMessage("the history block of o2_a is empty");
    }

    private static HistoryBlock assertRoundTrip(List<Reading> readings) {
        HistoryBlock block = Series.encode(readings);
        HistoryBlock stored = reparse(block);
        assertThat(stored.count()).isEqualTo(readings.size());
        assertThat(stored.first()).isEqualTo(readings.get(0).timestamp());
        assertThat(stored.last()).isEqualTo(readings.get(readings.size() - 1).timestamp());
        assertSameReadings(stored.readings(), readings);
        return block;
    }

    private static HistoryBlock reparse(HistoryBlock block) {
        return HistoryBlock.parse("test", block.toBytes());
    }

    /** Record equality compares doubles through {@code Double.compare}, which folds NaN payloads: compare raw bits. */
    private static void assertSameReadings(List<Reading> actual, List<Reading> expected) {
        assertThat(actual).hasSameSizeAs(expected);
        for (int i = 0; i < expected.size(); i++) {
            Reading a = actual.get(i);
            Reading e = expected.get(i);
            assertThat(Double.doubleToRawLongBits(a.value())).as("value bits of reading %d", i)
                    .isEqualTo(Double.doubleToRawLongBits(e.value()));
            assertThat(a).as("reading %d", i).isEqualTo(e);
        }
    }
}
