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

    private final ChannelNode[] channels;
    private final int required;
    private final boolean high;
    private final double[] setpoints;
    private final double[] deadbands;
    private final boolean faultTrips;
    private final boolean[] tripped;
    private final boolean[] faulted;
    private final boolean[] reported;
    private final String setpointText;
    private int count;
    private boolean holdUntilAllReported;

    VoteEvaluator(AlarmRuntime alarm, ChannelNode[] channels, int required, Direction direction, double[] setpoints,
            double[] deadbands, boolean faultTrips, String setpointText) {
        super(alarm);
        this.channels = channels;
        this.required = required;
        this.high = direction == Direction.HIGH;
        this.setpoints = setpoints;
        this.deadbands = deadbands;
        this.faultTrips = faultTrips;
        this.tripped = new boolean[channels.length];
        this.faulted = new boolean[channels.length];
        this.reported = new boolean[channels.length];
        this.setpointText = setpointText;
    }

    @Override
    void onReading(ChannelNode node, Reading reading) {
        onInput(node, indexOf(node), reading);
    }

    @Override
    void onInput(ChannelNode node, int i, Reading reading) {
        saw(node);
        if (!reported[i]) {
            reported[i] = true;
        }
        boolean was = tripped[i];
        boolean now;
        Quality quality = reading.quality();
        if (quality == Quality.BAD || quality == Quality.STALE) {
            faulted[i] = true;
            now = faultTrips;
        } else {
            double value = reading.value();
            boolean past = high ? value > setpoints[i] : value < setpoints[i];
            boolean clear = high ? value <= setpoints[i] - deadbands[i] : value >= setpoints[i] + deadbands[i];
            if (past) {
                now = true;
            } else if (quality == Quality.GOOD && (clear || faulted[i])) {
                now = false;
            } else {
                now = was;
            }
            if (quality == Quality.GOOD && faulted[i]) {
                faulted[i] = false;
            }
        }
        if (now != was) {
            tripped[i] = now;
            count += now ? 1 : -1;
        }
        boolean met = count >= required;
        if (holdUntilAllReported) {
            if (!allReported()) {
                return;
            }
            holdUntilAllReported = false;
        }
        if (met != raw) {
            change(met, reading, describe(met));
        }
    }

    @Override
    void restoredActive() {
        holdUntilAllReported = true;
    }

    private boolean allReported() {
        for (boolean each : reported) {
            if (!each) {
                return false;
            }
        }
        return true;
    }

    private String describe(boolean met) {
        StringBuilder text = new StringBuilder();
        text.append(required).append("oo").append(channels.length).append(met ? " met: " : " no longer met: ")
                .append(count).append(" of ").append(channels.length).append(high ? " above " : " below ")
                .append(setpointText).append(faultTrips ? " or faulted" : "");
        String separator = " (";
        for (int i = 0; i < channels.length; i++) {
            if (tripped[i] && channels[i].latest != null) {
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
