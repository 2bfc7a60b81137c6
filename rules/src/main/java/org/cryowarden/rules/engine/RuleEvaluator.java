package org.cryowarden.rules.engine;

import org.cryowarden.rules.Reading;

/**
 * The condition of one rule, evaluated on every reading of the channels it reads. It tells its alarm only when the
 * condition changes ({@link AlarmRuntime#condition}); delays and the lifecycle are the alarm's business.
 */
abstract class RuleEvaluator {

    final AlarmRuntime alarm;

    RuleEvaluator(AlarmRuntime alarm) {
        this.alarm = alarm;
    }

    /** A new reading on {@code node}, one of this rule's inputs, already in that channel's unit. */
    abstract void onReading(ChannelNode node, Reading reading);

    /** After a restore with the condition active: hold it until the rule can judge again. */
    void restoredActive() {
    }
}
