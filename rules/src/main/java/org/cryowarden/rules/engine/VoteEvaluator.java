package org.cryowarden.rules.engine;

import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.model.Direction;

/**
 * M-out-of-N voting. Each channel is tripped when past its setpoint (with the deadband for clearing), and, fail-safe,
 * when its reading is BAD or STALE unless the rule says faults do not count. A channel that has never reported
 * counts as not tripped until its stale timeout turns it STALE.
 */
final class VoteEvaluator extends RuleEvaluator {

    /** The most channels one vote reads: each channel's flags are one bit of a {@code long}. */
    static final int MAX_CHANNELS = Long.SIZE;

    private final ChannelNode[] channels;
    private final int required;
    private final boolean high;
    /**
     * Per channel, side by side: the value past which it trips, then the value back past which it clears (the
     * setpoint less or plus the deadband), so that a reading reads one place in memory besides this object.
     */
    private final double[] limits;
    private final boolean faultTrips;
    /** Bit {@code i} set: channel {@code i} tripped, faulted (BAD or STALE last), reported at least once. */
    private long tripped;
    private long faulted;
    private long reported;
    private final long everyChannel;
    private final String setpointText;
    private int count;
    private boolean holdUntilAllReported;

    VoteEvaluator(AlarmRuntime alarm, ChannelNode[] channels, int required, Direction direction, double[] setpoints,
            double[] deadbands, boolean faultTrips, String setpointText) {
        super(alarm);
        if (channels.length > MAX_CHANNELS) {
            throw new IllegalStateException("a vote of " + channels.length + " channels reached the engine");
        }
        this.channels = channels;
        this.required = required;
        this.high = direction == Direction.HIGH;
        this.limits = new double[2 * channels.length];
        for (int i = 0; i < channels.length; i++) {
            limits[2 * i] = setpoints[i];
            limits[2 * i + 1] = high ? setpoints[i] - deadbands[i] : setpoints[i] + deadbands[i];
        }
        this.faultTrips = faultTrips;
        this.everyChannel = channels.length == Long.SIZE ? -1L : (1L << channels.length) - 1;
        this.setpointText = setpointText;
    }

    @Override
    void onReading(ChannelNode node, Reading reading) {
        onInput(node, indexOf(node), reading);
    }

    @Override
    void onInput(ChannelNode node, int i, Reading reading) {
        long bit = 1L << i;
        if ((reported & bit) == 0) {
            reported |= bit;
        }
        boolean was = (tripped & bit) != 0;
        boolean now;
        Quality quality = reading.quality();
        if (quality == Quality.BAD || quality == Quality.STALE) {
            faulted |= bit;
            now = faultTrips;
        } else {
            double value = reading.value();
            double setpoint = limits[2 * i];
            double clearAt = limits[2 * i + 1];
            boolean past = high ? value > setpoint : value < setpoint;
            boolean clear = high ? value <= clearAt : value >= clearAt;
            boolean wasFaulted = (faulted & bit) != 0;
            if (past) {
                now = true;
            } else if (quality == Quality.GOOD && (clear || wasFaulted)) {
                now = false;
            } else {
                now = was;
            }
            if (quality == Quality.GOOD && wasFaulted) {
                faulted &= ~bit;
            }
        }
        if (now != was) {
            tripped ^= bit;
            count += now ? 1 : -1;
        }
        boolean met = count >= required;
        if (holdUntilAllReported) {
            if (reported != everyChannel) {
                return;
            }
            holdUntilAllReported = false;
        }
        if (met != raw) {
            change(met, reading, describe(met));
        }
        // Past the hold after a restore, and this channel not faulted: a GOOD value that leaves it tripped or not as
        // it is changes nothing (the count, and so the condition, stay).
        if ((faulted & bit) != 0) {
            quietBetween(i, Double.NaN, Double.NaN);
        } else if ((tripped & bit) != 0) {
            quietBeyond(i, high, limits[2 * i + 1]);
        } else {
            quietBeyond(i, !high, limits[2 * i]);
        }
    }

    @Override
    void restoredActive() {
        holdUntilAllReported = true;
        neverQuiet();
    }

    private String describe(boolean met) {
        StringBuilder text = new StringBuilder();
        text.append(required).append("oo").append(channels.length).append(met ? " met: " : " no longer met: ")
                .append(count).append(" of ").append(channels.length).append(high ? " above " : " below ")
                .append(setpointText).append(faultTrips ? " or faulted" : "");
        String separator = " (";
        for (int i = 0; i < channels.length; i++) {
            if ((tripped & (1L << i)) != 0 && channels[i].latest != null) {
                text.append(separator).append(Texts.reading(channels[i].latest));
                separator = ", ";
            }
        }
        if (!separator.equals(" (")) {
            text.append(')');
        }
        return text.toString();
    }

    private int indexOf(ChannelNode node) {
        for (int i = 0; i < channels.length; i++) {
            if (channels[i] == node) {
                return i;
            }
        }
        throw new IllegalStateException(node.id + " is not an input of vote " + alarm.id);
    }
}
