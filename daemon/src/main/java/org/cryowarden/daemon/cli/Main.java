package org.cryowarden.daemon.cli;

import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * The {@code cryowarden} command line. Each subcommand is one class in this package; {@link #commandLine()}
 * builds a fresh tree so that tests can run commands in-process without shared state.
 *
 * <p>Exit codes shared by all commands: 0 success, 1 internal failure, 2 bad input (arguments or files),
 * 3 a device or peer misbehaved.
 */
@Command(
        name = "cryowarden",
        mixinStandardHelpOptions = true,
        versionProvider = VersionProvider.class,
        description = {
            "Supervisory monitoring and alarm daemon for cryogenic laboratories.",
            "cryowarden is a supervisory layer, not a certified safety system.",
            "It never replaces hardwired oxygen monitoring, relief devices or local codes."
        })
public final class Main implements Runnable {

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    public static void main(String[] args) {
        System.exit(commandLine().execute(args));
    }

    /** A new command tree with every subcommand registered. */
    public static CommandLine commandLine() {
        CommandLine line = new CommandLine(new Main());
        line.addSubcommand(CalcCommand.commandLine());
        line.setExecutionExceptionHandler(new InternalFailureHandler());
        line.addSubcommand(new CheckCommand());
        line.addSubcommand(new RunCommand());
        line.addSubcommand(new DemoCommand());
        ClientCommands.all().forEach(line::addSubcommand);
        line.addSubcommand(new picocli.AutoComplete.GenerateCompletion());
        line.addSubcommand(new ProbeCommand());
        line.addSubcommand(new PluginsCommand());
        line.addSubcommand(new TokenCommand());
        line.addSubcommand(new SimulateCommand());
        line.addSubcommand(new ReportCommand());
        line.addSubcommand(new BenchCommand());
        line.addSubcommand(new ReplayCommand());
        line.addSubcommand(new ExportCommand());
        return line;
    }

    @Override
    public void run() {
        spec.commandLine().usage(spec.commandLine().getOut());
    }
}
