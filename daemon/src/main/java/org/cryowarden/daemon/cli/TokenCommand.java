package org.cryowarden.daemon.cli;

import java.io.PrintWriter;
import java.util.concurrent.Callable;
import org.cryowarden.daemon.access.TokenHash;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * {@code cryowarden token new --operator NAME}: a new API token and the line that stores its hash in the site
 * file. The token is printed once, to standard output only, for the operator to keep; the site file holds only
 * the hash.
 */
@Command(name = "token", mixinStandardHelpOptions = true,
        description = "Make API tokens for the operators section of the site file.",
        subcommands = TokenCommand.New.class)
final class TokenCommand implements Runnable {

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Override
    public void run() {
        throw new CommandLine.ParameterException(spec.commandLine(), "say what to do: token new --operator NAME");
    }

    @Command(name = "new", mixinStandardHelpOptions = true,
            description = "Print a new random token and its hash for the site file's operators section.")
    static final class New implements Callable<Integer> {

        @CommandLine.Spec
        CommandLine.Model.CommandSpec spec;

        @Option(names = "--operator", required = true, paramLabel = "NAME", description = "the operator's id")
        String operator;

        @Option(names = "--role", paramLabel = "ROLE", defaultValue = "operator",
                description = "viewer, operator or supervisor (default: ${DEFAULT-VALUE})")
        String role;

        @Override
        public Integer call() {
            if (!operator.matches("[A-Za-z][A-Za-z0-9._-]{0,63}")) {
                throw new CommandLine.ParameterException(spec.commandLine(), "operator id '" + operator
                        + "' must start with a letter and hold only letters, digits, '.', '_' and '-'");
            }
            if (!java.util.List.of("viewer", "operator", "supervisor").contains(role)) {
                throw new CommandLine.ParameterException(spec.commandLine(), "role must be viewer, operator or"
                        + " supervisor, got '" + role + "'");
            }
            String token = TokenHash.newToken();
            PrintWriter out = spec.commandLine().getOut();
            out.println("token for " + operator + " (shown once; give it to the operator, do not store it):");
            out.println("  " + token);
            out.println("add to the site file's operators section:");
            out.println("  " + operator + ": {role: " + role + ", token_hash: \"" + TokenHash.of(token).text() + "\"}");
            out.flush();
            return 0;
        }
    }
}
