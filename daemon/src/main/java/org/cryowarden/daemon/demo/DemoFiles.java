package org.cryowarden.daemon.demo;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.List;
import java.util.Optional;

/**
 * The example files the demo runs on, copied from the jar's {@code config-examples/} into a temporary folder so
 * that the loaders read them as files and messages name them as {@code config-examples/...}.
 */
final class DemoFiles {

    static final String SITE = "harbour-hall-site.yaml";
    static final String RULES = "harbour-hall-rules.yaml";
    static final List<String> SCENARIOS = List.of("quench", "quiet", "vent-blocked");

    private DemoFiles() {
    }

    /** The scenario file for a short name ("quench") or a path to a scenario file of one's own. */
    static Optional<String> scenarioResource(String name) {
        if (SCENARIOS.contains(name)) {
            return Optional.of("harbour-hall-" + name + "-scenario.yaml");
        }
        return Optional.empty();
    }

    /** Copies the site, the rules and {@code scenario} into {@code folder}/config-examples; returns that folder. */
    static Path copy(Path folder, String scenario) throws IOException {
        Path examples = Files.createDirectories(folder.resolve("config-examples"));
        for (String name : List.of(SITE, RULES, scenario)) {
            try (InputStream in = DemoFiles.class.getResourceAsStream("/config-examples/" + name)) {
                if (in == null) {
                    throw new IOException("the example file config-examples/" + name + " is missing from the jar;"
                            + " rebuild it with mvn package");
                }
                Files.copy(in, examples.resolve(name), StandardCopyOption.REPLACE_EXISTING);
            }
        }
        return examples;
    }
}
