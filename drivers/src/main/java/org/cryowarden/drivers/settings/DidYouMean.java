package org.cryowarden.drivers.settings;

import java.util.List;
import java.util.Optional;

/** The closest known name to a mistyped one, by edit distance, when it is close enough to be a typo. */
final class DidYouMean {

    private DidYouMean() {
    }

    static Optional<String> closest(String typed, List<String> known) {
        String best = null;
        int bestDistance = Integer.MAX_VALUE;
        for (String candidate : known) {
            int distance = distance(typed, candidate);
            if (distance < bestDistance) {
                best = candidate;
                bestDistance = distance;
            }
        }
        int tolerance = Math.max(1, Math.min(3, typed.length() / 3));
        return best != null && bestDistance <= tolerance ? Optional.of(best) : Optional.empty();
    }

    /** Optimal string alignment distance: insertions, deletions, substitutions and adjacent swaps count 1. */
    private static int distance(String a, String b) {
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
