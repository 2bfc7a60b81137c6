package org.cryowarden.daemon.report;

import java.awt.Color;
import org.cryowarden.rules.model.Priority;

/** The report's own colours: ink, a slate-blue value line on a pale band, ochre limits, plum alarm shading. */
final class Palette {

    static final Color INK = new Color(0x2b, 0x2f, 0x3a);
    static final Color GRID = new Color(0xdd, 0xdf, 0xe4);
    static final Color PLOT_BACKGROUND = new Color(0xfc, 0xfc, 0xfa);
    static final Color VALUE = new Color(0x3d, 0x5a, 0x80);
    static final Color BAND = new Color(0x9d, 0xb4, 0xd0);
    static final Color LIMIT = new Color(0xa6, 0x6a, 0x1e);
    static final Color ALARM_SHADE = new Color(0x8a, 0x4f, 0x7d, 0x38);
    static final Color FLOOD_SHADE = new Color(0x8a, 0x4f, 0x7d, 0x50);
    static final Color LABEL_BACKGROUND = new Color(255, 255, 255, 200);
    static final Color BARS = new Color(0x5b, 0x7c, 0x6e);

    private Palette() {
    }

    /** One hue per priority, darker for the more urgent. */
    static Color of(Priority priority) {
        return switch (priority) {
            case CRITICAL -> new Color(0x6d, 0x21, 0x4f);
            case HIGH -> new Color(0xa4, 0x4a, 0x3f);
            case MEDIUM -> new Color(0xc2, 0x8e, 0x2c);
            case LOW -> new Color(0x6f, 0x8f, 0xaf);
        };
    }

    static String hex(Color color) {
        return String.format("#%02x%02x%02x", color.getRed(), color.getGreen(), color.getBlue());
    }
}
