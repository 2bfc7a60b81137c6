package org.cryowarden.rules.engine;

import java.util.Collection;
import java.util.Locale;

/** "Did you mean" for ids an operator or a configuration got slightly wrong. */
final class Suggestion {

    private Suggestion() {
    }

    /** {@code ": did you mean 'x'?"} for the closest candidate within a small edit distance, else empty. */
    static String didYouMean(String wrong, Collection<String> candidates) {
        String best = null;
        int bestDistance = Integer.MAX_VALUE;
        String lower = wrong.toLowerCase(Locale.ROOT);
        for (String candidate : candidates) {
            int distance = editDistance(lower, candidate.toLowerCase(Locale.ROOT));
            if (distance < bestDistance) {
                bestDistance = distance;
                best = candidate;
            }
        }
        int allowed = Math.max(2, wrong.length() / 4);
        return best != null && bestDistance <= allowed ? ": did you mean '" + best + "'?" : "";
    }

    private static int editDistance(String a, String b) {
        int[] previous = new int[b.length() + 1];
        int[] current = new int[b.length() + 1];
        for (int j = 0; j <= b.length(); j++) {
            previous[j] = j;
        }
        for (int i = 1; i <= a.length(); i++) {
            current[0] = i;
            for (int j = 1; j <= b.length(); j++) {
                int substitution = previous[j - 1] + (a.charAt(i - 1) == b.charAt(j - 1) ? 0 : 1);
                current[j] = Math.min(substitution, Math.min(previous[j] + 1, current[j - 1] + 1));
            }
            int[] swap = previous;
            previous = current;
            current = swap;
        }
        return previous[b.length()];
    }
}
