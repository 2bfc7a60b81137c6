package org.cryowarden.rules.config;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.cryowarden.rules.ConfigException;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.TestFactory;

/**
 * Every site ({@code *-site.yaml}) and rule set ({@code *-rules.yaml}) in {@code config-examples/} must be
 * valid. A rule set {@code NAME-rules.yaml} is checked against the site {@code NAME-site.yaml}. Every other
 * file there (README.md, {@code *-scenario.yaml}, {@code *-room.yaml}, unit and broker samples) is skipped by
 * name: it belongs to the issue that reads it, which tests it.
 */
class ExampleFilesTest {

    private static final Path EXAMPLES = Path.of("..", "config-examples");

    @TestFactory
    Stream<DynamicTest> everyExampleSiteAndRuleSetIsValid() throws IOException {
        List<Path> sites = new ArrayList<>();
        List<Path> ruleSets = new ArrayList<>();
        try (Stream<Path> files = Files.list(EXAMPLES)) {
            files.sorted().forEach(file -> {
                String name = file.getFileName().toString();
                if (name.endsWith("-site.yaml")) {
                    sites.add(file);
                } else if (name.endsWith("-rules.yaml")) {
                    ruleSets.add(file);
                }
            });
        }
        assertThat(sites).as("example sites").isNotEmpty();
        assertThat(ruleSets).as("example rule sets").isNotEmpty();
        List<DynamicTest> tests = new ArrayList<>();
        for (Path site : sites) {
            tests.add(DynamicTest.dynamicTest(site.getFileName().toString(), () -> load(site, List.of())));
        }
        for (Path rules : ruleSets) {
            String name = rules.getFileName().toString();
            Path site = rules.resolveSibling(name.substring(0, name.length() - "-rules.yaml".length()) + "-site.yaml");
            tests.add(DynamicTest.dynamicTest(name + " with " + site.getFileName(), () -> {
                assertThat(site).as("the site for " + name).exists();
                load(site, List.of(rules));
            }));
        }
        return tests.stream();
    }

    private static void load(Path site, List<Path> rules) {
        try {
            ConfigurationLoader.load(site, rules, DriverSettingsValidator.acceptAll());
        } catch (ConfigException e) {
            throw new AssertionError("example is not valid:\n" + e.getMessage(), e);
        }
    }
}
