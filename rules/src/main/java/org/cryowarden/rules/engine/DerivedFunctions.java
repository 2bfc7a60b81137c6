package org.cryowarden.rules.engine;

import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.Set;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.DerivedChannelDef;

/**
 * The fixed catalogue of functions a derived channel may name. There is deliberately no expression language: a
 * function is added here, with its units, by whoever writes it (the physics functions register the same way as
 * {@code min}, {@code max}, {@code mean} and {@code difference}). Immutable; {@link #with(Entry)} gives a copy.
 */
public final class DerivedFunctions {

    /** A named constant a function needs (a probe length, a dewar diameter), converted into {@code unit}. */
    public record Parameter(String name, Unit unit) {

        public Parameter {
            Objects.requireNonNull(name, "name");
            Objects.requireNonNull(unit, "unit");
        }
    }

    /**
     * One function.
     *
     * @param inputUnits the unit each input is converted into before the call; empty for same-unit functions,
     *                   whose inputs are all converted into the derived channel's unit
     * @param outputUnit the unit of the result, converted into the channel's unit; empty for same-unit functions
     * @param aggregate  whether the function still means something over the usable inputs alone (min, max,
     *                   mean): with some inputs BAD or STALE it is computed over the others and the result is
     *                   UNCERTAIN, so one dead oxygen sensor cannot hide a low reading on the other two
     */
    public record Entry(
            String name,
            String description,
            int minInputs,
            int maxInputs,
            Optional<List<Unit>> inputUnits,
            Optional<Unit> outputUnit,
            List<Parameter> parameters,
            boolean aggregate,
            DerivedFunction function) {

        public Entry {
            Objects.requireNonNull(name, "name");
            Objects.requireNonNull(description, "description");
            inputUnits = inputUnits.map(List::copyOf);
            Objects.requireNonNull(outputUnit, "outputUnit");
            parameters = List.copyOf(parameters);
            Objects.requireNonNull(function, "function");
            if (minInputs < 1 || maxInputs < minInputs) {
                throw new IllegalArgumentException("function " + name + " needs 1 <= minInputs <= maxInputs");
            }
            if (inputUnits.isPresent() != outputUnit.isPresent()) {
                throw new IllegalArgumentException("function " + name + " states input units and output unit together");
            }
            if (inputUnits.isPresent() && (inputUnits.get().size() != minInputs || maxInputs != minInputs)) {
                throw new IllegalArgumentException("function " + name + " with fixed units takes exactly one input per unit");
            }
        }

        /** A function whose inputs and result are all in the derived channel's unit. */
        public static Entry sameUnit(String name, String description, int minInputs, int maxInputs, DerivedFunction function) {
            return new Entry(name, description, minInputs, maxInputs, Optional.empty(), Optional.empty(), List.of(),
                    false, function);
        }

        /**
         * A same-unit function that is computed over the usable inputs when some are BAD or STALE (see
         * {@link #aggregate()}).
         */
        public static Entry aggregate(String name, String description, int minInputs, DerivedFunction function) {
            return new Entry(name, description, minInputs, Integer.MAX_VALUE, Optional.empty(), Optional.empty(),
                    List.of(), true, function);
        }

        /** A function with stated units for each input, its parameters and its result (physics functions). */
        public static Entry fixedUnits(String name, String description, List<Unit> inputUnits, Unit outputUnit,
                List<Parameter> parameters, DerivedFunction function) {
            return new Entry(name, description, inputUnits.size(), inputUnits.size(), Optional.of(inputUnits),
                    Optional.of(outputUnit), parameters, false, function);
        }
    }

    private static final DerivedFunctions BUILT_IN = PhysicsFunctions.register(new DerivedFunctions(Map.of())
            .with(Entry.aggregate("min", "the lowest of the usable inputs", 2, DerivedFunctions::min))
            .with(Entry.aggregate("max", "the highest of the usable inputs", 2, DerivedFunctions::max))
            .with(Entry.aggregate("mean", "the arithmetic mean of the usable inputs", 2, DerivedFunctions::mean))
            .with(Entry.sameUnit("difference", "the first input minus the second", 2, 2, (in, p) -> in[0] - in[1])));

    private final Map<String, Entry> entries;

    private DerivedFunctions(Map<String, Entry> entries) {
        this.entries = entries;
    }

    /** The functions cryowarden ships. */
    public static DerivedFunctions builtIn() {
        return BUILT_IN;
    }

