package org.cryowarden.daemon.cli;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.PrintWriter;
import java.time.Duration;
import java.util.Locale;
import org.cryowarden.drivers.modbus.Hex;

/** What {@code probe} prints: text for people, or one JSON object with {@code --json}; frames with {@code --verbose}. */
final class ProbeReport {

    private static final ObjectMapper JSON = new ObjectMapper();

    private final boolean json;
    private final boolean verbose;
    private final PrintWriter out;
    private final ObjectNode object = JSON.createObjectNode();
    private final ArrayNode frames = JSON.createArrayNode();

    ProbeReport(boolean json, boolean verbose, PrintWriter out) {
        this.json = json;
        this.verbose = verbose;
        this.out = out;
    }

    ObjectNode json() {
        return object;
    }

    void sent(byte[] bytes) {
        frame("sent", bytes);
    }

    void received(byte[] bytes) {
        frame("received", bytes);
    }

    private void frame(String direction, byte[] bytes) {
        if (!verbose) {
            return;
        }
        if (json) {
            frames.addObject().put(direction, Hex.of(bytes));
        } else {
            out.println((direction.equals("sent") ? "-> " : "<- ") + (bytes.length == 0 ? "(nothing)" : Hex.of(bytes)));
        }
    }

    void line(String text) {
        if (!json) {
            out.println(text);
        }
    }

    static String millis(Duration roundTrip) {
        return String.format(Locale.ROOT, "%.1f ms", roundTrip.toNanos() / 1e6);
    }

    void roundTrip(Duration roundTrip) {
        object.put("round_trip_ms", Math.round(roundTrip.toNanos() / 1e4) / 100.0);
        line("round trip " + millis(roundTrip));
    }

    /** Prints the JSON object (when {@code --json}); call once at the end, also after a failure. */
    void finish() {
        if (json) {
            if (verbose) {
                object.set("frames", frames);
            }
            out.println(object.toString());
        }
        out.flush();
    }
}
