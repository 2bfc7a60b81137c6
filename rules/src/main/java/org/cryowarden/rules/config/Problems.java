package org.cryowarden.rules.config;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.SourcePosition;

/** Collects every problem of one load, so that a run reports all of them, sorted by file and position. */
final class Problems {

    private static final Comparator<ConfigProblem> FILE_ORDER = Comparator
            .comparingInt((ConfigProblem p) -> p.position().line())
            .thenComparingInt(p -> p.position().column());

    private final List<ConfigProblem> problems = new ArrayList<>();
    private final List<String> fileOrder = new ArrayList<>();

    /** Lists the problems of these files first, in this order (the order the user named them). */
    void orderFiles(List<String> labels) {
        fileOrder.clear();
        fileOrder.addAll(labels);
    }

    void add(SourcePosition position, String message) {
        problems.add(new ConfigProblem(position, message));
    }

    void addAll(List<ConfigProblem> more) {
        problems.addAll(more);
    }

    boolean isEmpty() {
        return problems.isEmpty();
    }

    int size() {
        return problems.size();
    }

    /**
     * The problems grouped by file (in the order given to {@link #orderFiles}, then as first met), each file's problems by line and
     * column; duplicates (the same message at the same place) removed.
     */
    List<ConfigProblem> sorted() {
        List<String> files = new ArrayList<>(fileOrder);
        for (ConfigProblem problem : problems) {
            if (!files.contains(problem.position().file())) {
                files.add(problem.position().file());
            }
        }
        List<ConfigProblem> result = new ArrayList<>(problems.size());
        for (String file : files) {
            problems.stream()
                    .filter(p -> p.position().file().equals(file))
                    .sorted(FILE_ORDER)
                    .distinct()
                    .forEach(result::add);
        }
        return result;
    }

    void throwIfAny() throws ConfigException {
        if (!problems.isEmpty()) {
            throw new ConfigException(sorted());
        }
    }
}
