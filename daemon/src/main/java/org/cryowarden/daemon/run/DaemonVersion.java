package org.cryowarden.daemon.run;

/** The build's version as the jar's manifest states it, or "development" when run from classes. */
public final class DaemonVersion {

    private DaemonVersion() {
    }

    public static String current() {
        String version = DaemonVersion.class.getPackage().getImplementationVersion();
        return version == null ? "development" : version;
    }
}
