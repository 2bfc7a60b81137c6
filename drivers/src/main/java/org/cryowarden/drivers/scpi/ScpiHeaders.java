package org.cryowarden.drivers.scpi;

import java.util.Locale;

/** Short/long form header matching (SCPI 1999, Volume 1, §6.2.1, mnemonic forms). */
final class ScpiHeaders {

    private ScpiHeaders() {
    }

    static boolean matches(String pattern, String header) {
        String p = pattern.endsWith("?") ? pattern.substring(0, pattern.length() - 1) : pattern;
        String h = header.startsWith(":") ? header.substring(1) : header;
        if (p.startsWith("*") || h.startsWith("*")) {
            return p.equalsIgnoreCase(h);
        }
        String[] patternNodes = p.split(":", -1);
        String[] headerNodes = h.split(":", -1);
        if (patternNodes.length != headerNodes.length) {
            return false;
        }
        for (int i = 0; i < patternNodes.length; i++) {
            if (!nodeMatches(patternNodes[i], headerNodes[i])) {
                return false;
            }
        }
        return true;
    }

    private static boolean nodeMatches(String patternNode, String headerNode) {
        int shortLength = 0;
        while (shortLength < patternNode.length() && !Character.isLowerCase(patternNode.charAt(shortLength))) {
            shortLength++;
        }
        String shortForm = patternNode.substring(0, shortLength).toUpperCase(Locale.ROOT);
        String longForm = patternNode.toUpperCase(Locale.ROOT);
        String candidate = headerNode.toUpperCase(Locale.ROOT);
        return candidate.equals(shortForm) || candidate.equals(longForm);
    }
}
