package org.cryowarden.drivers.plugin;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFileAttributes;
import java.nio.file.attribute.PosixFilePermission;
import java.nio.file.attribute.UserPrincipal;
import java.util.Optional;
import java.util.Set;

/**
 * Whether a plugins folder or jar may be trusted: a plugin runs with the daemon's rights, so whoever can write the
 * folder or a jar in it can make the daemon drive interlock outputs. A path is refused when group or others may
 * write it, or when it belongs to neither the daemon's user nor root. On a file system without POSIX attributes
 * the check cannot be made and the path is accepted (the caller says so).
 *
 * @param daemonUser the user the daemon runs as, normally from {@code user.name}
 */
record PluginFileTrust(String daemonUser) {

    /** Why {@code path} is refused, with the fix, or empty when it is trusted or cannot be checked. */
    Optional<String> refusal(Path path) {
        PosixFileAttributes attributes;
        try {
            attributes = Files.readAttributes(path, PosixFileAttributes.class, LinkOption.NOFOLLOW_LINKS);
        } catch (UnsupportedOperationException e) {
            return Optional.empty();
        } catch (IOException e) {
            return Optional.of("cannot read its owner and permissions: " + e.getMessage());
        }
        String kind = attributes.isDirectory() ? "folder" : "file";
        if (attributes.isSymbolicLink()) {
            return Optional.of("is a symbolic link; put the plugin itself in the folder (links let another owner"
                    + " swap it)");
        }
        Set<PosixFilePermission> permissions = attributes.permissions();
        if (permissions.contains(PosixFilePermission.GROUP_WRITE)
                || permissions.contains(PosixFilePermission.OTHERS_WRITE)) {
            return Optional.of("the " + kind + " is writable by "
                    + (permissions.contains(PosixFilePermission.OTHERS_WRITE) ? "other users" : "its group")
                    + "; fix with: chmod go-w " + path);
        }
        UserPrincipal owner = attributes.owner();
        if (!owner.getName().equals(daemonUser) && !owner.getName().equals("root")) {
            return Optional.of("the " + kind + " belongs to '" + owner.getName() + "', not to the daemon's user '"
                    + daemonUser + "' or root; fix with: chown " + daemonUser + " " + path);
        }
        return Optional.empty();
    }
}
