package org.cryowarden.rules.engine;

import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;

/**
 * A channel inside the engine, measured or derived: its latest reading and, indexed here, the rules that read it
 * and the derived channels computed from it. A reading costs the rules of its own channel, not all rules.
 */
abstract class ChannelNode {

    private static final RuleEvaluator[] NO_RULES = new RuleEvaluator[0];
    private static final DerivedChannel[] NO_DERIVED = new DerivedChannel[0];

    final String id;
    final Unit unit;
    RuleEvaluator[] rules = NO_RULES;
    DerivedChannel[] dependents = NO_DERIVED;
    /** Null until the first reading. */
    Reading latest;

    ChannelNode(String id, Unit unit) {
        this.id = id;
        this.unit = unit;
    }

    void addRule(RuleEvaluator rule) {
        RuleEvaluator[] grown = java.util.Arrays.copyOf(rules, rules.length + 1);
        grown[rules.length] = rule;
        rules = grown;
    }

    void addDependent(DerivedChannel derived) {
        DerivedChannel[] grown = java.util.Arrays.copyOf(dependents, dependents.length + 1);
        grown[dependents.length] = derived;
        dependents = grown;
    }
}
