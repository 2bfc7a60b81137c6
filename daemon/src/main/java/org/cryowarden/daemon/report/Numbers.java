package org.cryowarden.daemon.report;

import java.time.Duration;
import java.util.Locale;

/** How the report writes numbers and durations. */
final class Numbers {

    private Numbers() {
    }

    /** Four significant figures, scientific for very small or large magnitudes. */
    static String format(double value) {
        if (!Double.isFinite(value)) {
            return "-";
        }
        double magnitude = Math.abs(value);
        if (magnitude != 0 && (magnitude < 0.01 || magnitude >= 1e6)) {
            return String.format(Locale.ROOT, "%.3g", value);
        }
        String text = String.format(Locale.ROOT, "%.4g", value);
        if (text.contains(".") && !text.contains("e")) {
            text = text.replaceAll("0+$", "").replaceAll("\\.$", "");
        }
        return text;
    }

    /** Minutes and seconds, e.g. "3 min 01 s", or hours for long ones, e.g. "2 h 05 min". */
    static String duration(Duration duration) {
        long seconds = duration.toSeconds();
        if (seconds < 60) {
            return seconds + " s";
        }
        if (seconds < 3600) {
            return String.format(Locale.ROOT, "%d min %02d s", seconds / 60, seconds % 60);
        }
        return String.format(Locale.ROOT, "%d h %02d min", seconds / 3600, (seconds % 3600) / 60);
    }

    static String percent(double fraction) {
        return String.format(Locale.ROOT, "%.1f %%", fraction * 100);
    }
}
