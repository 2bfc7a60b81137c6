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

    /** Optimal string alignment distance: Levenshtein plus the swap of two neighbours, the commonest typo. */
    private static int editDistance(String a, String b) {
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
                d[i][j] = Math.min(d[i - 1][j - 1] + cost, Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1));
                if (i > 1 && j > 1 && a.charAt(i - 1) == b.charAt(j - 2) && a.charAt(i - 2) == b.charAt(j - 1)) {
                    d[i][j] = Math.min(d[i][j], d[i - 2][j - 2] + 1);
                }
            }
        }
        return d[a.length()][b.length()];
    }
}
