package org.cryowarden.daemon.access;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.config.ConfigNode;
import org.cryowarden.rules.model.SiteDef;

/**
 * Who may command the plant, from the site file's {@code operators} section:
 * <pre>
 * operators:
 *   ada:   {role: operator,   token_hash: "sha256:..."}
 *   grace: {role: supervisor, token_hash: "sha256:..."}
 *   alan:  {role: viewer}
 * </pre>
 * Every command names an operator and is checked against this list, on MQTT and HTTP alike. A site without the
 * section ({@link #none()}) fails closed: every command is refused with {@link #NO_OPERATORS}, which says how to
 * fix it, and the daemon and {@code check} warn. The token hash is optional; an operator without one cannot use
 * the HTTP API but may still be named in an MQTT command.
 */
public final class OperatorRoster {

    /** Why every command is refused on a site without an operators section, and what to do about it. */
    public static final String NO_OPERATORS = "the site file has no operators section, so every command is refused;"
            + " list who may command there (e.g. operators: {duty-1: {role: operator}}) and make each one's HTTP"
            + " token with `cryowarden token new --operator ID --role R`";

    /** One operator: the id commands name, the role, the hash of the API token when there is one. */
    public record Operator(String id, Role role, Optional<TokenHash> token) {
    }

    private final Optional<Map<String, Operator>> operators;

    private OperatorRoster(Optional<Map<String, Operator>> operators) {
        this.operators = operators.map(Map::copyOf);
    }

    /** A roster with these operators (tests, and sites built in code). */
    public static OperatorRoster of(List<Operator> list) {
        Map<String, Operator> byId = new LinkedHashMap<>();
        list.forEach(o -> byId.put(o.id(), o));
        return new OperatorRoster(Optional.of(byId));
    }

    /** The roster of a site without an operators section: every command is refused (see the class comment). */
    public static OperatorRoster none() {
        return new OperatorRoster(Optional.empty());
    }

    /**
     * Reads the section.
     *
     * @throws ConfigException with each problem at its position
     */
    public static OperatorRoster read(SiteDef site) throws ConfigException {
        ConfigNode.Mapping section = site.sections().get("operators");
        if (section == null) {
            return none();
        }
        List<ConfigProblem> problems = new ArrayList<>();
        Map<String, Operator> byId = new LinkedHashMap<>();
        for (ConfigNode.Entry entry : section.entries()) {
            if (!entry.key().matches("[A-Za-z][A-Za-z0-9._-]{0,63}")) {
                problems.add(new ConfigProblem(entry.keyPosition(), "operator id '" + entry.key() + "' must start"
                        + " with a letter and hold only letters, digits, '.', '_' and '-'"));
                continue;
            }
            if (!(entry.value() instanceof ConfigNode.Mapping fields)) {
                problems.add(new ConfigProblem(entry.value().position(), "operator " + entry.key()
                        + " must be a mapping such as {role: operator, token_hash: \"sha256:...\"}"));
                continue;
            }
            for (ConfigNode.Entry field : fields.entries()) {
                if (!List.of("role", "token_hash").contains(field.key())) {
                    problems.add(new ConfigProblem(field.keyPosition(), "unknown key '" + field.key()
                            + "' for operator " + entry.key() + "; expected role, token_hash"));
                }
            }
            Optional<Role> role = text(fields, "role").flatMap(r -> {
                for (Role candidate : Role.values()) {
                    if (candidate.label().equals(r.text())) {
                        return Optional.of(candidate);
                    }
                }
                problems.add(new ConfigProblem(r.position(), "role of operator " + entry.key() + " must be viewer,"
                        + " operator or supervisor, got '" + r.text() + "'"));
                return Optional.empty();
            });
            if (fields.get("role").isEmpty()) {
                problems.add(new ConfigProblem(fields.position(), "operator " + entry.key() + " needs a role"));
            }
            Optional<TokenHash> token = text(fields, "token_hash").flatMap(t -> {
                try {
                    return Optional.of(TokenHash.parse(t.text()));
                } catch (IllegalArgumentException e) {
                    problems.add(new ConfigProblem(t.position(), "operator " + entry.key() + ": " + e.getMessage()));
                    return Optional.empty();
                }
            });
            role.ifPresent(r -> byId.put(entry.key(), new Operator(entry.key(), r, token)));
        }
        if (!problems.isEmpty()) {
            throw new ConfigException(problems);
        }
        return new OperatorRoster(Optional.of(byId));
    }

    private static Optional<ConfigNode.Scalar> text(ConfigNode.Mapping fields, String key) {
        return fields.get(key).filter(ConfigNode.Scalar.class::isInstance).map(ConfigNode.Scalar.class::cast)
                .filter(s -> !s.isNull());
    }

    /** Why {@code operator} may not give {@code verb}, or empty when the roster allows it. */
    public Optional<String> refusal(String verb, String operator) {
        if (operators.isEmpty()) {
            return Optional.of(NO_OPERATORS);
        }
        Operator known = operators.get().get(operator);
        if (known == null) {
            return Optional.of("operator '" + operator + "' is not in the site file's operators section");
        }
        Role needed = Role.needed(verb);
        if (!known.role().allows(verb)) {
            return Optional.of("operator '" + operator + "' has the role " + known.role().label() + "; " + verb + " needs "
                    + (needed == Role.SUPERVISOR ? "a supervisor" : "an operator or supervisor"));
        }
        return Optional.empty();
    }

    /**
     * The operator whose token this is. Every operator's hash is compared, each in constant time, so the answer
     * takes as long for the first operator as for the last or for none.
     */
    public Optional<Operator> identify(String token) {
        Optional<Operator> found = Optional.empty();
        if (operators.isPresent()) {
            TokenHash presented = TokenHash.of(token);
            for (Operator operator : operators.get().values()) {
                if (operator.token().isPresent() && operator.token().get().equals(presented)) {
                    found = Optional.of(operator);
                }
            }
        }
        return found;
    }

    /** Whether the site lists operators at all; false for {@link #none()}. */
    public boolean configured() {
        return operators.isPresent();
    }
}
