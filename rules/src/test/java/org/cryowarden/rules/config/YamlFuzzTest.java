package org.cryowarden.rules.config;

import static org.assertj.core.api.Assertions.assertThat;
import static org.cryowarden.rules.config.ConfigFuzzing.assertPositioned;
import static org.cryowarden.rules.config.ConfigFuzzing.lineCount;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.model.RuleSet;
import org.cryowarden.rules.model.SiteDef;

/**
 * Coverage-guided fuzzing with Jazzer of the YAML reader and the site and rule-set loaders over arbitrary
 * bytes (invalid UTF-8 included): each file is either loaded or refused with a {@link ConfigException} whose
 * every problem is positioned in that file; no other exception, no hang (a fuzzing run gives each input 10 s
 * with -timeout=10), and a read tree stays within the reader's nesting and alias-expansion limits.
 */
class YamlFuzzTest {

    private static final Path FOLDER = ConfigFuzzing.folder("cryowarden-yaml-fuzz");

    @FuzzTest(maxDuration = "10s")
    void readerReadsOrRefusesAnyBytes(byte[] input) {
        Path file = ConfigFuzzing.write(FOLDER.resolve("fuzz.yaml"), input);
        try {
            ConfigNode tree = YamlReader.read(file);
            assertThat(ConfigFuzzing.depth(tree)).isLessThanOrEqualTo(YamlReader.MAX_DEPTH + 1);
            assertThat(ConfigFuzzing.size(tree)).isLessThanOrEqualTo(input.length + 1L + YamlReader.MAX_ALIAS_EXPANSION);
            // The same text read from a string gives the same tree.
            String text = new String(input, StandardCharsets.UTF_8);
            if (text.startsWith("\uFEFF")) {
                text = text.substring(1);
            }
            assertThat(readText(text)).isEqualTo(tree);
        } catch (ConfigException refused) {
            assertPositioned(refused, List.of(file.toString()), lineCount(input));
        }
    }

    @FuzzTest(maxDuration = "10s")
    void siteLoaderLoadsOrRefusesAnyBytes(byte[] input) {
        Path file = ConfigFuzzing.write(FOLDER.resolve("fuzz-site.yaml"), input);
        try {
            SiteDef site = SiteLoader.load(file);
            assertThat(site).isNotNull();
        } catch (ConfigException refused) {
            assertPositioned(refused, List.of(file.toString()), lineCount(input));
        }
    }

    @FuzzTest(maxDuration = "10s")
    void ruleSetLoaderLoadsOrRefusesAnyBytes(byte[] input) {
        Path file = ConfigFuzzing.write(FOLDER.resolve("fuzz-rules.yaml"), input);
        try {
            RuleSet rules = RuleSetLoader.load(List.of(file));
            assertThat(rules).isNotNull();
        } catch (ConfigException refused) {
            assertPositioned(refused, List.of(file.toString()), lineCount(input));
        }
    }

    /**
     * A site file and a rule-set file checked together: the input is cut at its first NUL byte (a site
     * alone when there is none), so the cross-file checks (unknown channels, outputs) see both.
     */
    @FuzzTest(maxDuration = "10s")
    void configurationLoaderLoadsOrRefusesAnySiteAndRules(byte[] input) {
        int cut = 0;
        while (cut < input.length && input[cut] != 0) {
            cut++;
        }
        byte[] siteBytes = Arrays.copyOfRange(input, 0, cut);
        byte[] ruleBytes = cut < input.length ? Arrays.copyOfRange(input, cut + 1, input.length) : new byte[0];
        Path site = ConfigFuzzing.write(FOLDER.resolve("pair-site.yaml"), siteBytes);
        Path rules = ConfigFuzzing.write(FOLDER.resolve("pair-rules.yaml"), ruleBytes);
        try {
            Configuration configuration = ConfigurationLoader.load(site, List.of(rules),
                    DriverSettingsValidator.acceptAll());
            assertThat(configuration).isNotNull();
        } catch (ConfigException refused) {
            assertPositioned(refused, List.of(site.toString(), rules.toString()),
                    Math.max(lineCount(siteBytes), lineCount(ruleBytes)));
        }
    }

    private static ConfigNode readText(String text) {
        try {
            return YamlReader.read(text, FOLDER.resolve("fuzz.yaml").toString());
        } catch (ConfigException e) {
            throw new AssertionError("the file was read but the same text was refused: " + e.getMessage(), e);
        }
    }
}
