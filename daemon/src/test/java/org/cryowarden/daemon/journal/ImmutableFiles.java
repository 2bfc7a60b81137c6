package org.cryowarden.daemon.journal;

import static org.assertj.core.api.Assumptions.assumeThat;

import java.io.IOException;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.List;
import java.util.stream.Stream;

/**
 * Makes a folder and the files in it immutable ({@code chattr +i}, Linux: writes through open descriptors then
 * fail with {@code EPERM} and nothing can be created or removed) for a test, and clears the attribute again on
 * {@link #close()} so the test's folder can be deleted. Needs root and a file system with the attribute (ext4,
 * xfs, btrfs; not tmpfs or overlay): where {@code chattr} is refused the test is skipped with that reason.
 */
public final class ImmutableFiles implements AutoCloseable {

    /** Most recent first, so the folder is thawed before its files. */
    private final Deque<Path> frozen = new ArrayDeque<>();

    /** Freezes every file in {@code folder}, then the folder; returns the files' names. */
    public List<String> freeze(Path folder) throws IOException, InterruptedException {
        List<Path> files;
        try (Stream<Path> listed = Files.list(folder)) {
            files = listed.toList();
        }
        for (Path file : files) {
            // Written back first, as the kernel would within half a minute: a page of a memory-mapped file that
            // was written back must fault before it is written again, and on an immutable file that fault fails.
            try (FileChannel channel = FileChannel.open(file, StandardOpenOption.WRITE)) {
                channel.force(true);
            }
            assumeThat(chattr("+i", file)).as("chattr +i %s (needs root and a file system with the immutable"
                    + " attribute, not tmpfs or overlay)", file).isZero();
            frozen.push(file);
        }
        assumeThat(chattr("+i", folder)).as("chattr +i %s", folder).isZero();
        frozen.push(folder);
        return files.stream().map(p -> p.getFileName().toString()).toList();
    }

    /** Clears the attribute of everything frozen; safe to call twice. */
    @Override
    public void close() throws IOException, InterruptedException {
        while (!frozen.isEmpty()) {
            chattr("-i", frozen.pop());
        }
    }

    private static int chattr(String change, Path path) throws IOException, InterruptedException {
        try {
            return new ProcessBuilder("chattr", change, path.toString()).redirectErrorStream(true)
                    .redirectOutput(ProcessBuilder.Redirect.DISCARD).start().waitFor();
        } catch (IOException noChattr) {
            return 127;
        }
    }
}
