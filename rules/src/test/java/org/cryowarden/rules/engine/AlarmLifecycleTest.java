package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;
import static org.cryowarden.rules.engine.Site.alarm;
import static org.cryowarden.rules.engine.Site.at;
import static org.cryowarden.rules.engine.Site.q;

import java.time.Duration;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.Priority;
import org.junit.jupiter.api.Test;

/** The ANSI/ISA-18.2-2016 (IEC 62682) alarm states and every transition between them. */
class AlarmLifecycleTest {

    @Test
    void acknowledgedAlarmRecordsOperatorAndNoteAndReturnsToNormalWhenClear() {
        Site site = levelSite(false, List.of());
        site.read("level_d1", 15, Unit.PERCENT);
        site.advance(Duration.ofMinutes(2));

        CommandResult result = site.engine().acknowledge("level_low", "dana", "refill ordered");

        assertThat(result.isOk()).isTrue();
        AlarmTransition ack = (AlarmTransition) result.events().get(0);
        assertThat(ack.from()).isEqualTo(AlarmState.UNACKNOWLEDGED);
        assertThat(ack.to()).isEqualTo(AlarmState.ACKNOWLEDGED);
        assertThat(ack.operator()).contains("dana");
        assertThat(ack.note()).isEqualTo("refill ordered");
        assertThat(ack.cause()).isEqualTo("acknowledged by dana");
        assertThat(site.engine().alarm("level_low").orElseThrow().acknowledgedBy()).contains("dana");
        assertThat(site.read("level_d1", 40, Unit.PERCENT)).containsExactly(
                "18:02:00 level_low active-acknowledged -> normal: level_d1 40 % back above 20 %");
    }

    @Test
    void alarmThatClearsUnacknowledgedWaitsForAcknowledgement() {
        Site site = levelSite(false, List.of());
        site.read("level_d1", 15, Unit.PERCENT);

        assertThat(site.read("level_d1", 25, Unit.PERCENT)).containsExactly(
                "18:00:00 level_low active-unacknowledged -> returned-unacknowledged: level_d1 25 % back above 20 %");
        assertThat(Site.describe(site.engine().acknowledge("level_low", "dana", "").events())).containsExactly(
                "18:00:00 level_low returned-unacknowledged -> normal: acknowledged by dana");
    }

    @Test
    void returnedAlarmThatComesBackIsUnacknowledgedAgain() {
        Site site = levelSite(false, List.of());
        site.read("level_d1", 15, Unit.PERCENT);
        site.read("level_d1", 25, Unit.PERCENT);

        assertThat(site.read("level_d1", 18, Unit.PERCENT)).containsExactly(
                "18:00:00 level_low returned-unacknowledged -> active-unacknowledged: level_d1 18 % below 20 %");
    }

    @Test
    void latchedAlarmStaysUnacknowledgedAfterReturnToNormal() {
        Site site = levelSite(true, List.of());
        site.read("level_d1", 15, Unit.PERCENT);

        assertThat(site.read("level_d1", 60, Unit.PERCENT)).isEmpty();
        assertThat(site.state("level_low")).isEqualTo(AlarmState.UNACKNOWLEDGED);
        assertThat(site.engine().alarm("level_low").orElseThrow().conditionActive()).isFalse();
        assertThat(Site.describe(site.engine().acknowledge("level_low", "dana", "seen").events())).containsExactly(
                "18:00:00 level_low active-unacknowledged -> normal: acknowledged by dana");
    }

    @Test
    void latchedAlarmAcknowledgedWhileActiveReturnsToNormalWhenClear() {
        Site site = levelSite(true, List.of());
        site.read("level_d1", 15, Unit.PERCENT);
        site.engine().acknowledge("level_low", "dana", "");

        assertThat(site.read("level_d1", 60, Unit.PERCENT)).containsExactly(
                "18:00:00 level_low active-acknowledged -> normal: level_d1 60 % back above 20 %");
    }

