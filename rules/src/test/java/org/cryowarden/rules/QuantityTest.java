package org.cryowarden.rules;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.time.Duration;
import org.junit.jupiter.api.Test;

class QuantityTest {

    @Test
    void parsesEveryFormOfTheIssueExamples() {
        assertThat(Quantity.parse("101.325kPa").toBase()).isEqualTo(101_325.0);
        // 760 torr = 1 atm = 101 325 Pa by definition (BIPM SI Brochure, non-SI units)
        assertThat(Quantity.parse("760 torr").toBase()).isCloseTo(101_325.0, within(1e-9));
        assertThat(Quantity.parse("1 atm").toBase()).isEqualTo(101_325.0);
        // 1 psi = 6894.757 Pa (NIST SP 811, appendix B); 14.7 psi is about one atmosphere
        assertThat(Quantity.parse("14.7psi").toBase()).isCloseTo(101_352.93, within(0.01));
        assertThat(Quantity.parse("4.2K").toBase()).isEqualTo(4.2);
        assertThat(Quantity.parse("-196C").toBase()).isCloseTo(77.15, within(1e-9));
        assertThat(Quantity.parse("18.52ohm").toBase()).isEqualTo(18.52);
        assertThat(Quantity.parse("100 L").toBase()).isCloseTo(0.1, within(1e-15));
        assertThat(Quantity.parse("2 m3/min").toBase()).isCloseTo(2.0 / 60, within(1e-15));
        assertThat(Quantity.parse("500 W").toBase()).isEqualTo(500.0);
        assertThat(Quantity.parse("30s").toBase()).isEqualTo(30.0);
        assertThat(Quantity.parse("2h").toBase()).isEqualTo(7200.0);
    }

    @Test
    void gaugePressureNeedsAnAmbientAndDefaultsToOneStandardAtmosphere() {
        Quantity gauge = Quantity.parse("1.2 bar(g)");
        assertThat(gauge.unit().pressureReference()).isEqualTo(PressureReference.GAUGE);
        assertThat(gauge.toBase()).isCloseTo(221_325.0, within(1e-9));
        // a site at altitude states its own ambient pressure
        assertThat(gauge.toAbsoluteBase(85_000)).isCloseTo(205_000.0, within(1e-9));
        assertThat(gauge.in(Unit.KILOPASCAL, 85_000)).isCloseTo(205.0, within(1e-12));
        assertThat(Quantity.parse("14.7 psig").in(Unit.BAR_GAUGE)).isCloseTo(1.01353, within(1e-5));
    }

    @Test
    void conversionIntoTheSameUnitIsExact() {
        assertThat(Quantity.parse("850C").in(Unit.CELSIUS)).isEqualTo(850.0);
        assertThat(Quantity.parse("0.2 bar(g)").in(Unit.BAR_GAUGE, 85_000)).isEqualTo(0.2);
    }

    @Test
    void typographicMinusIsAccepted() {
        assertThat(Quantity.parse("\u2212196 °C").toBase()).isCloseTo(77.15, within(1e-9));
    }

    @Test
    void badUnitsSayWhatWasExpected() {
        assertThatThrownBy(() -> Quantity.parse("4.2 kelvins"))
                .hasMessage("unknown unit 'kelvins' in '4.2 kelvins': did you mean 'kelvin'?");
        assertThatThrownBy(() -> Quantity.parse("101.325 KPA"))
                .hasMessage("unknown unit 'KPA' in '101.325 KPA': did you mean 'kPa'?");
        assertThatThrownBy(() -> Quantity.parse("12"))
                .hasMessage("'12' has no unit: write the unit after the number, e.g. 12 kPa");
        assertThatThrownBy(() -> Quantity.parse("kPa"))
                .hasMessage("'kPa' is not a quantity: expected a number followed by a unit, e.g. 101.325kPa or 4.2 K");
        assertThatThrownBy(() -> Quantity.parse("4.2 K", Dimension.PRESSURE))
                .hasMessage("expected a pressure (Pa, kPa, MPa, mbar, bar(a), bar(g), psi, torr, atm), got '4.2 K' "
                        + "which is a temperature (K, mK, °C)");
        assertThatThrownBy(() -> Quantity.parse("1e400 kPa")).hasMessage("'1e400 kPa' is too large a number");
    }

    @Test
    void suggestionsAreTheSameOnEveryRun() {
        // 'mbr' is one edit from several symbols; the first in declaration order wins every time
        String first = message("3 mbr");
        for (int i = 0; i < 5; i++) {
            assertThat(message("3 mbr")).isEqualTo(first);
        }
        assertThat(first).isEqualTo("unknown unit 'mbr' in '3 mbr': did you mean 'mbar'?");
    }

    @Test
    void durationsParseAndRefuseNonsense() {
        assertThat(DurationSyntax.parse("1h30min")).isEqualTo(Duration.ofMinutes(90));
        assertThat(DurationSyntax.parse("2h")).isEqualTo(Duration.ofHours(2));
        assertThat(DurationSyntax.parse("250ms")).isEqualTo(Duration.ofMillis(250));
        assertThatThrownBy(() -> DurationSyntax.parse("5m"))
                .hasMessage("'5m' is not a duration: expected a number and one of ms, s, min, h, d, e.g. 30s, 5min, 2h "
                        + "or 1h30min");
        assertThatThrownBy(() -> DurationSyntax.parse("99999999999d"))
                .hasMessage("'99999999999d' is too long a duration: at most 100 years");
    }

    private static String message(String text) {
        try {
            Quantity.parse(text);
            throw new AssertionError("parsed " + text);
        } catch (IllegalArgumentException e) {
            return e.getMessage();
        }
    }
}
