package org.cryowarden.rules.model;

import java.util.List;
import java.util.Objects;

/**
 * The rules, interlocks and fill controllers of one or more rule-set files, merged, and the alarm-flood
 * criterion ({@link FloodDef#DEFAULT} unless a file states its own).
 */
public record RuleSet(List<RuleDef> rules, List<InterlockDef> interlocks, List<FillDef> fills, FloodDef flood) {

    public RuleSet {
        rules = List.copyOf(rules);
        interlocks = List.copyOf(interlocks);
        fills = List.copyOf(fills);
        Objects.requireNonNull(flood, "flood");
    }

    /** Rules and interlocks only: no fills, the default flood criterion. */
    public RuleSet(List<RuleDef> rules, List<InterlockDef> interlocks) {
        this(rules, interlocks, List.of(), FloodDef.DEFAULT);
    }
}
