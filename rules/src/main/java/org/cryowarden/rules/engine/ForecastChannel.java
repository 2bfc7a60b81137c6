package org.cryowarden.rules.engine;

import org.cryowarden.rules.Unit;

/**
 * The channel a forecast rule publishes: hours until the forecast crossing (unit h), GOOD when there is a
 * forecast, UNCERTAIN with NaN and a reason while there is none (too few readings, level not falling), BAD or
 * STALE with NaN when its input is. Other rules read it like any channel (e.g. a limit below 4 h).
 */
final class ForecastChannel extends ChannelNode {

    ForecastChannel(String id) {
        super(id, Unit.HOUR);
    }
}
