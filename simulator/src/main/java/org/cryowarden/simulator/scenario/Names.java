package org.cryowarden.simulator.scenario;

import java.util.Collection;
import java.util.Optional;

/** "Did you mean" for a mistyped id: the closest known name by edit distance, when close enough to be a typo. */
final class Names {

    private Names() {
    }

    static Optional<String> closest(String typed, Collection<String> known) {
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

    private static int distance(String a, String b) {
        int[] previous = new int[b.length() + 1];
        int[] current = new int[b.length() + 1];
        for (int j = 0; j <= b.length(); j++) {
            previous[j] = j;
        }
        for (int i = 1; i <= a.length(); i++) {
            current[0] = i;
            for (int j = 1; j <= b.length(); j++) {
                int cost = a.charAt(i - 1) == b.charAt(j - 1) ? 0 : 1;
                current[j] = Math.min(Math.min(current[j - 1] + 1, previous[j] + 1), previous[j - 1] + cost);
            }
            int[] swap = previous;
            previous = current;
            current = swap;
        }
        return previous[b.length()];
    }
}
