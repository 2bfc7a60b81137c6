package org.cryowarden.rules.config;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.SourcePosition;
import org.junit.jupiter.api.Test;

/**
 * The limits of {@link YamlReader} that a hostile or mistyped file meets, each with its exact message: no YAML
 * tag of any spelling can ask for a type, values stay text, and nesting, alias and size limits hold in every
 * form the syntax allows. Complements {@code YamlReaderTest}.
 */
class YamlHardeningTest {

    private static final String TAG_ADVICE = "': write a plain value (quote text that looks like a number)";

    @Test
    void taggedKeyIsRefusedNotSilentlyDropped() {
        // Found by YamlFuzzTest: a tagged key vanished with its value and no problem was reported.
        assertProblems("!!str a: 1\n!!java.io.File b: 2\n!custom c: 3\nd: 4\n",
                "t.yaml:1:1: explicit YAML tags are not supported, found '!!str" + TAG_ADVICE,
                "t.yaml:2:1: explicit YAML tags are not supported, found '!!java.io.File" + TAG_ADVICE,
                "t.yaml:3:1: explicit YAML tags are not supported, found '!custom" + TAG_ADVICE);
    }

    @Test
    void taggedKeyInExplicitFormIsRefused() {
        assertProblems("? !!str a\n: 1\n", "t.yaml:1:3: explicit YAML tags are not supported, found '!!str" + TAG_ADVICE);
    }

    @Test
    void tagTheLibraryCannotHoldIsAProblemNotAnException() {
        // Found by YamlFuzzTest: SnakeYAML Engine threw an unmarked IllegalArgumentException for "!%A".
        assertProblems("!%A", "t.yaml: cannot read YAML: Tag must not contain leading or trailing spaces.");
    }

    @Test
    void verbatimJavaObjectTagIsRefused() {
        assertProblems("a: !<tag:yaml.org,2002:java/object:java.lang.ProcessBuilder> [sh, -c, id]\n",
                "t.yaml:1:4: explicit YAML tags are not supported, found '!!java/object:java.lang.ProcessBuilder"
                        + TAG_ADVICE);
    }

    @Test
    void tagDirectiveShorthandIsRefused() {
        assertProblems("%TAG !j! tag:yaml.org,2002:java/\n---\na: !j!lang.Runtime x\n",
                "t.yaml:3:4: explicit YAML tags are not supported, found '!!java/lang.Runtime" + TAG_ADVICE);
    }

    @Test
    void tagOnTheRootAndOnCoreCollectionsIsRefused() {
        assertProblems("--- !!set\n? a\n", "t.yaml:1:5: explicit YAML tags are not supported, found '!!set" + TAG_ADVICE);
        assertProblems("a: !!binary aGVsbG8=\nb: !!omap [x: 1]\n",
                "t.yaml:1:4: explicit YAML tags are not supported, found '!!binary" + TAG_ADVICE,
                "t.yaml:2:4: explicit YAML tags are not supported, found '!!omap" + TAG_ADVICE);
    }

    @Test
    void taggedAnchorIsReportedOnceAtTheAnchorNotAtEachAlias() {
        assertProblems("a: &x !!java.io.File /etc/passwd\nb: *x\nc: *x\n",
                "t.yaml:1:4: explicit YAML tags are not supported, found '!!java.io.File" + TAG_ADVICE);
    }

    @Test
    void implicitlyTypedValuesStayText() throws ConfigException {
        // YAML 1.1 would make these a timestamp, an integer, infinity and an integer; the core schema keeps
        // them as scalars and cryowarden's loaders decide what each field means.
        ConfigNode.Mapping root = (ConfigNode.Mapping) YamlReader.read(
                "a: 2001-12-14\nb: 0x1F\nc: .inf\nd: 1_000\ne: yes\n", "t.yaml");

        assertThat(root.entries()).extracting(e -> ((ConfigNode.Scalar) e.value()).text())
                .containsExactly("2001-12-14", "0x1F", ".inf", "1_000", "yes");
    }

