package org.cryowarden.rules.config;

import java.util.Collection;
import org.cryowarden.rules.NameMatch;

/** "Did you mean" for misspelt keys, ids, units and words: the closest candidate within a small edit distance. */
final class Suggestions {

    private Suggestions() {
    }

    /** {@code "; did you mean 'x'?"}, or an empty text when no candidate is close enough. */
    static String didYouMean(String word, Collection<String> candidates) {
        String best = closest(word, candidates);
        return best == null ? "" : "; did you mean '" + best + "'?";
    }

    static String closest(String word, Collection<String> candidates) {
        return NameMatch.closest(word, candidates).orElse(null);
    }
}