    @Test
    void shelvedAlarmReturnsByItselfWhenTheShelvingExpires() {
        Site site = levelSite(false, List.of());
        site.read("level_d1", 15, Unit.PERCENT);

        CommandResult shelved = site.engine().shelve("level_low", "erik", Duration.ofHours(1), "probe being replaced");
        assertThat(Site.describe(shelved.events())).containsExactly(
                "18:00:00 level_low active-unacknowledged -> shelved: "
                        + "shelved by erik for 1h until 2025-01-15T19:00:00Z");
        assertThat(((AlarmTransition) shelved.events().get(0)).note()).isEqualTo("probe being replaced");
        assertThat(site.engine().alarm("level_low").orElseThrow().shelving())
                .contains(new Shelving("erik", "probe being replaced", Site.START.plus(Duration.ofHours(1)),
                        Duration.ofHours(1)));

        assertThat(site.read("level_d1", 30, Unit.PERCENT)).isEmpty();
        assertThat(site.read("level_d1", 12, Unit.PERCENT)).isEmpty();
        assertThat(site.advance(Duration.ofMinutes(59))).isEmpty();
        assertThat(site.advance(Duration.ofMinutes(1))).containsExactly(
                "19:00:00 level_low shelved -> active-unacknowledged: shelving by erik expired after 1h");
    }

    @Test
    void alarmThatClearedWhileShelvedReturnsToNormalWhenTheShelvingExpires() {
        Site site = levelSite(false, List.of());
        site.read("level_d1", 15, Unit.PERCENT);
        site.engine().shelve("level_low", "erik", Duration.ofMinutes(30), "filling now");
        site.read("level_d1", 80, Unit.PERCENT);

        assertThat(site.advance(Duration.ofMinutes(30))).containsExactly(
                "18:30:00 level_low shelved -> normal: shelving by erik expired after 30min");
    }

    @Test
    void unshelveEndsTheShelvingEarly() {
        Site site = levelSite(false, List.of());
        site.read("level_d1", 15, Unit.PERCENT);
        site.engine().shelve("level_low", "erik", Duration.ofHours(1), "probe being replaced");
        site.advance(Duration.ofMinutes(5));

        assertThat(Site.describe(site.engine().unshelve("level_low", "dana").events())).containsExactly(
                "18:05:00 level_low shelved -> active-unacknowledged: unshelved by dana");
        assertThat(site.advance(Duration.ofHours(1))).isEmpty();
    }

    @Test
    void alarmIsSuppressedByDesignWhileTheNamedAlarmIsActive() {
        Site site = levelSite(false, List.of("d1_maintenance"))
                .channel("d1_service_switch", Unit.ONE)
                .rule(new LimitRule("d1_maintenance", "d1_service_switch", Direction.HIGH, q("0.5 1"), q("0 1"),
                        alarm(Priority.LOW, "Dewar D1 in maintenance"), at("d1_maintenance")));
        site.read("level_d1", 60, Unit.PERCENT);

        assertThat(site.read("d1_service_switch", 1, Unit.ONE)).containsExactly(
                "18:00:00 d1_maintenance normal -> active-unacknowledged: d1_service_switch 1 1 above 0.5 1",
                "18:00:00 level_low normal -> suppressed-by-design: suppressed by design while d1_maintenance is active");
        assertThat(site.read("level_d1", 5, Unit.PERCENT)).isEmpty();
        assertThat(site.engine().acknowledge("level_low", "dana", "").refusal()).contains(
                "alarm level_low is suppressed by design while d1_maintenance is active: there is nothing to acknowledge");

        assertThat(site.read("d1_service_switch", 0, Unit.ONE)).containsExactly(
                "18:00:00 d1_maintenance active-unacknowledged -> returned-unacknowledged: "
                        + "d1_service_switch 0 1 back below 0.5 1",
                "18:00:00 level_low suppressed-by-design -> active-unacknowledged: "
                        + "suppression by design ended: d1_maintenance is no longer active");
    }

    @Test
    void outOfServiceAlarmIgnoresItsConditionUntilReturnedToService() {
        Site site = levelSite(false, List.of());
        site.read("level_d1", 60, Unit.PERCENT);

        CommandResult removed = site.engine().removeFromService("level_low", "erik", "probe removed for repair");
        assertThat(Site.describe(removed.events())).containsExactly(
                "18:00:00 level_low normal -> out-of-service: removed from service by erik");
        assertThat(site.read("level_d1", 5, Unit.PERCENT)).isEmpty();
        assertThat(site.engine().shelve("level_low", "erik", Duration.ofHours(1), "x").refusal()).contains(
                "alarm level_low is out of service: only an alarm in service can be shelved");

        assertThat(Site.describe(site.engine().returnToService("level_low", "erik").events())).containsExactly(
                "18:00:00 level_low out-of-service -> active-unacknowledged: returned to service by erik");
    }

