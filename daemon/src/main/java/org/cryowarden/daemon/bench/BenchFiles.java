package org.cryowarden.daemon.bench;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Comparator;
import java.util.stream.Stream;

/** The suites' temporary folders. */
final class BenchFiles {

    private BenchFiles() {
    }

    /** Deletes a folder and everything under it, ignoring what cannot be deleted (a temporary folder). */
    static void deleteTree(Path folder) {
        try (Stream<Path> paths = Files.walk(folder)) {
            paths.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
        } catch (IOException e) {
            // a leftover temporary folder is harmless
        }
    }
}