    @Test
    void nestingOfBlockMappingsBeyondTheCapStopsReading() {
        StringBuilder text = new StringBuilder();
        for (int level = 0; level < 40; level++) {
            text.append("  ".repeat(level)).append("k").append(level).append(":\n");
        }
        text.append("  ".repeat(40)).append("x: 1\n");
        assertProblems(text.toString(),
                "t.yaml:33:65: nesting is deeper than 32 levels; a configuration file never needs that");
    }

    @Test
    void nestingOfBlockSequencesBeyondTheCapStopsReading() {
        assertProblems("- ".repeat(40) + "x\n",
                "t.yaml:1:65: nesting is deeper than 32 levels; a configuration file never needs that");
    }

    @Test
    void billionLaughsIsRefusedOnceTheExpansionPassesTheCap() {
        // A list of 100 scalars, aliased five times per level on three levels: 5 * (1 + 5 * (1 + 5 * 101))
        // = 12,655 nodes from 15 aliases, under the alias count limit but over the expansion limit.
        String hundred = String.join(", ", java.util.Collections.nCopies(100, "x"));
        String text = "a: &a [" + hundred + "]\n"
                + "b: &b [*a, *a, *a, *a, *a]\n"
                + "c: &c [*b, *b, *b, *b, *b]\n"
                + "d: [*c, *c, *c, *c, *c]\n";
        // Reported at the node that passed the cap, where it was written: item 80 of the anchored list.
        assertProblems(text, "t.yaml:1:245: aliases expand to more than 10000 nodes; write the values out instead");
    }

    @Test
    void aliasAsKeyIsRefusedAsNotText() {
        // Nodes reached through an alias carry the anchored original's position (line 1), not the alias's.
        assertProblems("base: &m {x: 1}\n*m : 2\n", "t.yaml:1:7: a key must be text, found a mapping");
    }

    @Test
    void textOfExactlyOneMebibyteIsRead() throws ConfigException {
        String text = "a: " + "x".repeat(YamlReader.MAX_BYTES - 4) + "\n";

        ConfigNode.Mapping root = (ConfigNode.Mapping) YamlReader.read(text, "t.yaml");

        assertThat(((ConfigNode.Scalar) root.get("a").orElseThrow()).text()).hasSize(YamlReader.MAX_BYTES - 4);
    }

    @Test
    void sizeLimitCountsUtf8BytesNotCharacters() {
        // 'é' is two bytes in UTF-8: half a mebibyte of them is one mebibyte of file.
        String text = "a: " + "\u00e9".repeat(YamlReader.MAX_BYTES / 2) + "\n";
        assertProblems(text, "t.yaml: the file is 1048580 bytes, more than the 1048576 bytes (1 MiB) a configuration "
                + "file may have");
    }

    @Test
    void truncatedUtf8AtTheEndIsPositioned() throws Exception {
        java.nio.file.Path file = java.nio.file.Files.createTempFile("truncated", "-site.yaml");
        try {
            java.nio.file.Files.write(file, new byte[] {'a', ':', ' ', (byte) 0xE2, (byte) 0x82});
            try {
                YamlReader.read(file);
                throw new AssertionError("expected a problem");
            } catch (ConfigException e) {
                assertThat(e.problems()).containsExactly(new ConfigProblem(new SourcePosition(file.toString(), 1, 4),
                        "byte 0xE2 is not valid UTF-8; save the file as UTF-8"));
            }
        } finally {
            java.nio.file.Files.delete(file);
        }
    }

    private static void assertProblems(String yaml, String... expected) {
        try {
            YamlReader.read(yaml, "t.yaml");
        } catch (ConfigException e) {
            assertThat(e.problems()).extracting(ConfigProblem::toString).containsExactly(expected);
            return;
        }
        throw new AssertionError("expected problems " + List.of(expected));
    }
}
