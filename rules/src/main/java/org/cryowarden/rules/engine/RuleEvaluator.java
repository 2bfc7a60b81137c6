package org.cryowarden.rules.engine;

import org.cryowarden.rules.Reading;

/**
 * The condition of one rule, evaluated on every reading of the channels it reads. It tells its alarm only when the
 * condition changes ({@link AlarmRuntime#condition}); delays and the lifecycle are the alarm's business.
 */
abstract class RuleEvaluator {

    final AlarmRuntime alarm;
    /**
     * The condition now (with the rule's own hysteresis), kept here rather than in the alarm so that a reading
     * which changes nothing touches only this object.
     */
    boolean raw;
    /** The input channel of the latest evaluation, for the alarm list's value. */
    ChannelNode lastNode;

    RuleEvaluator(AlarmRuntime alarm) {
        this.alarm = alarm;
    }

    /**
     * Notes the input of this evaluation. Written only when it differs, so that a reading which changes nothing
     * leaves the rule's cache line clean (a thousand channels' rules do not fit in a core's cache, and dirty lines
     * cost a write-back each on their way out).
     */
    final void saw(ChannelNode node) {
        if (lastNode != node) {
            lastNode = node;
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
