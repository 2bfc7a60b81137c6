package org.cryowarden.daemon.run;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.config.SiteLoader;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The site file's {@code polling} section: whether a bus's instruments are spread over their period. */
class DaemonSettingsPollingTest {

    @TempDir
    Path folder;

    private String yaml;

    @Test
    void busesAreSpreadUnlessTheSiteSaysOtherwise() throws Exception {
        assertThat(settings("").spreadPolls()).isTrue();
        assertThat(settings("polling: {spread: true}\n").spreadPolls()).isTrue();
    }

    @Test
    void spreadFalsePollsEachBusTogether() throws Exception {
        assertThat(settings("polling: {spread: false}\n").spreadPolls()).isFalse();
    }

    @Test
    void spreadThatIsNotABooleanIsReportedAtItsLine() throws Exception {
        assertThatThrownBy(() -> settings("polling:\n  spread: sometimes\n"))
                .isInstanceOfSatisfying(ConfigException.class, e -> assertThat(e.problems()).singleElement()
                        .satisfies(p -> {
                            assertThat(p.message()).isEqualTo("spread in polling must be true or false, got 'sometimes'");
                            assertThat(p.position().line()).isEqualTo(lineOf("  spread:"));
                        }));
    }

    @Test
    void unknownPollingKeyIsRefused() throws Exception {
        assertThatThrownBy(() -> settings("polling: {spraed: false}\n"))
                .isInstanceOfSatisfying(ConfigException.class, e -> assertThat(e.problems())
                        .anySatisfy(p -> assertThat(p.message()).contains("spraed", "spread")));
    }

    private DaemonSettings settings(String polling) throws Exception {
        // The example site without its daemon sections, followed by the polling section under test.
        String example = Files.readString(Path.of("../config-examples/harbour-hall-site.yaml"));
        yaml = example.substring(0, example.indexOf("\nmqtt:") + 1) + polling;
        Path site = Files.writeString(folder.resolve("site.yaml"), yaml);
        return DaemonSettings.read(SiteLoader.load(site), folder);
    }

    private int lineOf(String prefix) {
        String[] lines = yaml.split("\n", -1);
        for (int i = 0; i < lines.length; i++) {
            if (lines[i].startsWith(prefix)) {
                return i + 1;
            }
        }
        throw new AssertionError(prefix + " not in the site file");
    }
}
