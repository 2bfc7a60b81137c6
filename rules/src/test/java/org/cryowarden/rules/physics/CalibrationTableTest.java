package org.cryowarden.rules.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.config.YamlReader;
import org.junit.jupiter.api.Test;

class CalibrationTableTest {

    @Test
    void passesThroughEveryPoint() {
        CalibrationTable table = table(Interpolation.MONOTONE_CUBIC, 1, 10, 2, 12, 4, 13, 8, 30);
        for (CalibrationPoint point : table.points()) {
            assertThat(table.value(point.raw())).isCloseTo(point.value(), within(1e-12));
        }
    }

    @Test
    void neverOvershootsAStep() {
        // Steffen, A&A 239 (1990) 443: the interpolant stays between neighbouring values (no overshoot)
        CalibrationTable table = table(Interpolation.MONOTONE_CUBIC, 0, 0, 1, 0, 2, 0, 3, 1, 4, 1, 5, 1);
        for (int i = 0; i <= 5000; i++) {
            double value = table.value(i / 1000.0);
            assertThat(value).isBetween(0.0, 1.0);
        }
        assertThat(table.value(1.5)).isEqualTo(0.0);
    }

    @Test
    void isMonotoneWhereTheDataAreEvenForAFallingDiodeTable() {
        // silicon-diode-like data, voltage falling as temperature rises (invented points); Steffen (1990):
        // monotone data give a monotone interpolant
        CalibrationTable table = table(Interpolation.MONOTONE_CUBIC,
                1.70, 2.0, 1.60, 5.0, 1.30, 20.0, 1.10, 40.0, 1.05, 80.0, 0.90, 150.0, 0.55, 300.0);
        double previous = Double.POSITIVE_INFINITY;
        for (int i = 0; i <= 11_500; i++) {
            double volts = 0.55 + i * 1e-4;
            double kelvin = table.value(Math.min(volts, 1.70));
            assertThat(kelvin).isLessThanOrEqualTo(previous);
            previous = kelvin;
        }
    }

    @Test
    void reproducesAStraightLineExactly() {
        CalibrationTable table = table(Interpolation.MONOTONE_CUBIC, 0, 1, 1, 3, 3, 7, 4, 9);
        assertThat(table.value(2.5)).isCloseTo(6.0, within(1e-12));
    }

    @Test
    void logLogTableReproducesAPowerLawExactly() {
        // R = 1000 T^-2 is straight on log-log axes, so log-log interpolation is exact (common practice)
        List<CalibrationPoint> points = new ArrayList<>();
        for (double kelvin : new double[] {1, 2, 5, 10, 20, 50}) {
            points.add(new CalibrationPoint(1000 / (kelvin * kelvin), kelvin));
        }
        CalibrationTable table = new CalibrationTable(points, Interpolation.LOG_LOG, Unit.OHM, Unit.KELVIN);
        assertThat(table.value(1000 / 9.0)).isCloseTo(3.0, within(1e-9));
        assertThat(table.value(1000 / 1600.0)).isCloseTo(40.0, within(1e-9));
    }

    @Test
    void outsideTheTableIsAnErrorAndABadReading() {
        CalibrationTable table = new CalibrationTable(List.of(new CalibrationPoint(10, 1), new CalibrationPoint(20, 2)),
                Interpolation.MONOTONE_CUBIC, Unit.OHM, Unit.KELVIN);
        assertThatThrownBy(() -> table.value(25))
                .isInstanceOf(OutOfRangeException.class)
                .hasMessage("raw value 25 ohm is outside the calibration table 10 ohm to 20 ohm");
        Instant now = Instant.parse("2026-01-01T00:00:00Z");
        Reading bad = table.convert(Reading.good("bath", 25, Unit.OHM, now));
        assertThat(bad.quality()).isEqualTo(Quality.BAD);
        assertThat(bad.reason()).isEqualTo("raw value 25 ohm is outside the calibration table 10 ohm to 20 ohm");
        Reading good = table.convert(Reading.good("bath", 0.015, Unit.KILOHM, now));
        assertThat(good.value()).isCloseTo(1.5, within(1e-12));
        assertThat(good.unit()).isEqualTo(Unit.KELVIN);
        Reading stale = table.convert(Reading.stale("bath", Unit.OHM, now, "no reply"));
        assertThat(stale.quality()).isEqualTo(Quality.STALE);
        assertThat(stale.reason()).isEqualTo("no reply");
    }

    @Test
    void readsCsvWithHeaderAndComments() throws ConfigException {
        CalibrationTable table = CalibrationTableReader.readCsv("# bath probe B-7 (invented)\nraw,value\n10,1\n\n20, 2\n30;3\n",
                "b7.csv", Interpolation.MONOTONE_CUBIC, Unit.OHM, Unit.KELVIN);
        assertThat(table.points()).hasSize(3);
        assertThat(table.value(25)).isCloseTo(2.5, within(1e-12));
    }

    @Test
    void csvErrorsNameTheLine() {
        assertThatThrownBy(() -> CalibrationTableReader.readCsv("raw,value\n10,1\nten,2\n20,2\n20,3\n", "b7.csv",
                Interpolation.MONOTONE_CUBIC, Unit.OHM, Unit.KELVIN))
                .isInstanceOf(ConfigException.class)
                .hasMessage("b7.csv:3:1: expected 'raw,value' with two numbers, got 'ten,2'");
        assertThatThrownBy(() -> CalibrationTableReader.readCsv("10,1\n20,2\n20,3\n", "b7.csv",
                Interpolation.MONOTONE_CUBIC, Unit.OHM, Unit.KELVIN))
                .hasMessage("b7.csv: raw value 20 appears twice in the calibration table");
    }

    @Test
    void readsYamlTables() throws ConfigException {
        String yaml = "interpolation: log-log\nraw_unit: ohm\nvalue_unit: K\npoints:\n  - [1000, 1]\n  - [250, 2]\n"
                + "  - [40, 5]\n";
        CalibrationTable table = CalibrationTableReader.readYaml(YamlReader.read(yaml, "cx.yaml"));
        assertThat(table.interpolation()).isEqualTo(Interpolation.LOG_LOG);
        assertThat(table.valueUnit()).isEqualTo(Unit.KELVIN);
        assertThat(table.value(1000 / 9.0)).isCloseTo(3.0, within(1e-9));
    }

    @Test
    void yamlErrorsArePositioned() {
        String yaml = "interpolaton: log-log\nraw_unit: ohms?\npoints:\n  - [1000, 1]\n  - [250]\n";
        assertThatThrownBy(() -> CalibrationTableReader.readYaml(YamlReader.read(yaml, "cx.yaml")))
                .isInstanceOf(ConfigException.class)
                .hasMessage("cx.yaml:1:1: unknown key 'interpolaton' in a calibration table (did you mean "
                        + "'interpolation'?); expected one of description, interpolation, points, raw_unit, value_unit\n"
                        + "cx.yaml:2:11: unknown unit 'ohms?' for raw_unit\n"
                        + "cx.yaml:5:5: a calibration point must be a pair [raw, value], got a list");
    }

    private static CalibrationTable table(Interpolation interpolation, double... pairs) {
        List<CalibrationPoint> points = new ArrayList<>();
        for (int i = 0; i < pairs.length; i += 2) {
            points.add(new CalibrationPoint(pairs[i], pairs[i + 1]));
        }
        return new CalibrationTable(points, interpolation, Unit.VOLT, Unit.KELVIN);
    }
}
