package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;
import static org.cryowarden.rules.engine.Site.alarm;
import static org.cryowarden.rules.engine.Site.at;
import static org.cryowarden.rules.engine.Site.q;

import java.time.Duration;
import java.util.List;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.Priority;
import org.cryowarden.rules.model.VoteRule;
import org.junit.jupiter.api.Test;

/** 2oo3 voting over oxygen sensors at the deficiency limit of 19.5 %vol (29 CFR 1910.146(b)). */
class VoteRuleTest {

    @Test
    void oneLowSensorOfThreeDoesNotAlarm() {
        Site site = oxygenVote(true);
        allNormal(site);

        assertThat(site.read("o2_a", 19.0, Unit.PERCENT_VOLUME)).isEmpty();
    }

    @Test
    void twoLowSensorsOfThreeAlarm() {
        Site site = oxygenVote(true);
        allNormal(site);
        site.read("o2_a", 19.0, Unit.PERCENT_VOLUME);

        assertThat(site.read("o2_c", 19.2, Unit.PERCENT_VOLUME)).containsExactly(
                "18:00:00 o2_vote normal -> active-unacknowledged: "
                        + "2oo3 met: 2 of 3 below 19.5 %vol or faulted (o2_a 19 %vol, o2_c 19.2 %vol)");
    }

    @Test
    void badSensorCountsAsTrippedSoOneLowSensorThenAlarms() {
        Site site = oxygenVote(true);
        allNormal(site);
        site.bad("o2_b", Unit.PERCENT_VOLUME, "cell open circuit");

        assertThat(site.read("o2_a", 19.0, Unit.PERCENT_VOLUME)).containsExactly(
                "18:00:00 o2_vote normal -> active-unacknowledged: 2oo3 met: 2 of 3 below 19.5 %vol or faulted "
                        + "(o2_a 19 %vol, o2_b BAD (cell open circuit))");
    }

    @Test
    void faultsDoNotCountWhenTheRuleSaysSo() {
        Site site = oxygenVote(false);
        allNormal(site);
        site.bad("o2_b", Unit.PERCENT_VOLUME, "cell open circuit");

        assertThat(site.read("o2_a", 19.0, Unit.PERCENT_VOLUME)).isEmpty();
    }

    @Test
    void silentSensorCountsAsTrippedOnceStale() {
        Site site = oxygenVote(true);
        allNormal(site);
        site.read("o2_a", 19.0, Unit.PERCENT_VOLUME);
        for (int second = 1; second < 5; second++) {
            site.advance(Duration.ofSeconds(1));
            site.read("o2_a", 19.0, Unit.PERCENT_VOLUME);
            site.read("o2_b", 20.9, Unit.PERCENT_VOLUME);
        }

        assertThat(site.advance(Duration.ofSeconds(1))).containsExactly(
                "18:00:05 o2_vote normal -> active-unacknowledged: 2oo3 met: 2 of 3 below 19.5 %vol or faulted "
                        + "(o2_a 19 %vol, o2_c STALE (no reading for 5s, polled every 1s))");
    }

    @Test
    void eachChannelClearsOnlyPastTheDeadband() {
        Site site = oxygenVote(true);
        allNormal(site);
        site.read("o2_a", 19.0, Unit.PERCENT_VOLUME);
        site.read("o2_b", 19.0, Unit.PERCENT_VOLUME);

        assertThat(site.read("o2_a", 19.6, Unit.PERCENT_VOLUME)).isEmpty();
        assertThat(site.read("o2_a", 19.7, Unit.PERCENT_VOLUME)).containsExactly(
                "18:00:00 o2_vote active-unacknowledged -> returned-unacknowledged: "
                        + "2oo3 no longer met: 1 of 3 below 19.5 %vol or faulted (o2_b 19 %vol)");
    }

    private static void allNormal(Site site) {
        // Normal air: 20.9 %vol oxygen (29 CFR 1910.146 background; common practice).
        for (String channel : List.of("o2_a", "o2_b", "o2_c")) {
            assertThat(site.read(channel, 20.9, Unit.PERCENT_VOLUME)).isEmpty();
        }
    }

    private static Site oxygenVote(boolean faultCountsAsTripped) {
        return new Site().channel("o2_a", Unit.PERCENT_VOLUME).channel("o2_b", Unit.PERCENT_VOLUME)
                .channel("o2_c", Unit.PERCENT_VOLUME)
                .rule(new VoteRule("o2_vote", List.of("o2_a", "o2_b", "o2_c"), 2, Direction.LOW, q("19.5 %vol"),
                        q("0.2 %vol"), faultCountsAsTripped, alarm(Priority.CRITICAL, "Oxygen deficiency, 2oo3"),
                        at("o2_vote")));
    }
}
