package org.cryowarden.daemon.cli;

import picocli.CommandLine;

/** Reads the version from the jar manifest, so {@code --version} matches the build. */
final class VersionProvider implements CommandLine.IVersionProvider {

    @Override
    public String[] getVersion() {
        return new String[] {"cryowarden " + version()};
    }

    /** The build's version, or "development" when run from classes rather than the jar. */
    static String version() {
        String version = Main.class.getPackage().getImplementationVersion();
        return version == null ? "development" : version;
    }
}
