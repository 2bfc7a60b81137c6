package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.cryowarden.rules.engine.Site.alarm;
import static org.cryowarden.rules.engine.Site.q;

import java.time.Duration;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.DerivedChannelDef;
import org.cryowarden.rules.model.DeviationRule;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.InterlockDef;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.OutputAction;
import org.cryowarden.rules.model.Priority;
import org.cryowarden.rules.model.VoteRule;
import org.junit.jupiter.api.Test;

/** The engine refuses inconsistent configurations, naming the item and where it was written. */
class EngineConfigTest {

    private static final SourcePosition RULE_AT = new SourcePosition("hall-rules.yaml", 12, 5);

    @Test
    void setpointInKelvinOnAPercentChannelIsRefused() {
        Site site = new Site().channel("level_d1", Unit.PERCENT).rule(limit("level_low", "level_d1", "4.2 K"));

        assertThatThrownBy(site::engine).isInstanceOf(IllegalArgumentException.class).hasMessage(
                "hall-rules.yaml:12:5: rule level_low: the setpoint 4.2 K is a temperature (K, mK, °C) "
                        + "but the channel is in %, a fraction (%)");
    }

    @Test
    void voteOverMoreThanSixtyFourChannelsIsRefused() {
        Site site = new Site();
        List<String> heads = new java.util.ArrayList<>();
        for (int i = 0; i < 65; i++) {
            site.channel("o2_head_" + i, Unit.PERCENT_VOLUME);
            heads.add("o2_head_" + i);
        }
        site.rule(new VoteRule("o2_hall_vote", heads, 2, Direction.LOW, q("19.5 %vol"), q("0.2 %vol"), true,
                alarm(Priority.HIGH, "hall oxygen low"), RULE_AT));

        assertThatThrownBy(site::engine).isInstanceOf(IllegalArgumentException.class)
                .hasMessage("hall-rules.yaml:12:5: rule o2_hall_vote: a vote reads at most 64 channels, got 65");
    }

    @Test
    void unknownChannelIsRefusedWithTheClosestName() {
        Site site = new Site().channel("level_d1", Unit.PERCENT).rule(limit("level_low", "levl_d1", "20 %"));

        assertThatThrownBy(site::engine).hasMessage(
                "hall-rules.yaml:12:5: rule level_low: unknown channel 'levl_d1': did you mean 'level_d1'?");
    }

    @Test
    void ruleIdUsedTwiceIsRefusedWithBothPositions() {
        Site site = new Site().channel("level_d1", Unit.PERCENT).rule(limit("level_low", "level_d1", "20 %"))
                .rule(new LimitRule("level_low", "level_d1", Direction.LOW, q("10 %"), q("0 %"),
                        alarm(Priority.LOW, "again"), new SourcePosition("more-rules.yaml", 3, 3)));

        assertThatThrownBy(site::engine).hasMessage(
                "more-rules.yaml:3:3: rule level_low: is defined twice (first at hall-rules.yaml:12:5)");
    }

    @Test
    void unknownInterlockIsRefused() {
        Site site = new Site().channel("o2_hall", Unit.PERCENT_VOLUME).output("purge_fan", 0)
                .interlock(new InterlockDef("hall_purge", "purge", List.of(new OutputAction("purge_fan", 1)), RULE_AT))
                .rule(new LimitRule("o2_low", "o2_hall", Direction.LOW, q("19.5 %vol"), q("0 %vol"),
                        alarm(Priority.HIGH, "low", Duration.ZERO, Duration.ZERO, false, List.of(),
                                Optional.of("hall_prge")), RULE_AT));

        assertThatThrownBy(site::engine).hasMessage(
                "hall-rules.yaml:12:5: rule o2_low: trips unknown interlock 'hall_prge': did you mean 'hall_purge'?");
    }

    @Test
    void interlockActingOnAnUnknownOutputIsRefused() {
        Site site = new Site().output("purge_fan", 0)
                .interlock(new InterlockDef("hall_purge", "purge", List.of(new OutputAction("purge_fn", 1)), RULE_AT));

        assertThatThrownBy(site::engine).hasMessage(
                "hall-rules.yaml:12:5: interlock hall_purge: unknown output 'purge_fn': did you mean 'purge_fan'?");
    }

    @Test
    void suppressionByAnUnknownAlarmIsRefused() {
        Site site = new Site().channel("level_d1", Unit.PERCENT)
                .rule(new LimitRule("level_low", "level_d1", Direction.LOW, q("20 %"), q("0 %"),
                        alarm(Priority.LOW, "low", Duration.ZERO, Duration.ZERO, false, List.of("d1_maintenace"),
                                Optional.empty()), RULE_AT))
                .rule(limit("d1_maintenance", "level_d1", "1 %"));

        assertThatThrownBy(site::engine).hasMessage("hall-rules.yaml:12:5: rule level_low: is suppressed while "
                + "unknown alarm 'd1_maintenace' is active: did you mean 'd1_maintenance'?");
    }

