package org.cryowarden.rules.config;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.time.Duration;
import java.time.LocalTime;
import java.time.ZoneId;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.engine.Engine;
import org.cryowarden.rules.engine.EngineConfig;
import org.cryowarden.rules.model.AlarmOptions;
import org.cryowarden.rules.model.FillDef;
import org.cryowarden.rules.model.FloodDef;
import org.cryowarden.rules.model.ForecastRule;
import org.cryowarden.rules.model.Priority;
import org.junit.jupiter.api.Test;

/** Loading forecast rules, fills and the alarm-flood criterion, and every error they can have, positioned. */
class UnattendedConfigTest {

    private static final String DIR = "src/test/resources/config/";
    private static final String SITE = DIR + "unattended-site.yaml";
    private static final String RULES = DIR + "unattended-rules.yaml";
    private static final String BROKEN = DIR + "broken-unattended-rules.yaml";

    @Test
    void forecastFillAndFloodLoadIntoModelRecordsAndBuildAnEngine() throws ConfigException {
        Configuration configuration = ConfigurationLoader.load(Path.of(SITE), List.of(Path.of(RULES)),
                DriverSettingsValidator.acceptAll());

        assertThat(configuration.site().timeZone()).contains(ZoneId.of("Europe/Berlin"));
        assertThat(configuration.rules().rules().get(1)).isEqualTo(new ForecastRule("he-empty-by-morning",
                "he-level", Quantity.of(10, Unit.PERCENT), Duration.ofHours(2), Quantity.of(5, Unit.PERCENT),
                Optional.of("he-hours-left"), Optional.of(LocalTime.of(7, 0)), Optional.of(Duration.ofHours(12)),
                Optional.empty(), AlarmOptions.simple(Priority.HIGH, "Helium runs out before the morning shift"),
                new SourcePosition(RULES, 6, 5)));
        assertThat(configuration.rules().fills()).containsExactly(new FillDef("trap-fill", "trap-level",
                "trap-valve", Quantity.of(30, Unit.PERCENT), Quantity.of(85, Unit.PERCENT), 1, Duration.ofMinutes(20),
                Quantity.of(2, Unit.PERCENT), Duration.ofMinutes(5), List.of("o2-low"),
                AlarmOptions.simple(Priority.HIGH, "Cold trap fill failed"), new SourcePosition(RULES, 22, 5)));
        // ends_below not stated: the default 5.
        assertThat(configuration.rules().flood()).isEqualTo(new FloodDef(12, Duration.ofMinutes(15), 5));

        Engine engine = new Engine(EngineConfig.of(configuration.site(), configuration.rules()),
                new VirtualTimeSource(java.time.Instant.parse("2025-01-15T18:00:00Z")));
        assertThat(engine.forecastChannels()).containsExactly("he-hours-left");
        assertThat(engine.fills()).singleElement().satisfies(fill -> assertThat(fill.valve()).isEqualTo("trap-valve"));
        assertThat(engine.alarm("trap-fill")).isPresent();
    }

    @Test
    void exampleRulesBuildAnEngineWithTheirForecastChannel() throws ConfigException {
        Configuration example = ConfigurationLoader.load(Path.of("../config-examples/harbour-hall-site.yaml"),
                List.of(Path.of("../config-examples/harbour-hall-rules.yaml")), DriverSettingsValidator.acceptAll());
        Engine engine = new Engine(EngineConfig.of(example.site(), example.rules()),
                new VirtualTimeSource(java.time.Instant.parse("2025-01-15T18:00:00Z")));
        assertThat(engine.forecastChannels()).containsExactly("he-dewar-1-hours-left");
        assertThat(example.rules().flood()).isEqualTo(FloodDef.DEFAULT);
    }

