package org.cryowarden.rules.engine;

import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.Direction;

/**
 * High or low limit with deadband: active once past the setpoint, clear once back past it by the deadband. A BAD or
 * STALE reading changes nothing (the stale rule reports the fault; an active alarm is not cleared by a dead sensor);
 * an UNCERTAIN reading may raise the condition but never clears it.
 */
final class LimitEvaluator extends RuleEvaluator {

    private final boolean high;
    private final double setpoint;
    private final double deadband;
    /** The fixed ends of the causes, written once: " above 90 %", " back below 90 % by the deadband of 2 %". */
    private final String pastText;
    private final String backText;

    LimitEvaluator(AlarmRuntime alarm, Direction direction, double setpoint, double deadband, Unit unit) {
        super(alarm);
        this.high = direction == Direction.HIGH;
        this.setpoint = setpoint;
        this.deadband = deadband;
        this.pastText = (high ? " above " : " below ") + Texts.quantity(setpoint, unit);
        this.backText = (high ? " back below " : " back above ") + Texts.quantity(setpoint, unit)
                + (deadband == 0 ? "" : " by the deadband of " + Texts.quantity(deadband, unit));
    }

    @Override
    void onReading(ChannelNode node, Reading reading) {
        Quality quality = reading.quality();
        if (quality == Quality.BAD || quality == Quality.STALE) {
            return;
        }
        double value = reading.value();
        if (!raw) {
            if (high ? value > setpoint : value < setpoint) {
                change(true, reading, Texts.reading(reading) + pastText);
            }
        } else if (quality == Quality.GOOD && (high ? value <= setpoint - deadband : value >= setpoint + deadband)) {
            change(false, reading, Texts.reading(reading) + backText);
        }
        // A GOOD value on this side of the setpoint (or, once past, short of the deadband) changes nothing.
        if (!raw) {
            quietBeyond(0, !high, setpoint);
        } else {
            quietBeyond(0, high, high ? setpoint - deadband : setpoint + deadband);
        }
    }
}
