package org.cryowarden.daemon.cli;

import picocli.CommandLine;

/**
 * An exception escaping a command is a bug in cryowarden, not bad input: report it as an internal failure
 * (exit 1) with the stack trace for the bug report.
 */
final class InternalFailureHandler implements CommandLine.IExecutionExceptionHandler {

    static final int INTERNAL_FAILURE = 1;

    @Override
    public int handleExecutionException(Exception ex, CommandLine commandLine, CommandLine.ParseResult parseResult) {
        commandLine.getErr().println("internal failure in cryowarden " + VersionProvider.version()
                + " (this is a bug; please report it with the trace below): " + ex);
        ex.printStackTrace(commandLine.getErr());
        commandLine.getErr().flush();
        return INTERNAL_FAILURE;
    }
}
