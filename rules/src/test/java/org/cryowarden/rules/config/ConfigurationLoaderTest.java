package org.cryowarden.rules.config;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.AlarmOptions;
import org.cryowarden.rules.model.DeviationRule;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.InterlockDef;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.OutputAction;
import org.cryowarden.rules.model.Priority;
import org.cryowarden.rules.model.RateRule;
import org.cryowarden.rules.model.RuleSet;
import org.cryowarden.rules.model.StaleRule;
import org.cryowarden.rules.model.VoteRule;
import org.junit.jupiter.api.Test;

class ConfigurationLoaderTest {

    private static final String DIR = "src/test/resources/config/";
    private static final String SITE = DIR + "small-site.yaml";
    private static final String RULES = DIR + "small-rules.yaml";
    private static final String BROKEN = DIR + "broken-rules.yaml";

    @Test
    void smallRuleSetLoadsIntoModelRecords() throws ConfigException {
        Configuration configuration = ConfigurationLoader.load(Path.of(SITE), List.of(Path.of(RULES)),
                DriverSettingsValidator.acceptAll());
        RuleSet rules = configuration.rules();

        assertThat(rules.rules()).containsExactly(
                new VoteRule("o2-low", List.of("o2-a", "o2-b", "o2-c"), 2, Direction.LOW,
                        Quantity.of(19.5, Unit.PERCENT_VOLUME), Quantity.of(0.2, Unit.PERCENT_VOLUME), true,
                        new AlarmOptions(Priority.CRITICAL, "Oxygen low", Duration.ofSeconds(5), Duration.ZERO, true,
                                List.of(), Optional.of("ventilate")),
                        at(RULES, 3, 5)),
                // A limit in kPa(g) on a channel in mbar(g) is accepted; the engine converts it.
                new LimitRule("bath-high", "bath-pressure", Direction.HIGH, Quantity.of(30, Unit.KILOPASCAL_GAUGE),
                        Quantity.of(1, Unit.KILOPASCAL),
                        new AlarmOptions(Priority.HIGH, "Bath pressure high", Duration.ZERO, Duration.ofSeconds(30),
                                false, List.of("o2-low"), Optional.empty()),
                        at(RULES, 10, 5)),
                new RateRule("bath-rising", "bath-pressure", Direction.HIGH, Quantity.of(5, Unit.KILOPASCAL),
                        Duration.ofMinutes(1), Duration.ofMinutes(2),
                        AlarmOptions.simple(Priority.MEDIUM, "Bath pressure rising"), at(RULES, 16, 5)),
                new StaleRule("o2-a-stale", "o2-a", Optional.of(Duration.ofSeconds(10)),
                        AlarmOptions.simple(Priority.HIGH, "Oxygen A silent"), at(RULES, 20, 5)),
                new DeviationRule("o2-disagree", List.of("o2-a", "o2-b"), Quantity.of(1, Unit.PERCENT_VOLUME),
                        AlarmOptions.simple(Priority.LOW, "Oxygen sensors disagree"), at(RULES, 24, 5)));
        assertThat(rules.interlocks()).containsExactly(new InterlockDef("ventilate", "Start the fan",
                List.of(new OutputAction("fan", 1)), at(RULES, 29, 5)));
        assertThat(configuration.channelCount()).isEqualTo(6);
        assertThat(configuration.instrumentCount()).isEqualTo(1);
    }

