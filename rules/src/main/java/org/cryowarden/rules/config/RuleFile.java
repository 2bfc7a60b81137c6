package org.cryowarden.rules.config;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.model.FillDef;
import org.cryowarden.rules.model.FloodDef;
import org.cryowarden.rules.model.InterlockDef;
import org.cryowarden.rules.model.RuleDef;

/**
 * What one rule-set file yielded, for the checks across files: the rules and interlocks that loaded, and every
 * id the file declared, even those whose definition had errors (so that a reference to them is not reported
 * as unknown as well), its fill controllers and its alarm-flood criterion, if it states one.
 */
record RuleFile(
        String label,
        List<RuleDef> rules,
        List<InterlockDef> interlocks,
        Map<String, SourcePosition> ruleIds,
        Map<String, SourcePosition> interlockIds,
        List<FillDef> fills,
        Map<String, SourcePosition> fillIds,
        Optional<FloodDef> flood,
        Optional<SourcePosition> floodPosition,
        SourceMap sources) {

    RuleFile {
        rules = List.copyOf(rules);
        interlocks = List.copyOf(interlocks);
        fills = List.copyOf(fills);
        fillIds = Collections.unmodifiableMap(new LinkedHashMap<>(fillIds));
        ruleIds = Collections.unmodifiableMap(new LinkedHashMap<>(ruleIds));
        interlockIds = Collections.unmodifiableMap(new LinkedHashMap<>(interlockIds));
    }

    static RuleFile unreadable(String label) {
        return new RuleFile(label, List.of(), List.of(), Map.of(), Map.of(), List.of(), Map.of(), Optional.empty(),
                Optional.empty(), new SourceMap());
    }
}