    @Test
    void derivedChannelsThatDependOnEachOtherAreRefused() {
        Site site = new Site().channel("t_a", Unit.KELVIN)
                .derived(new DerivedChannelDef("t_x", "max", List.of("t_a", "t_y"), Unit.KELVIN, Map.of(), "", RULE_AT))
                .derived(new DerivedChannelDef("t_y", "min", List.of("t_a", "t_x"), Unit.KELVIN, Map.of(), "", RULE_AT));

        assertThatThrownBy(site::engine).hasMessage(
                "hall-rules.yaml:12:5: derived channel t_x: its inputs form a cycle through t_x, t_y");
    }

    @Test
    void unknownDerivedFunctionIsRefusedWithTheClosestName() {
        Site site = new Site().channel("t_a", Unit.KELVIN).channel("t_b", Unit.KELVIN)
                .derived(new DerivedChannelDef("t_mean", "maen", List.of("t_a", "t_b"), Unit.KELVIN, Map.of(), "", RULE_AT));

        assertThatThrownBy(site::engine).hasMessage("hall-rules.yaml:12:5: derived channel t_mean: unknown function "
                + "'maen': did you mean 'mean'? (built in: min, max, mean, difference, he4_saturation_temperature, "
                        + "n2_saturation_temperature, prt_temperature, level_probe_height, probe_percent_height, litres_flat_bottom, "
                        + "litres_hemispherical_bottom, litres_asme_fd_bottom, litres_torispherical_bottom, "
                        + "oxygen_partial_pressure, boiloff_helium, boiloff_nitrogen)");
    }

    @Test
    void derivedFunctionOverInputsOfAnotherDimensionIsRefused() {
        Site site = new Site().channel("t_a", Unit.KELVIN).channel("p_a", Unit.MILLIBAR)
                .derived(new DerivedChannelDef("mixed", "mean", List.of("t_a", "p_a"), Unit.KELVIN, Map.of(), "", RULE_AT));

        assertThatThrownBy(site::engine).hasMessage("hall-rules.yaml:12:5: derived channel mixed: input p_a is in mbar "
                + "but mean needs a temperature (K, mK, °C) there");
    }

    @Test
    void differenceOfThreeChannelsIsRefused() {
        Site site = new Site().channel("t_a", Unit.KELVIN).channel("t_b", Unit.KELVIN).channel("t_c", Unit.KELVIN)
                .derived(new DerivedChannelDef("d", "difference", List.of("t_a", "t_b", "t_c"), Unit.KELVIN, Map.of(),
                        "", RULE_AT));

        assertThatThrownBy(site::engine).hasMessage(
                "hall-rules.yaml:12:5: derived channel d: difference takes exactly 2 inputs, got 3");
    }

    @Test
    void meanOfASingleChannelIsRefused() {
        Site site = new Site().channel("t_a", Unit.KELVIN)
                .derived(new DerivedChannelDef("t_mean", "mean", List.of("t_a"), Unit.KELVIN, Map.of(), "", RULE_AT));

        assertThatThrownBy(site::engine).hasMessage(
                "hall-rules.yaml:12:5: derived channel t_mean: mean takes at least 2 inputs, got 1");
    }

    @Test
    void deviationToleranceOfAnotherDimensionIsRefused() {
        Site site = new Site().channel("t_a", Unit.KELVIN).channel("t_b", Unit.KELVIN)
                .rule(new DeviationRule("t_disagree", List.of("t_a", "t_b"), q("2 %"), alarm(Priority.LOW, "x"), RULE_AT));

        assertThatThrownBy(site::engine).hasMessage("hall-rules.yaml:12:5: rule t_disagree: the tolerance 2 % is "
                + "a fraction (%) but the channel is in K, a temperature (K, mK, °C)");
    }

    @Test
    void readingForAChannelThatIsNotConfiguredIsAProgrammingError() {
        Site site = new Site().channel("level_d1", Unit.PERCENT);

        assertThatThrownBy(() -> site.engine().onReading(Reading.good("level_d2", 50, Unit.PERCENT, Site.START)))
                .isInstanceOf(IllegalArgumentException.class)
                .hasMessage("channel 'level_d2' is not configured: did you mean 'level_d1'?");
    }

    private static LimitRule limit(String id, String channel, String setpoint) {
        return new LimitRule(id, channel, Direction.LOW, q(setpoint), q("0 %"), alarm(Priority.LOW, id), RULE_AT);
    }
}
