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
import org.cryowarden.rules.model.InterlockDef;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.OutputAction;
import org.cryowarden.rules.model.Priority;
import org.junit.jupiter.api.Test;

/** Oxygen at 18 %vol (evacuate, common practice) trips the hall interlock: purge fan on, helium supply valve shut. */
class InterlockTest {

    @Test
    void alarmActivationTripsTheInterlockAndCommandsItsOutputs() {
        Site site = hall();

        List<EngineEvent> events = site.engine().onReading(
                org.cryowarden.rules.Reading.good("o2_hall", 17.8, Unit.PERCENT_VOLUME, site.clock.wallNow()));

        assertThat(Site.describe(events)).containsExactly(
                "18:00:00 o2_evacuate normal -> active-unacknowledged: o2_hall 17.8 %vol below 18 %vol",
                "18:00:00 hall_purge tripped by o2_evacuate",
                "18:00:00 purge_fan := 1",
                "18:00:00 he_supply_valve := 0");
        InterlockTripped trip = (InterlockTripped) events.get(1);
        assertThat(trip.cause()).isEqualTo("tripped by o2_evacuate: o2_hall 17.8 %vol below 18 %vol");
        assertThat(trip.commands()).containsExactly((OutputCommand) events.get(2), (OutputCommand) events.get(3));
    }

    @Test
    void tripStaysLatchedAfterTheCauseClearsUntilAnOperatorResetsIt() {
        Site site = hall();
        site.read("o2_hall", 17.8, Unit.PERCENT_VOLUME);
        site.read("o2_hall", 20.9, Unit.PERCENT_VOLUME);

        assertThat(site.engine().interlocks().get(0).tripped()).isTrue();
        assertThat(site.engine().interlocks().get(0).causes()).containsExactly("o2_evacuate");
        site.advance(Duration.ofMinutes(10));

        CommandResult reset = site.engine().reset("hall_purge", "dana");
        assertThat(reset.isOk()).isTrue();
        assertThat(Site.describe(reset.events())).containsExactly(
                "18:10:00 hall_purge reset by dana",
                "18:10:00 purge_fan := 0",
                "18:10:00 he_supply_valve := 1");
        assertThat(site.engine().interlocks().get(0).tripped()).isFalse();
    }

    @Test
    void resetIsRefusedWhileTheCausePersists() {
        Site site = hall();
        site.read("o2_hall", 17.8, Unit.PERCENT_VOLUME);
        site.read("o2_hall", 18.1, Unit.PERCENT_VOLUME);

        CommandResult reset = site.engine().reset("hall_purge", "dana");

        // 18.1 is above 18 but inside the 0.5 %vol deadband: the condition still holds.
        assertThat(reset.refusal()).contains("interlock hall_purge cannot be reset while its cause persists: "
                + "alarm o2_evacuate is still active (o2_hall 17.8 %vol below 18 %vol); clear the cause first, then reset");
        assertThat(reset.events()).isEmpty();
        assertThat(site.engine().interlocks().get(0).tripped()).isTrue();
    }

    @Test
    void resetOfAnInterlockThatIsNotTrippedOrUnknownIsRefused() {
        Site site = hall();

        assertThat(site.engine().reset("hall_purge", "dana").refusal())
                .contains("interlock hall_purge is not tripped: there is nothing to reset");
        assertThat(site.engine().reset("hall_prge", "dana").refusal())
                .contains("there is no interlock 'hall_prge': did you mean 'hall_purge'?");
        assertThat(site.engine().reset("hall_purge", " ").refusal())
                .contains("an operator name is required: say who is acting");
    }

    @Test
    void bypassedInterlockDoesNotTripButTheAlarmStillRaises() {
        Site site = hall();
        CommandResult bypass = site.engine().bypass("hall_purge", "erik", "fan motor replaced", Duration.ofHours(2));
        assertThat(Site.describe(bypass.events())).containsExactly(
                "18:00:00 hall_purge bypassed by erik until 20:00:00");
        assertThat(bypass.events().get(0).cause()).isEqualTo("bypassed by erik for 2h: fan motor replaced");

        assertThat(site.read("o2_hall", 17.8, Unit.PERCENT_VOLUME)).containsExactly(
                "18:00:00 o2_evacuate normal -> active-unacknowledged: o2_hall 17.8 %vol below 18 %vol");
        assertThat(site.engine().interlocks().get(0).bypass()).contains(
                new Bypass("erik", "fan motor replaced", Site.START.plus(Duration.ofHours(2)), Duration.ofHours(2)));
    }

    @Test
    void bypassExpiringWhileTheCauseIsStillActiveTripsAtOnce() {
        Site site = hall();
        site.engine().bypass("hall_purge", "erik", "fan motor replaced", Duration.ofHours(2));
        site.read("o2_hall", 17.8, Unit.PERCENT_VOLUME);

        assertThat(site.advance(Duration.ofMinutes(119))).isEmpty();
        assertThat(site.advance(Duration.ofMinutes(1))).containsExactly(
                "20:00:00 hall_purge bypass ended: bypass by erik expired after 2h",
                "20:00:00 hall_purge tripped by o2_evacuate",
                "20:00:00 purge_fan := 1",
                "20:00:00 he_supply_valve := 0");
    }

