package org.cryowarden.drivers.builtin;

/** The version of the built-in drivers: the jar's Implementation-Version, or "development" when run from classes. */
final class BuiltinVersion {

    private BuiltinVersion() {
    }

    static String get() {
        String version = BuiltinVersion.class.getPackage().getImplementationVersion();
        return version == null ? "development" : version;
    }
}
