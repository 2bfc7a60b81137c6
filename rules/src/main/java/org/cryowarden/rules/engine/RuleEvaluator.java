package org.cryowarden.rules.engine;

import org.cryowarden.rules.Reading;

/**
 * The condition of one rule, evaluated on every reading of the channels it reads. It tells its alarm only when the
 * condition changes ({@link AlarmRuntime#condition}); delays and the lifecycle are the alarm's business.
 *
 * <p>A rule may name, per input, a band of values in which a GOOD reading cannot change anything it keeps
 * ({@link #quietBetween}); the channel skips the rule for such readings. A thousand channels' rules do not fit in a
 * core's cache, and on a steady night most readings change no rule, so most readings then touch the channel's band
 * array only, not the rule objects.
 */
abstract class RuleEvaluator {

    private static final ChannelNode[] NO_INPUTS = new ChannelNode[0];
    private static final int[] NO_SLOTS = new int[0];

    final AlarmRuntime alarm;
    /** The condition now (with the rule's own hysteresis), kept here rather than in the alarm. */
    boolean raw;
    /** This rule's input channels in input order, and the slot of this rule among each one's rules. */
    private ChannelNode[] inputs = NO_INPUTS;
    private int[] slots = NO_SLOTS;

    RuleEvaluator(AlarmRuntime alarm) {
        this.alarm = alarm;
    }

    /**
     * Called by {@link ChannelNode#addRule}: {@code node} is input number {@code input}, keeping this rule at
     * {@code slot}.
     */
    final void attached(ChannelNode node, int input, int slot) {
        if (input >= inputs.length) {
            inputs = java.util.Arrays.copyOf(inputs, input + 1);
            slots = java.util.Arrays.copyOf(slots, input + 1);
        }
        inputs[input] = node;
        slots[input] = slot;
    }

    /** Input channel number {@code input}. */
    final ChannelNode input(int input) {
        return inputs[input];
    }

    /**
     * The input channel of the latest evaluation, for the alarm list's value: the input whose reading came last
     * (every reading of an input is this rule's to see, whether or not the band let it skip). Null before any.
     */
    final ChannelNode lastNode() {
        ChannelNode last = null;
        for (ChannelNode node : inputs) {
            if (node.delivered > 0 && (last == null || node.delivered > last.delivered)) {
                last = node;
            }
        }
        return last;
    }

    /**
     * Promises that a GOOD reading of input {@code input} strictly between {@code low} and {@code high} changes
     * nothing in this rule, until the rule says otherwise; NaN for either end promises nothing.
     */
    final void quietBetween(int input, double low, double high) {
        double[] bands = inputs[input].quiet;
        int at = 2 * slots[input];
        if (Double.doubleToRawLongBits(bands[at]) != Double.doubleToRawLongBits(low)) {
            bands[at] = low;
        }
        if (Double.doubleToRawLongBits(bands[at + 1]) != Double.doubleToRawLongBits(high)) {
            bands[at + 1] = high;
        }
    }

    /**
     * {@link #quietBetween} for the values strictly above {@code threshold} ({@code above}) or strictly below it:
     * the side of a setpoint, or of its clearing value, on which a condition stays as it is.
     */
    final void quietBeyond(int input, boolean above, double threshold) {
        quietBetween(input, above ? threshold : Double.NEGATIVE_INFINITY, above ? Double.POSITIVE_INFINITY : threshold);
    }

    /** Takes back the promises of every input: each reading is evaluated until the rule names a band again. */
    final void neverQuiet() {
        for (int i = 0; i < inputs.length; i++) {
            if (inputs[i] != null) {
                quietBetween(i, Double.NaN, Double.NaN);
            }
        }
    }

    /** Records a changed condition and hands it to the alarm's delays and lifecycle. */
    final void change(boolean value, Reading reading, String cause) {
        raw = value;
        alarm.conditionChanged(value, reading, cause);
    }

    /** A new reading on {@code node}, one of this rule's inputs, already in that channel's unit. */
    abstract void onReading(ChannelNode node, Reading reading);

    /** {@link #onReading} for {@code node}, the rule's input number {@code input}, as the engine delivers it. */
    void onInput(ChannelNode node, int input, Reading reading) {
        onReading(node, reading);
    }

    /** After a restore with the condition active: hold it until the rule can judge again. */
    void restoredActive() {
    }
}
