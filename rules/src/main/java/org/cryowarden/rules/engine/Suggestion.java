package org.cryowarden.rules.engine;

import java.util.Collection;
import org.cryowarden.rules.NameMatch;

/** "Did you mean" for ids an operator or a configuration got slightly wrong. */
final class Suggestion {

    private Suggestion() {
    }

    /** {@code ": did you mean 'x'?"} for the closest candidate within a small edit distance, else empty. */
    static String didYouMean(String wrong, Collection<String> candidates) {
        return NameMatch.closest(wrong, candidates).map(best -> ": did you mean '" + best + "'?").orElse("");
    }
}
