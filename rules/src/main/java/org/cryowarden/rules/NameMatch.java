package org.cryowarden.rules;

import java.util.Collection;
import java.util.Locale;
import java.util.Optional;

/**
 * Finds the name someone probably meant ("did you mean 'mean'?") for an id, key, unit or function that is
 * slightly wrong. One measure for the whole program, so every message suggests alike.
 */
public final class NameMatch {

    private NameMatch() {
    }

    /**
     * The candidate closest to {@code word}, ignoring case, if it is close enough to be a typo: at most
     * max(2, length / 3) edits, and fewer edits than the word is long. Ties go to the earlier candidate.
     */
    public static Optional<String> closest(String word, Collection<String> candidates) {
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
        boolean close = best != null && bestDistance <= allowed && bestDistance < Math.max(wanted.length(), 1);
        return close ? Optional.of(best) : Optional.empty();
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
                d[i][j] = Math.min(d[i - 1][j - 1] + cost, Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1));
                if (i > 1 && j > 1 && a.charAt(i - 1) == b.charAt(j - 2) && a.charAt(i - 2) == b.charAt(j - 1)) {
                    d[i][j] = Math.min(d[i][j], d[i - 2][j - 2] + 1);
                }
            }
        }
        return d[a.length()][b.length()];
    }
}
