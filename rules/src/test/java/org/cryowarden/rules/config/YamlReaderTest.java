package org.cryowarden.rules.config;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.SourcePosition;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class YamlReaderTest {

    @TempDir
    Path folder;

    @Test
    void mappingKeepsOneBasedPositionsOfKeysAndValues() throws ConfigException {
        ConfigNode root = YamlReader.read("site:\n  name: Harbour Hall\nbuses: [a, b]\n", "t.yaml");

        ConfigNode.Mapping mapping = (ConfigNode.Mapping) root;
        assertThat(mapping.position()).isEqualTo(new SourcePosition("t.yaml", 1, 1));
        ConfigNode.Mapping site = (ConfigNode.Mapping) mapping.get("site").orElseThrow();
        ConfigNode.Entry name = site.entry("name").orElseThrow();
        assertThat(name.keyPosition()).isEqualTo(new SourcePosition("t.yaml", 2, 3));
        assertThat(name.value()).isEqualTo(new ConfigNode.Scalar("Harbour Hall", false, new SourcePosition("t.yaml", 2, 9)));
        ConfigNode.Sequence buses = (ConfigNode.Sequence) mapping.get("buses").orElseThrow();
        assertThat(buses.items()).extracting(ConfigNode::position)
                .containsExactly(new SourcePosition("t.yaml", 3, 9), new SourcePosition("t.yaml", 3, 12));
    }

    @Test
    void scalarsStayTextAndNullsAreMarked() throws ConfigException {
        ConfigNode.Mapping root = (ConfigNode.Mapping) YamlReader.read("a: '3'\nb: 3.50\nc: null\nd:\ne: ~\n", "t.yaml");

        assertThat(text(root, "a")).isEqualTo("3");
        assertThat(text(root, "b")).isEqualTo("3.50");
        for (String key : List.of("c", "d", "e")) {
            ConfigNode.Scalar scalar = (ConfigNode.Scalar) root.get(key).orElseThrow();
            assertThat(scalar.isNull()).as(key).isTrue();
            assertThat(scalar.text()).as(key).isEmpty();
        }
    }

    @Test
    void emptyDocumentIsANullScalarAtTheTop() throws ConfigException {
        assertThat(YamlReader.read("# nothing yet\n", "t.yaml"))
                .isEqualTo(new ConfigNode.Scalar("", true, new SourcePosition("t.yaml", 1, 1)));
    }

    @Test
    void aFewAliasesAreExpandedWithTheAnchorsPositions() throws ConfigException {
        ConfigNode.Mapping root = (ConfigNode.Mapping) YamlReader.read("a: &x [1, 2]\nb: *x\n", "t.yaml");

        assertThat(root.get("b")).contains(root.get("a").orElseThrow());
    }

    @Test
    void syntaxErrorIsPositioned() {
        assertProblems("a: 1\nb: [x, y\n",
                "t.yaml:3:1: YAML syntax error: expected ',' or ']', but got <stream end> "
                        + "(while parsing a flow sequence that started at line 2, column 4)");
        assertProblems("a: 1\n  b: 2\n", "t.yaml:2:4: YAML syntax error: mapping values are not allowed here");
        assertProblems("key: \"unterminated\n", "t.yaml:2:1: YAML syntax error: found unexpected end of stream "
                + "(while scanning a quoted scalar that started at line 1, column 6)");
    }

    @Test
    void tabIndentationKeepsTheTabHint() {
        assertProblems("\tb: 1\n", "t.yaml:1:1: YAML syntax error: found character '\\t(TAB)' that cannot start any "
                + "token. (Do not use \\t(TAB) for indentation)");
    }

    @Test
    void otherBadCharacterDropsTheIndentationHint() {
        assertProblems("a: @x\n", "t.yaml:1:4: YAML syntax error: found character '@' that cannot start any token");
    }

    @Test
    void everyDuplicateKeyIsReportedAgainstItsFirstUse() {
        assertProblems("port: 1\nbaud: 2\nport: 3\nnested: {baud: 1, baud: 2}\n",
                "t.yaml:3:1: duplicate key 'port': already given at line 1, column 1",
                "t.yaml:4:19: duplicate key 'baud': already given at line 4, column 10");
    }

    @Test
    void keysThatAreNotTextAreRefused() {
        assertProblems("1: x\ntrue: y\n~: z\n[a]: q\n<<: {c: 1}\n'7': fine\n",
                "t.yaml:1:1: a key must be text, found the number 1 (quote it if it is meant as text)",
                "t.yaml:2:1: a key must be text, found the boolean true (quote it if it is meant as text)",
                "t.yaml:3:1: a key must be text, found an empty key",
                "t.yaml:4:1: a key must be text, found a list",
                "t.yaml:5:1: a key must be text, found a merge key (<<); merging mappings is not supported, "
                        + "write the keys out");
    }

    @Test
    void explicitTagsAreRefused() {
        assertProblems("a: !!str 3\nb: !!java.io.File /etc/passwd\nc: !!map {d: 1}\ne: [!custom x]\n",
                "t.yaml:1:4: explicit YAML tags are not supported, found '!!str': write a plain value "
                        + "(quote text that looks like a number)",
                "t.yaml:2:4: explicit YAML tags are not supported, found '!!java.io.File': write a plain value "
                        + "(quote text that looks like a number)",
                "t.yaml:3:4: explicit YAML tags are not supported, found '!!map': write a plain value "
                        + "(quote text that looks like a number)",
                "t.yaml:4:5: explicit YAML tags are not supported, found '!custom': write a plain value "
                        + "(quote text that looks like a number)");
    }

    @Test
    void secondDocumentIsRefused() {
        assertProblems("a: 1\n---\nb: 2\n", "t.yaml:2:1: found a second YAML document; a cryowarden file holds "
                + "exactly one (remove the '---' line or split the file)");
    }

    @Test
    void aliasesBeyondTheCapAreRefusedAtTheFirstOneTooMany() {
        StringBuilder text = new StringBuilder("a: &a [1, 2, 3]\n");
        for (int i = 1; i <= 25; i++) {
            text.append("b").append(i).append(": *a\n");
        }
        // 20 aliases are allowed; the 21st is written on line 22 (after the anchor line and 20 more).
        assertProblems(text.toString(), "t.yaml:22:6: too many aliases: at most 20 aliases (*name) are allowed per "
                + "file, this is alias number 21; write the values out instead");
    }

    @Test
    void aliasesThatExpandTooMuchAreRefused() {
        // Each level holds its predecessor four times: 5 levels use the 20 allowed aliases and expand to
        // 4 * (1 + 4 * (1 + ... 10)) nodes, over 10,000 in all.
        StringBuilder text = new StringBuilder("l0: &l0 [x, x, x, x, x, x, x, x, x, x]\n");
        for (int level = 1; level <= 5; level++) {
            String previous = "*l" + (level - 1);
            text.append("l").append(level).append(": &l").append(level).append(" [")
                    .append(String.join(", ", java.util.Collections.nCopies(4, previous))).append("]\n");
        }
        assertThatThrownBy(() -> YamlReader.read(text.toString(), "t.yaml"))
                .isInstanceOf(ConfigException.class)
                .hasMessageEndingWith("aliases expand to more than 10000 nodes; write the values out instead");
    }

    @Test
    void recursiveAliasIsRefused() {
        assertProblems("a: &x [1, *x]\n", "t.yaml:1:4: recursive alias: this node contains an alias to itself");
    }

    @Test
    void nestingBeyondTheCapStopsReading() {
        String text = "[".repeat(40) + "]".repeat(40);
        assertProblems(text, "t.yaml:1:33: nesting is deeper than 32 levels; a configuration file never needs that");
    }

    @Test
    void deeplyNestedHostileInputIsRefusedWithoutOverflowingTheStack() {
        String text = "[".repeat(500_000);
        assertProblems(text, "t.yaml:1:33: nesting is deeper than 32 levels; a configuration file never needs that");
    }

    @Test
    void textOverOneMebibyteIsRefused() {
        String text = "a: " + "x".repeat(YamlReader.MAX_BYTES) + "\n";
        assertProblems(text, "t.yaml: the file is 1048580 bytes, more than the 1048576 bytes (1 MiB) a configuration "
                + "file may have");
    }

    @Test
    void fileIsLabelledWithItsPath() throws IOException, ConfigException {
        Path file = folder.resolve("lab-site.yaml");
        Files.writeString(file, "site:\n  name: x\n");

        ConfigNode.Mapping root = (ConfigNode.Mapping) YamlReader.read(file);

        assertThat(root.entries().get(0).keyPosition()).isEqualTo(new SourcePosition(file.toString(), 1, 1));
    }

    @Test
    void missingFileIsAProblemNotAnException() {
        Path file = folder.resolve("absent-site.yaml");
        assertFileProblems(file, file + ": file not found");
    }

    @Test
    void directoryIsRefused() {
        assertFileProblems(folder, folder + ": is a directory, expected a YAML file");
    }

    @Test
    void oversizedFileIsRefusedBeforeReading() throws IOException {
        Path file = folder.resolve("huge-site.yaml");
        Files.write(file, new byte[YamlReader.MAX_BYTES + 1]);
        assertFileProblems(file, file + ": the file is 1048577 bytes, more than the 1048576 bytes (1 MiB) a "
                + "configuration file may have");
    }

    @Test
    void invalidUtf8IsPositionedAtTheBadByte() throws IOException {
        Path file = folder.resolve("latin1-site.yaml");
        Files.write(file, "site:\n  name: Caf\u00e9\n".getBytes(StandardCharsets.ISO_8859_1));
        assertFileProblems(file, file + ":2:12: byte 0xE9 is not valid UTF-8; save the file as UTF-8");
    }

    @Test
    void byteOrderMarkIsIgnored() throws IOException, ConfigException {
        Path file = folder.resolve("bom-site.yaml");
        Files.write(file, "\uFEFFa: 1\n".getBytes(StandardCharsets.UTF_8));

        ConfigNode.Mapping root = (ConfigNode.Mapping) YamlReader.read(file);

        assertThat(root.keys()).containsExactly("a");
    }

    private static String text(ConfigNode.Mapping mapping, String key) {
        return ((ConfigNode.Scalar) mapping.get(key).orElseThrow()).text();
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

    private static void assertFileProblems(Path file, String... expected) {
        try {
            YamlReader.read(file);
        } catch (ConfigException e) {
            assertThat(e.problems()).extracting(ConfigProblem::toString).containsExactly(expected);
            return;
        }
        throw new AssertionError("expected problems " + List.of(expected));
    }
}
