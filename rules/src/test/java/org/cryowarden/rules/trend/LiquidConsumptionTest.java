package org.cryowarden.rules.trend;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.physics.DewarGauge;
import org.cryowarden.rules.physics.VerticalVessel;
import org.junit.jupiter.api.Test;

/**
 * Helium consumption from a dewar's level. Geometry by hand (common practice): a cylinder holds pi r^2 per metre
 * of height; a hemispherical bottom of radius R filled to h <= R holds the spherical cap pi h^2 (3R - h) / 3.
 * The dewars are invented for the test.
 */
class LiquidConsumptionTest {

    private static final Instant START = Instant.parse("2025-01-15T18:00:00Z");
    /** 500 mm inside diameter, flat bottom; probe 1000 mm active, bottom 50 mm above the floor. */
    private static final DewarGauge FLAT = new DewarGauge(1.0, 0.05, VerticalVessel.flatBottom(0.5, 1.2));

    @Test
    void fallRefillFallCountsOnlyTheFalls() {
        // 80 % -> 50 % (300 mm), refill to 90 %, 90 % -> 70 % (200 mm): 500 mm of a cylinder of 250 mm radius,
        // pi * 0.25^2 * 0.5 m3 = 0.0981748 m3 = 98.1748 L. The refill's 400 mm (78.5398 L) is left out.
        List<Reading> levels = new ArrayList<>();
        add(levels, 80, 50, 31);
        add(levels, 55, 90, 8);
        add(levels, 90, 70, 21);

        LiquidConsumption.Consumption used = LiquidConsumption.of(levels, FLAT::litres, 5);

        assertThat(used.consumedLitres()).isCloseTo(98.1748, within(1e-4));
        assertThat(used.refills()).isEqualTo(1);
        assertThat(used.refilledLitres()).isCloseTo(78.5398, within(1e-4));
        assertThat(used.readingsUsed()).isEqualTo(60);
        assertThat(used.from()).contains(START);
        assertThat(used.until()).contains(START.plus(Duration.ofMinutes(59)));
    }

    @Test
    void noiseBelowTheRefillRiseIsNotCountedOnEveryReading() {
        // 60 % -> 40 % with +-0.5 % alternating noise: 200 mm, 39.2699 L. Counting every down-step and ignoring
        // every up-step would add about 1 % (1.96 L) per reading pair.
        List<Reading> levels = new ArrayList<>();
        for (int i = 0; i <= 40; i++) {
            double noise = i == 0 || i == 40 ? 0 : (i % 2 == 0 ? 0.5 : -0.5);
            levels.add(Reading.good("he-1", 60 - 0.5 * i + noise, Unit.PERCENT, START.plusSeconds(60L * i)));
        }
        assertThat(LiquidConsumption.of(levels, FLAT::litres, 5).consumedLitres()).isCloseTo(39.2699, within(1e-4));
    }

    @Test
    void hemisphericalBottomUsesTheCapVolume() {
        // R = 0.25 m. From h = 0.25 m (the full hemisphere, 2/3 pi R^3 = 32.7249 L) to h = 0.10 m
        // (pi 0.1^2 (0.75 - 0.1) / 3 = 6.80678 L): 25.9181 L. Probe offset 0, active length 1 m: 25 % -> 10 %.
        DewarGauge gauge = new DewarGauge(1.0, 0, VerticalVessel.hemisphericalBottom(0.5, 1.0));
        List<Reading> levels = new ArrayList<>();
        add(levels, 25, 10, 16);
        assertThat(LiquidConsumption.of(levels, gauge::litres, 2).consumedLitres()).isCloseTo(25.9181, within(1e-4));
    }

    @Test
    void litresReadingsAndBadReadingsAreHandled() {
        List<Reading> litres = List.of(
                Reading.good("he-1-litres", 200, Unit.LITRE, START),
                Reading.bad("he-1-litres", Unit.LITRE, START.plusSeconds(60), "no reply"),
                Reading.good("he-1-litres", 190, Unit.LITRE, START.plusSeconds(120)),
                Reading.good("he-1-litres", 240, Unit.LITRE, START.plusSeconds(180)),
                Reading.good("he-1-litres", 235, Unit.LITRE, START.plusSeconds(240)));
        LiquidConsumption.Consumption used = LiquidConsumption.ofLitres(litres, 10);
        // 200 -> 190 and 240 -> 235: 15 L; the BAD reading is skipped.
        assertThat(used.consumedLitres()).isEqualTo(15.0);
        assertThat(used.refills()).isEqualTo(1);
        assertThat(used.readingsUsed()).isEqualTo(4);
        assertThat(LiquidConsumption.ofLitres(List.of(), 10).consumedLitres()).isZero();
    }

    // --- helpers ---

    /** {@code count} readings a minute apart going linearly from {@code from} to {@code to} (in %). */
    private static void add(List<Reading> readings, double from, double to, int count) {
        for (int i = 0; i < count; i++) {
            double level = from + (to - from) * i / (count - 1);
            readings.add(Reading.good("he-1", level, Unit.PERCENT, START.plus(Duration.ofMinutes(readings.size()))));
        }
    }
}
