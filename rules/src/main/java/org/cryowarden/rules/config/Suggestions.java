package org.cryowarden.rules.config;

import java.util.Collection;
import java.util.Locale;

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
        String wanted = word.toLowerCase(Locale.ROOT);
        String best = null;
        int bestDistance = Integer.MAX_VALUE;
        for (String candidate : candidates) {
            int distance = editDistance(wanted, candidate.toLowerCase(Locale.ROOT));
            if (distance < bestDistance) {
                bestDistance = distance;
                best = candidate;
            }
        }
        int allowed = Math.max(2, wanted.length() / 3);
        return best != null && bestDistance <= allowed && bestDistance < Math.max(wanted.length(), 1) ? best : null;
    }

    /** Optimal string alignment distance: insertions, deletions, substitutions and adjacent swaps cost 1. */
    static int editDistance(String a, String b) {
        int[][] d = new int[a.length() + 1][b.length() + 1];
        for (int i = 0; i <= a.length(); i++) {
            d[i][0] = i;
        }
        for (int j = 0; j <= b.length(); j++) {
            d[0][j] = j;
        }
        for (int i = 1; i <= a.length(); i++) {
            for (int j = 1; j <= b.length(); j++) {
                int cost = a.charAt(i - 1) == b.charAt(j - 1) ? 0 : 1;
                d[i][j] = Math.min(Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1), d[i - 1][j - 1] + cost);
                if (i > 1 && j > 1 && a.charAt(i - 1) == b.charAt(j - 2) && a.charAt(i - 2) == b.charAt(j - 1)) {
                    d[i][j] = Math.min(d[i][j], d[i - 2][j - 2] + 1);
                }
            }
        }
        return d[a.length()][b.length()];
    }
}
