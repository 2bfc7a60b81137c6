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
    private static final int[] NO_INPUTS = new int[0];
    private static final double[] NO_BANDS = new double[0];

    final String id;
    final Unit unit;
    RuleEvaluator[] rules = NO_RULES;
    /**
     * This channel's position among the inputs of each rule in {@link #rules}, found once here so that a rule of
     * several channels (vote, deviation) need not search for it on every reading.
     */
    int[] ruleInputs = NO_INPUTS;
    /**
     * Two values per rule of {@link #rules}: a GOOD reading strictly between them changes nothing in that rule,
     * which is then not called ({@link RuleEvaluator#quietBetween}); NaN until the rule names its band.
     */
    double[] quiet = NO_BANDS;
    DerivedChannel[] dependents = NO_DERIVED;
    /** Null until the first reading. */
    Reading latest;
    /** The engine's delivery count at this channel's latest reading: which input of a rule read last; 0 before. */
    long delivered;
    /**
     * Monotonic time of the latest GOOD reading, or of the engine's start before any (set there by the stale rules
     * that read this channel).
     */
    long lastGood;

    ChannelNode(String id, Unit unit) {
        this.id = id;
        this.unit = unit;
    }

    /** Adds a rule that reads this channel as its input number {@code input} (0 for a rule of one channel). */
    void addRule(RuleEvaluator rule, int input) {
        RuleEvaluator[] grown = java.util.Arrays.copyOf(rules, rules.length + 1);
        grown[rules.length] = rule;
        int[] positions = java.util.Arrays.copyOf(ruleInputs, ruleInputs.length + 1);
        positions[ruleInputs.length] = input;
        double[] bands = java.util.Arrays.copyOf(quiet, quiet.length + 2);
        bands[quiet.length] = Double.NaN;
        bands[quiet.length + 1] = Double.NaN;
        rule.attached(this, input, rules.length);
        rules = grown;
        ruleInputs = positions;
        quiet = bands;
    }

    void addDependent(DerivedChannel derived) {
        DerivedChannel[] grown = java.util.Arrays.copyOf(dependents, dependents.length + 1);
        grown[dependents.length] = derived;
        dependents = grown;
    }
}