    @Test
    void brokenRuleSetReportsEveryErrorInOneRun() {
        String site = SITE;
        assertThat(problems(List.of(BROKEN))).containsExactly(
                BROKEN + ":4:22: unknown channel 'o2-aa' in rule 'unknown-channel': no such channel in " + site
                        + "; did you mean 'o2-a'?",
                BROKEN + ":8:35: unit mismatch: the setpoint of rule 'unit-mismatch' is 300 K, a temperature "
                        + "(K, mK, °C), but channel 'o2-a' is in %vol, a gas concentration (%vol, ppm)",
                // 20 kPa(g) is 200 mbar(g): the critical high limit sits below the high one.
                BROKEN + ":12:44: high limit 'bath-hh' (critical) at 20 kPa(g) is below high limit 'bath-h' (high) "
                        + "at 300 mbar(g) on channel 'bath-pressure': the more urgent high limit must be the higher one",
                BROKEN + ":20:44: low limit 'bath-low' at 0.5 bar(g) is not below high limit 'bath-hh' at 20 kPa(g) "
                        + "on channel 'bath-pressure': every low limit must be below every high limit",
                BROKEN + ":20:44: low limit 'bath-low' at 0.5 bar(g) is not below high limit 'bath-h' at 300 mbar(g) "
                        + "on channel 'bath-pressure': every low limit must be below every high limit",
                BROKEN + ":24:44: voting 2oo3 in the 'vote' of rule 'vote-over-two' needs 3 channels, found 2 in "
                        + "'channels' (a 2oo3 over 2 channels)",
                BROKEN + ":28:44: voting 3oo2 in the 'vote' of rule 'vote-impossible' is impossible: M must be "
                        + "between 1 and N (2)",
                BROKEN + ":32:38: voting 1oo1 in the 'vote' of rule 'vote-single' is not a vote: a vote needs at "
                        + "least 2 channels (use a limit rule for a single channel)",
                BROKEN + ":36:43: stale timeout must be longer than the poll period (got 5s < 10s): channel "
                        + "'cold-plate' is polled every 10s",
                BROKEN + ":43:15: 'on_delay' in rule 'bad-duration': '5 sec' is not a duration: expected a number "
                        + "and one of ms, s, min, h, d, e.g. 30s, 5min, 2h or 1h30min",
                BROKEN + ":46:15: unknown priority 'urgnet' in rule 'bad-priority': expected one of critical, high, "
                        + "medium, low",
                BROKEN + ":48:5: missing required key 'message' in rule 'bad-key'",
                BROKEN + ":49:44: unknown key 'dead_band' in the 'limit' of rule 'bad-key': expected one of "
                        + "channel, above, below, deadband; did you mean 'deadband'?",
                BROKEN + ":51:5: unknown key 'mesage' in rule 'bad-key': expected one of id, limit, rate, stale, "
                        + "vote, deviation, forecast, priority, message, on_delay, off_delay, latching, suppress_while, "
                        + "trips; did you mean 'message'?",
                BROKEN + ":56:22: unknown alarm 'unknown-chanel' in 'suppress_while' of rule 'bad-references': no "
                        + "rule has this id; did you mean 'unknown-channel'?",
                BROKEN + ":57:12: unknown interlock 'ventilat' in 'trips' of rule 'bad-references': no interlock "
                        + "has this id; did you mean 'ventilate'?",
                BROKEN + ":59:41: unit mismatch: the setpoint of rule 'no-unit' is 4.5 without a unit, but channel "
                        + "'cold-plate' is in K, a temperature (K, mK, °C): write the unit, e.g. 4.5 K",
                BROKEN + ":64:5: rule 'two-types' has both 'limit' and 'stale': a rule has exactly one type, write "
                        + "one rule for each",
                BROKEN + ":68:48: 'falling_faster_than' in the 'rate' of rule 'bad-rate' must be a rate such as "
                        + "3 %/h or 5 kPa/min (a change per ms, s, min, h or d), found '3 %vol'",
                BROKEN + ":72:27: 'channels' in the 'deviation' of rule 'wrong-type' must be a list of channel ids, "
                        + "found 'o2-a'",
                BROKEN + ":75:5: missing required key 'message' in rule 'missing-message'",
                BROKEN + ":81:18: unknown output 'fna' in interlock 'ventilate': no such output in " + site
                        + "; did you mean 'fan'?",
                BROKEN + ":82:18: unknown output 'o2-a' in interlock 'ventilate': 'o2-a' is a channel, not an output",
                BROKEN + ":85:30: 'value' in an action of interlock 'switch-on' must be a number, found 'on'");
    }

    @Test
    void duplicateIdsAreReportedAcrossFilesAndWithinOne() {
        String a = DIR + "duplicate-a-rules.yaml";
        String b = DIR + "duplicate-b-rules.yaml";
        assertThat(problems(List.of(a, b))).containsExactly(
                b + ":2:9: duplicate rule id 'o2-low': already defined at " + a + ":2:9",
                b + ":6:9: duplicate rule id 'o2-low': already defined at " + b + ":2:9",
                b + ":11:9: duplicate interlock id 'ventilate': already defined at " + a + ":7:9");
    }

    @Test
    void problemsOfSeveralFilesComeSiteFirstThenRuleFilesInTheOrderGiven() {
        String broken = DIR + "broken-site.yaml";
        String missing = DIR + "absent-rules.yaml";
        List<String> problems;
        try {
            ConfigurationLoader.load(Path.of(broken), List.of(Path.of(missing), Path.of(RULES)),
                    DriverSettingsValidator.acceptAll());
            throw new AssertionError("loaded");
        } catch (ConfigException e) {
            problems = e.problems().stream().map(ConfigProblem::toString).toList();
        }
        assertThat(problems.get(0)).startsWith(broken + ":4:21: ");
        assertThat(problems).contains(missing + ": file not found");
        assertThat(problems.indexOf(missing + ": file not found"))
                .isGreaterThan(problems.indexOf(problems.stream().filter(p -> p.startsWith(broken)).reduce((x, y) -> y)
                        .orElseThrow()));
    }

    @Test
    void staleRuleOnADerivedChannelNeedsATimeout() throws Exception {
        Path rules = java.nio.file.Files.createTempFile("derived-", "-rules.yaml");
        try {
            java.nio.file.Files.writeString(rules, "rules:\n  - id: lowest-stale\n    stale: {channel: o2-lowest}\n"
                    + "    priority: high\n    message: x\n");
            assertThat(problems(List.of(rules.toString()))).containsExactly(rules + ":3:22: stale rule "
                    + "'lowest-stale' on derived channel 'o2-lowest' needs a 'timeout': a derived channel has no poll "
                    + "period of its own");
        } finally {
            java.nio.file.Files.delete(rules);
        }
    }

    private static List<String> problems(List<String> ruleFiles) {
        try {
            ConfigurationLoader.load(Path.of(SITE), ruleFiles.stream().map(Path::of).toList(),
                    DriverSettingsValidator.acceptAll());
        } catch (ConfigException e) {
            return e.problems().stream().map(ConfigProblem::toString).toList();
        }
        throw new AssertionError(ruleFiles + " loaded without problems");
    }

    private static SourcePosition at(String file, int line, int column) {
        return new SourcePosition(file, line, column);
    }
}
