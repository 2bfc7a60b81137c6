package org.cryowarden.daemon.notify.builtin;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Optional;
import org.cryowarden.drivers.settings.SettingsReader;

/** Reads a secret (webhook key, SMTP password) from a file named in a sender's settings, trimmed of whitespace. */
final class SecretFile {

    private SecretFile() {
    }

    /** The secret, or empty with a problem recorded on {@code settings}. */
    static Optional<String> read(SettingsReader settings, String key, Path folder, boolean required) {
        Optional<String> name = settings.text(key, required);
        if (name.isEmpty()) {
            return Optional.empty();
        }
        Path file = folder.resolve(name.get());
        try {
            String secret = Files.readString(file).strip();
            if (secret.isEmpty()) {
                settings.problem(settings.position(key), key + " " + file + " is empty; put the shared secret in it");
                return Optional.empty();
            }
            return Optional.of(secret);
        } catch (IOException e) {
            settings.problem(settings.position(key), "cannot read " + key + " " + file + ": "
                    + (e instanceof java.nio.file.NoSuchFileException ? "no such file" : e.getMessage()));
            return Optional.empty();
        }
    }
}