    /** A copy with one more function. */
    public DerivedFunctions with(Entry entry) {
        if (entries.containsKey(entry.name())) {
            throw new IllegalArgumentException("a derived function named " + entry.name() + " already exists");
        }
        Map<String, Entry> copy = new LinkedHashMap<>(entries);
        copy.put(entry.name(), entry);
        return new DerivedFunctions(Collections.unmodifiableMap(copy));
    }

    public Optional<Entry> find(String name) {
        return Optional.ofNullable(entries.get(name));
    }

    /** Names in registration order, for "did you mean" and documentation. */
    public Set<String> names() {
        return entries.keySet();
    }

    /**
     * Binds a derived channel to its function, checking arity, units and parameters.
     *
     * @param inputUnits the units of the input channels, in order
     * @throws IllegalArgumentException saying what does not fit
     */
    BoundFunction bind(DerivedChannelDef def, List<Unit> inputUnits, double ambientPa) {
        Entry entry = entries.get(def.function());
        if (entry == null) {
            throw new IllegalArgumentException("unknown function '" + def.function() + "'"
                    + Suggestion.didYouMean(def.function(), entries.keySet()) + " (built in: "
                    + String.join(", ", entries.keySet()) + ")");
        }
        int count = inputUnits.size();
        if (count < entry.minInputs() || count > entry.maxInputs()) {
            throw new IllegalArgumentException(entry.name() + " takes " + arity(entry) + ", got " + count);
        }
        List<Unit> wanted = entry.inputUnits().orElse(Collections.nCopies(count, def.unit()));
        Unit result = entry.outputUnit().orElse(def.unit());
        for (int i = 0; i < count; i++) {
            if (!inputUnits.get(i).isCompatibleWith(wanted.get(i))) {
                throw new IllegalArgumentException("input " + def.inputs().get(i) + " is in " + inputUnits.get(i)
                        + " but " + entry.name() + " needs " + wanted.get(i).dimension().expected() + " there");
            }
        }
        if (!result.isCompatibleWith(def.unit())) {
            throw new IllegalArgumentException(entry.name() + " gives " + result.dimension().expected()
                    + ", which cannot be shown in " + def.unit());
        }
        double[] parameters = new double[entry.parameters().size()];
        List<String> known = new ArrayList<>();
        for (int i = 0; i < parameters.length; i++) {
            Parameter parameter = entry.parameters().get(i);
            known.add(parameter.name());
            Quantity given = def.parameters().get(parameter.name());
            if (given == null) {
                throw new IllegalArgumentException(entry.name() + " needs the parameter '" + parameter.name() + "' ("
                        + parameter.unit().dimension().expected() + ")");
            }
            if (!given.unit().isCompatibleWith(parameter.unit())) {
                throw new IllegalArgumentException("parameter '" + parameter.name() + "' must be "
                        + parameter.unit().dimension().expected() + ", got " + given);
            }
            parameters[i] = given.in(parameter.unit(), ambientPa);
        }
        for (String name : def.parameters().keySet()) {
            if (!known.contains(name)) {
                throw new IllegalArgumentException(entry.name() + " has no parameter '" + name + "'"
                        + Suggestion.didYouMean(name, known));
            }
        }
        return new BoundFunction(entry.function(), inputUnits.toArray(new Unit[0]), wanted.toArray(new Unit[0]),
                result, def.unit(), parameters, ambientPa, entry.aggregate());
    }

    private static String arity(Entry entry) {
        if (entry.minInputs() == entry.maxInputs()) {
            return entry.minInputs() == 1 ? "exactly one input" : "exactly " + entry.minInputs() + " inputs";
        }
        if (entry.maxInputs() == Integer.MAX_VALUE) {
            return entry.minInputs() == 1 ? "at least one input" : "at least " + entry.minInputs() + " inputs";
        }
        return entry.minInputs() + " to " + entry.maxInputs() + " inputs";
    }

    private static double min(double[] in, double[] parameters) {
        double result = in[0];
        for (int i = 1; i < in.length; i++) {
            result = Math.min(result, in[i]);
        }
        return result;
    }

    private static double max(double[] in, double[] parameters) {
        double result = in[0];
        for (int i = 1; i < in.length; i++) {
            result = Math.max(result, in[i]);
        }
        return result;
    }

    private static double mean(double[] in, double[] parameters) {
        double sum = 0;
        for (double value : in) {
            sum += value;
        }
        return sum / in.length;
    }
}
