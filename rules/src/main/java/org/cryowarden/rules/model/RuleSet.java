package org.cryowarden.rules.model;

import java.util.List;

/** The rules and interlocks of one or more rule-set files, merged. */
public record RuleSet(List<RuleDef> rules, List<InterlockDef> interlocks) {

    public RuleSet {
        rules = List.copyOf(rules);
        interlocks = List.copyOf(interlocks);
    }
}
