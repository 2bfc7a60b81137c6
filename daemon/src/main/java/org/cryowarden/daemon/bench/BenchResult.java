package org.cryowarden.daemon.bench;

import com.fasterxml.jackson.databind.node.ObjectNode;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.cryowarden.daemon.run.Payloads;

/**
 * What one suite measured: named figures, the named reference figures they are compared with (a baseline run in
 * the same process, or a physical limit), the ratios between them, the target as text and whether this run met
 * it. {@code lines} is the human-readable account, computation included.
 */
public record BenchResult(String suite, Map<String, Double> figures, Map<String, Double> reference,
                          Map<String, Double> ratio, String target, boolean meetsTarget, List<String> lines) {

    public BenchResult {
        figures = new LinkedHashMap<>(figures);
        reference = new LinkedHashMap<>(reference);
        ratio = new LinkedHashMap<>(ratio);
        lines = List.copyOf(lines);
    }

    /** The one JSON object of {@code --json}: suite, figures, reference, ratio, target, meets_target. */
    public ObjectNode json() {
        ObjectNode node = Payloads.object();
        node.put("suite", suite);
        ObjectNode f = node.putObject("figures");
        figures.forEach(f::put);
        ObjectNode r = node.putObject("reference");
        reference.forEach(r::put);
        ObjectNode q = node.putObject("ratio");
        ratio.forEach(q::put);
        node.put("target", target);
        node.put("meets_target", meetsTarget);
        return node;
    }

    /** The text account followed by the verdict line. */
    public String text() {
        StringBuilder text = new StringBuilder();
        for (String line : lines) {
            text.append(line).append(System.lineSeparator());
        }
        text.append("target: ").append(target).append(" -> ").append(meetsTarget ? "met" : "NOT met")
                .append(" in this run");
        return text.toString();
    }
}
