package org.cryowarden.rules.config;

import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.TreeMap;

/**
 * The closed set of built-in functions a derived channel may use, with the shape of their inputs, so that the
 * loader can refuse a misspelt function or a wrong number of inputs before the engine is built. There is
 * deliberately no expression language; new functions (such as the physics conversions) are added here by name.
 */
final class DerivedFunctions {

    /**
     * @param minInputs     fewest input channels
     * @param maxInputs     most input channels
     * @param sameDimension whether every input and the result share one dimension (a mean of pressures is a
     *                      pressure)
     */
    record Signature(String name, int minInputs, int maxInputs, boolean sameDimension, String description) {
    }

    private static final Map<String, Signature> BY_NAME = new TreeMap<>();

    static {
        add(new Signature("min", 2, 64, true, "the lowest GOOD input"));
        add(new Signature("max", 2, 64, true, "the highest GOOD input"));
        add(new Signature("mean", 2, 64, true, "the mean of the GOOD inputs"));
        add(new Signature("difference", 2, 2, true, "the first input minus the second"));
    }

    private DerivedFunctions() {
    }

    private static void add(Signature signature) {
        BY_NAME.put(signature.name(), signature);
    }

    static Optional<Signature> byName(String name) {
        return Optional.ofNullable(BY_NAME.get(name));
    }

    static List<String> names() {
        return List.copyOf(BY_NAME.keySet());
    }
}
