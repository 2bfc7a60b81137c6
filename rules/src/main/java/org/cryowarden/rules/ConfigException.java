package org.cryowarden.rules;

import java.util.List;

/**
 * Thrown by loaders when a configuration has errors; carries every problem found in one run, not just the
 * first, in file order.
 */
public final class ConfigException extends Exception {

    private final List<ConfigProblem> problems;

    public ConfigException(List<ConfigProblem> problems) {
        super(summary(problems));
        if (problems.isEmpty()) {
            throw new IllegalArgumentException("a ConfigException needs at least one problem");
        }
        this.problems = List.copyOf(problems);
    }

    public List<ConfigProblem> problems() {
        return problems;
    }

    private static String summary(List<ConfigProblem> problems) {
        StringBuilder text = new StringBuilder();
        for (ConfigProblem problem : problems) {
            if (text.length() > 0) {
                text.append('\n');
            }
            text.append(problem);
        }
        return text.toString();
    }
}