    @Test
    void everyCommandNeedsAnOperator() {
        Site site = levelSite(false, List.of());
        site.read("level_d1", 15, Unit.PERCENT);

        assertThat(site.engine().acknowledge("level_low", "  ", "").refusal())
                .contains("an operator name is required: say who is acting");
        assertThat(site.engine().shelve("level_low", "", Duration.ofHours(1), "noisy").refusal())
                .contains("an operator name is required: say who is acting");
        assertThat(site.state("level_low")).isEqualTo(AlarmState.UNACKNOWLEDGED);
    }

    @Test
    void unknownAlarmIsRefusedWithTheClosestName() {
        Site site = levelSite(false, List.of());

        assertThat(site.engine().acknowledge("level_lwo", "dana", "").refusal())
                .contains("there is no alarm 'level_lwo': did you mean 'level_low'?");
        assertThat(site.engine().acknowledge("oxygen", "dana", "").refusal())
                .contains("there is no alarm 'oxygen'");
    }

    @Test
    void commandsThatDoNotFitTheStateAreRefusedWithAReason() {
        Site site = levelSite(false, List.of());
        Engine engine = site.engine();
        site.read("level_d1", 60, Unit.PERCENT);

        assertThat(engine.acknowledge("level_low", "dana", "").refusal())
                .contains("alarm level_low is normal: there is nothing to acknowledge");
        site.read("level_d1", 10, Unit.PERCENT);
        engine.acknowledge("level_low", "dana", "");
        assertThat(engine.acknowledge("level_low", "erik", "").refusal())
                .contains("alarm level_low is already acknowledged by dana");
        assertThat(engine.unshelve("level_low", "erik").refusal()).contains("alarm level_low is not shelved");
        assertThat(engine.shelve("level_low", "erik", Duration.ZERO, "noisy").refusal())
                .contains("shelving needs a positive duration, got 0s");
        assertThat(engine.shelve("level_low", "erik", Duration.ofHours(1), " ").refusal())
                .contains("shelving needs a reason the next operator can read");
        engine.shelve("level_low", "erik", Duration.ofHours(1), "noisy");
        assertThat(engine.shelve("level_low", "dana", Duration.ofHours(2), "noisy").refusal())
                .contains("alarm level_low is already shelved by erik until 2025-01-15T19:00:00Z: "
                        + "unshelve it first to shelve it again");
        assertThat(engine.acknowledge("level_low", "dana", "").refusal())
                .contains("alarm level_low is shelved until 2025-01-15T19:00:00Z: unshelve it first");
        assertThat(engine.returnToService("level_low", "dana").refusal()).contains("alarm level_low is in service");
    }

    @Test
    void alarmListShowsStatePriorityMessageAndValue() {
        Site site = levelSite(false, List.of());
        site.read("level_d1", 15, Unit.PERCENT);

        AlarmStatus status = site.engine().alarms().get(0);
        assertThat(status.id()).isEqualTo("level_low");
        assertThat(status.state()).isEqualTo(AlarmState.UNACKNOWLEDGED);
        assertThat(status.priority()).isEqualTo(Priority.MEDIUM);
        assertThat(status.message()).isEqualTo("Dewar D1 level low");
        assertThat(status.lastReading().orElseThrow().value()).isEqualTo(15);
        assertThat(status.since()).isEqualTo(Site.START);
    }

    @Test
    void everyStateHasItsHyphenatedWireWord() {
        assertThat(List.of(AlarmState.values()).stream().map(AlarmState::wire)).containsExactly(
                "normal", "active-unacknowledged", "active-acknowledged", "returned-unacknowledged", "shelved",
                "suppressed-by-design", "out-of-service");
        assertThat(AlarmState.fromWire("active-acknowledged")).contains(AlarmState.ACKNOWLEDGED);
        assertThat(AlarmState.fromWire("acked")).isEmpty();
    }

    private static Site levelSite(boolean latching, List<String> suppressWhile) {
        return new Site().channel("level_d1", Unit.PERCENT, Duration.ofSeconds(10), Duration.ofHours(2), Optional.empty())
                .rule(new LimitRule("level_low", "level_d1", Direction.LOW, q("20 %"), q("0 %"),
                        alarm(Priority.MEDIUM, "Dewar D1 level low", Duration.ZERO, Duration.ZERO, latching,
                                suppressWhile, Optional.empty()),
                        at("level_low")));
    }
}