    @Test
    void everyErrorOfTheNewKeysIsReportedWithItsPosition() {
        // What each file shows on its own; a rule or fill with such an error goes no further, as for the other
        // rule types.
        assertThat(problems(SITE, BROKEN)).containsExactly(
                BROKEN + ":12:15: 'before' in the 'forecast' of rule 'bad-forecast' must be a local time of day "
                        + "HH:MM on the 24-hour clock (00:00 to 23:59), such as 07:00, found '7am'",
                BROKEN + ":13:18: unknown time zone 'Europe/Berln' in the 'forecast' of rule 'bad-forecast': "
                        + "expected a region of the tz database such as Europe/Berlin or America/Chicago; did you "
                        + "mean 'Europe/Berlin'?",
                BROKEN + ":14:7: unknown key 'publsh' in the 'forecast' of rule 'bad-forecast': expected one of "
                        + "channel, reaches, window, refill_rise, publish, before, within, time_zone; did you mean "
                        + "'publish'?",
                BROKEN + ":18:15: the 'forecast' of rule 'no-deadline' needs 'before' (a local time of day such as "
                        + "07:00) or 'within' (a duration such as 12h), or both, found neither",
                BROKEN + ":26:17: 'stop_above' in fill 'trap-fill' (20 %) must be above 'start_below' (30 %): the "
                        + "valve would open and close at once",
                BROKEN + ":33:5: unknown key 'opne_value' in fill 'trap-fill': expected one of id, channel, valve, "
                        + "start_below, stop_above, open_value, max_open, min_rise, rise_window, blocked_by, priority, "
                        + "message; did you mean 'open_value'?",
                BROKEN + ":41:18: 'rise_window' in fill 'fan-fill' (10min) is longer than 'max_open' (5min): the "
                        + "rise could never be checked",
                BROKEN + ":47:57: 'ends_below' in 'alarm_flood' (11) must not be more than 'more_than' (10)");
    }

    @Test
    void referencesOfForecastsAndFillsAreCheckedAgainstTheSite() {
        String rules = DIR + "broken-unattended-references-rules.yaml";
        assertThat(problems(SITE, rules)).containsExactly(
                rules + ":7:25: unknown channel 'he-levle' in rule 'he-forecast': no such channel in " + SITE
                        + "; did you mean 'he-level'?",
                rules + ":7:102: forecast channel 'o2-room' of rule 'he-forecast' is already a channel of " + SITE
                        + ": publish the forecast under a new id",
                rules + ":11:44: unit mismatch: the minimum level of rule 'he-forecast-kelvin' is 10 K, a temperature "
                        + "(K, mK, °C), but channel 'he-level' is in %, a fraction (%)",
                rules + ":16:14: unknown channel 'trap-levl' in fill 'trap-fill': no such channel in " + SITE
                        + "; did you mean 'trap-level'?",
                rules + ":17:12: unknown output 'trap-valv' in fill 'trap-fill': no such output in " + SITE
                        + "; did you mean 'trap-valve'?",
                rules + ":23:18: unknown alarm 'o2-lwo' in 'blocked_by' of fill 'trap-fill': no rule or fill has this "
                        + "id; did you mean 'o2-low'?",
                rules + ":26:9: fill id 'o2-low' is already used at " + rules + ":2:9: a fill's id is also the id of "
                        + "its fault alarm, unique among rules and interlocks",
                rules + ":28:12: output 'fan' of fill 'o2-low' is also driven by interlock 'ventilate': a fill valve "
                        + "has one owner; list that interlock's alarms in 'blocked_by' instead",
                rules + ":32:15: unit mismatch: 'min_rise' of fill 'o2-low' is 2 mm, a length (mm, cm, m), but "
                        + "channel 'trap-level' is in %, a fraction (%)");
    }

    @Test
    void beforeWithoutAnyTimeZoneIsRefused() {
        String site = DIR + "zoneless-site.yaml";
        String rules = DIR + "zoneless-rules.yaml";
        assertThat(problems(site, rules)).containsExactly(rules + ":3:88: 'before: 07:00' in rule "
                + "'he-empty-by-morning' needs a time zone: add 'time_zone' to the forecast or to the 'site' section "
                + "of " + site);
    }

    // --- helpers ---

    private static List<String> problems(String site, String rules) {
        try {
            ConfigurationLoader.load(Path.of(site), List.of(Path.of(rules)), DriverSettingsValidator.acceptAll());
            throw new AssertionError("expected problems");
        } catch (ConfigException e) {
            return e.problems().stream().map(ConfigProblem::toString).toList();
        }
    }
}
