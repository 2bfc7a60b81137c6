package org.cryowarden.daemon.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.Optional;
import java.util.concurrent.Callable;
import org.cryowarden.drivers.plugin.DriverCatalog;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * {@code cryowarden plugins}: every driver found (built-in and from the plugins folder) with its version and the
 * jar it came from, then every plugin that failed to load and why. Exits 2 when any failed, so a deployment
 * script notices a broken jar.
 */
@Command(name = "plugins", mixinStandardHelpOptions = true,
        description = "List the drivers found, with version and source jar, and the plugins that failed to load.")
final class PluginsCommand implements Callable<Integer> {

    static final int BAD_INPUT = 2;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Option(names = "--plugins", paramLabel = "DIR", defaultValue = "plugins",
            description = "folder of plugin jars (default: ${DEFAULT-VALUE} in the current directory)")
    Path folder;

    @Override
    public Integer call() {
        DriverCatalog catalog = DriverCatalog.discover(PluginsCommand.class.getClassLoader(), Optional.of(folder));
        PrintWriter out = spec.commandLine().getOut();
        int idWidth = 2;
        int versionWidth = 7;
        for (DriverCatalog.LoadedDriver driver : catalog.drivers()) {
            idWidth = Math.max(idWidth, driver.id().length());
            versionWidth = Math.max(versionWidth, driver.version().length());
        }
        String row = "%-" + idWidth + "s  %-" + versionWidth + "s  %s%n";
        out.printf(row, "ID", "VERSION", "SOURCE / DESCRIPTION");
        for (DriverCatalog.LoadedDriver driver : catalog.drivers()) {
            out.printf(row, driver.id(), driver.version(), driver.source());
            out.printf(row, "", "", "  " + driver.description());
        }
        out.flush();
        if (catalog.failures().isEmpty()) {
            return 0;
        }
        PrintWriter err = spec.commandLine().getErr();
        for (DriverCatalog.LoadFailure failure : catalog.failures()) {
            err.println("failed to load " + failure.name() + ": " + failure.reason());
        }
        err.flush();
        return BAD_INPUT;
    }
}
