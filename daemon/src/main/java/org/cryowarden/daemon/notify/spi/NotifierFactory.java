package org.cryowarden.daemon.notify.spi;

import java.nio.file.Path;
import java.util.List;
import org.cryowarden.drivers.settings.SettingsReader;
import org.cryowarden.rules.ConfigProblem;

/**
 * The entry point of a notifier plugin (a way to reach a person: webhook, e-mail, ...), found with
 * {@link java.util.ServiceLoader} under {@code META-INF/services/org.cryowarden.daemon.notify.spi.NotifierFactory}.
 * Built-in notifiers register exactly as a third-party jar in {@code plugins/} would. Implementations need a public
 * no-argument constructor and keep no mutable state.
 *
 * <p>Host order: {@link #validate} for every sender of the site's {@code notifiers} section (by {@code check} and
 * at daemon start, which refuses to start on problems), then {@link #create} once per sender that validated. The
 * host calls {@link Notifier#close} once at shutdown.
 */
public interface NotifierFactory {

    /** The name site files use in a sender's {@code kind:}, lower case: "webhook". Unique over all plugins. */
    String kind();

    /** One line for listings. */
    String description();

    /**
     * Every problem with a sender's settings (the sender's mapping without {@code id} and {@code kind}, which the
     * host reads), recorded on {@code settings} with positions; the host collects them. Files named in the
     * settings (a secret) resolve against {@code folder}, the site file's folder; validation reads them, so a
     * missing secret stops startup rather than the first page at night.
     */
    void validate(SettingsReader settings, Path folder);

    /**
     * The notifier for one validated sender; does no I/O yet.
     *
     * @throws IllegalArgumentException if the settings did not validate (a host programming error)
     */
    Notifier create(String senderId, SettingsReader settings, Path folder);

    /** Convenience for hosts and tests: the problems of {@code settings} as {@link #validate} finds them. */
    default List<ConfigProblem> problems(SettingsReader settings, Path folder) {
        validate(settings, folder);
        return settings.problems();
    }
}