    @Test
    void bypassEndedEarlyWithTheCauseClearLeavesTheInterlockArmed() {
        Site site = hall();
        site.engine().bypass("hall_purge", "erik", "fan motor replaced", Duration.ofHours(2));
        site.read("o2_hall", 17.8, Unit.PERCENT_VOLUME);
        site.read("o2_hall", 20.9, Unit.PERCENT_VOLUME);

        CommandResult ended = site.engine().endBypass("hall_purge", "erik");
        assertThat(Site.describe(ended.events())).containsExactly("18:00:00 hall_purge bypass ended: bypass ended by erik");
        assertThat(((BypassEnded) ended.events().get(0)).endedBy()).contains("erik");
        assertThat(site.engine().endBypass("hall_purge", "erik").refusal()).contains("interlock hall_purge is not bypassed");
        assertThat(site.read("o2_hall", 17.5, Unit.PERCENT_VOLUME)).contains("18:00:00 hall_purge tripped by o2_evacuate");
    }

    @Test
    void bypassNeedsAReasonAPositiveDurationAndNoBypassAlreadyRunning() {
        Site site = hall();
        Engine engine = site.engine();

        assertThat(engine.bypass("hall_purge", "erik", "", Duration.ofHours(1)).refusal())
                .contains("a bypass needs a reason the next operator can read");
        assertThat(engine.bypass("hall_purge", "erik", "test", Duration.ofSeconds(-1)).refusal())
                .contains("a bypass needs a positive duration, got -1s");
        engine.bypass("hall_purge", "erik", "test", Duration.ofHours(1));
        assertThat(engine.bypass("hall_purge", "dana", "test", Duration.ofHours(1)).refusal())
                .contains("interlock hall_purge is already bypassed by erik until 2025-01-15T19:00:00Z: "
                        + "end that bypass first");
    }

    @Test
    void secondCauseOfATrippedInterlockMustAlsoClearBeforeReset() {
        Site site = hall().channel("o2_pit", Unit.PERCENT_VOLUME)
                .rule(new LimitRule("o2_pit_evacuate", "o2_pit", Direction.LOW, q("18 %vol"), q("0.5 %vol"),
                        alarm(Priority.CRITICAL, "Evacuate the pit", Duration.ZERO, Duration.ZERO, false, List.of(),
                                Optional.of("hall_purge")), at("o2_pit_evacuate")));
        site.read("o2_hall", 17.8, Unit.PERCENT_VOLUME);
        assertThat(site.read("o2_pit", 17.0, Unit.PERCENT_VOLUME)).containsExactly(
                "18:00:00 o2_pit_evacuate normal -> active-unacknowledged: o2_pit 17 %vol below 18 %vol");
        site.read("o2_hall", 20.9, Unit.PERCENT_VOLUME);

        assertThat(site.engine().interlocks().get(0).causes()).containsExactly("o2_evacuate", "o2_pit_evacuate");
        assertThat(site.engine().reset("hall_purge", "dana").refusal()).hasValueSatisfying(
                reason -> assertThat(reason).contains("alarm o2_pit_evacuate is still active"));
    }

    @Test
    void resetLeavesAnOutputHeldByAnotherTrippedInterlockAlone() {
        Site site = hall().channel("p_bath", Unit.MILLIBAR)
                .rule(new LimitRule("p_bath_high", "p_bath", Direction.HIGH, q("1500 mbar"), q("0 mbar"),
                        alarm(Priority.HIGH, "Bath pressure high", Duration.ZERO, Duration.ZERO, false, List.of(),
                                Optional.of("supply_stop")), at("p_bath_high")))
                .interlock(new InterlockDef("supply_stop", "Stop the helium supply",
                        List.of(new OutputAction("he_supply_valve", 0)), at("supply_stop")));
        site.read("o2_hall", 17.8, Unit.PERCENT_VOLUME);
        site.read("p_bath", 1600, Unit.MILLIBAR);
        site.read("o2_hall", 20.9, Unit.PERCENT_VOLUME);

        assertThat(Site.describe(site.engine().reset("hall_purge", "dana").events())).containsExactly(
                "18:00:00 hall_purge reset by dana",
                "18:00:00 purge_fan := 0");
    }

    private static Site hall() {
        return new Site().channel("o2_hall", Unit.PERCENT_VOLUME)
                .output("purge_fan", 0).output("he_supply_valve", 1)
                .rule(new LimitRule("o2_evacuate", "o2_hall", Direction.LOW, q("18 %vol"), q("0.5 %vol"),
                        alarm(Priority.CRITICAL, "Evacuate the magnet hall", Duration.ZERO, Duration.ZERO, false,
                                List.of(), Optional.of("hall_purge")), at("o2_evacuate")))
                .interlock(new InterlockDef("hall_purge", "Purge the hall and stop the helium supply",
                        List.of(new OutputAction("purge_fan", 1), new OutputAction("he_supply_valve", 0)),
                        at("hall_purge")));
    }
}
