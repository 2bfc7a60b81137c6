package org.cryowarden.rules.model;

import java.util.List;
import org.cryowarden.rules.SourcePosition;

/**
 * One rule of a rule set. Each rule owns exactly one alarm whose id is the rule's id. Setpoints keep the
 * unit they were written in; the engine converts them into the channel's unit when it is built.
 */
public sealed interface RuleDef permits LimitRule, RateRule, StaleRule, VoteRule, DeviationRule, ForecastRule {

    /** Unique over all rule sets of a site; also the alarm id. */
    String id();

    AlarmOptions alarm();

    /** The channels this rule reads, for indexing and reference checks. */
    List<String> inputs();

    SourcePosition position();
}
