package org.cryowarden.rules.config;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Collection;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;

/**
 * What every configuration fuzz target checks: a refused file says where and what for every problem, and a
 * read tree stays within the reader's limits. Shared by the rules module's fuzz tests.
 */
final class ConfigFuzzing {

    private ConfigFuzzing() {
    }

    /** Every problem names one of {@code files}, has a position inside it (or none, for the whole file) and a message. */
    static void assertPositioned(ConfigException refused, Collection<String> files, int lines) {
        assertThat(refused.problems()).isNotEmpty();
        for (ConfigProblem problem : refused.problems()) {
            assertThat(problem.message()).as("message of %s", problem).isNotBlank();
            assertThat(problem.position().file()).as("file of %s", problem).isIn(files);
            assertThat(problem.position().line()).as("line of %s", problem).isBetween(0, lines + 1);
            assertThat(problem.position().column()).as("column of %s", problem).isNotNegative();
        }
    }

    /** Lines in the text as a reader counts them (LF, CR LF and lone CR all end a line). */
    static int lineCount(byte[] text) {
        int lines = 1;
        for (int i = 0; i < text.length; i++) {
            if (text[i] == '\n' || text[i] == '\r' && (i + 1 == text.length || text[i + 1] != '\n')) {
                lines++;
            }
        }
        return lines;
    }

    /** Nesting depth of a tree, a lone scalar being 1. */
    static int depth(ConfigNode node) {
        if (node instanceof ConfigNode.Sequence sequence) {
            return 1 + sequence.items().stream().mapToInt(ConfigFuzzing::depth).max().orElse(0);
        }
        if (node instanceof ConfigNode.Mapping mapping) {
            return 1 + mapping.entries().stream().mapToInt(e -> depth(e.value())).max().orElse(0);
        }
        return 1;
    }

    /** Nodes in a tree, aliased subtrees counted each time they appear. */
    static long size(ConfigNode node) {
        if (node instanceof ConfigNode.Sequence sequence) {
            return 1 + sequence.items().stream().mapToLong(ConfigFuzzing::size).sum();
        }
        if (node instanceof ConfigNode.Mapping mapping) {
            return 1 + mapping.entries().stream().mapToLong(e -> size(e.value())).sum();
        }
        return 1;
    }

    /** A fresh folder for the files the loaders read; they take paths only. */
    static Path folder(String prefix) {
        try {
            Path folder = Files.createTempDirectory(prefix);
            folder.toFile().deleteOnExit();
            return folder;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static Path write(Path file, byte[] bytes) {
        try {
            file.toFile().deleteOnExit();
            return Files.write(file, bytes);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
