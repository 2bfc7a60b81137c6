package org.cryowarden.rules.config;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.model.InterlockDef;
import org.cryowarden.rules.model.RuleDef;

/**
 * What one rule-set file yielded, for the checks across files: the rules and interlocks that loaded, and every
 * id the file declared, even those whose definition had errors (so that a reference to them is not reported
 * as unknown as well).
 */
record RuleFile(
        String label,
        List<RuleDef> rules,
        List<InterlockDef> interlocks,
        Map<String, SourcePosition> ruleIds,
        Map<String, SourcePosition> interlockIds,
        SourceMap sources) {

    RuleFile {
        rules = List.copyOf(rules);
        interlocks = List.copyOf(interlocks);
        ruleIds = Collections.unmodifiableMap(new LinkedHashMap<>(ruleIds));
        interlockIds = Collections.unmodifiableMap(new LinkedHashMap<>(interlockIds));
    }

    static RuleFile unreadable(String label) {
        return new RuleFile(label, List.of(), List.of(), Map.of(), Map.of(), new SourceMap());
    }
}
