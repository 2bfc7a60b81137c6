package org.cryowarden.daemon.notify;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.notify.spi.Notifier;
import org.cryowarden.daemon.notify.spi.NotifierFactory;
import org.cryowarden.drivers.settings.SettingsReader;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.NameMatch;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.config.ConfigNode;
import org.cryowarden.rules.model.SiteDef;

/**
 * The site file's {@code notifiers} section, checked: the senders (each validated by its plugin) and the on-call
 * roster file they serve. Reading it reads the secret files and the roster, so {@code check} and startup find a
 * missing secret or a misspelt contact rather than the first page at night.
 * <pre>
 * notifiers:
 *   roster: harbour-hall-roster.yaml
 *   senders:
 *     - {id: pager-hook, kind: webhook, url: https://HOST/PATH, secret_file: FILE}
 *     - {id: lab-mail, kind: email, host: smtp.example.org, from: cryowarden@example.org}
 * </pre>
 */
public final class NotifySetup {

    private record Sender(String id, NotifierFactory factory, SettingsReader settings) {
    }

    private final Roster roster;
    private final List<Sender> senders;
    private final Path folder;

    private NotifySetup(Roster roster, List<Sender> senders, Path folder) {
        this.roster = roster;
        this.senders = List.copyOf(senders);
        this.folder = folder;
    }

    /**
     * Reads the section, or empty when the site has none.
     *
     * @param folder the site file's folder, against which the roster and secret files resolve
     * @throws ConfigException with every problem of the section and of the roster file
     */
    public static Optional<NotifySetup> read(SiteDef site, Path folder, NotifierCatalog catalog)
            throws ConfigException {
        ConfigNode.Mapping section = site.sections().get("notifiers");
        if (section == null) {
            return Optional.empty();
        }
        List<ConfigProblem> problems = new ArrayList<>();
        SettingsReader top = new SettingsReader(section, "notifiers");
        top.allowOnly("roster", "senders");
        Optional<String> rosterFile = top.text("roster", true);
        List<Sender> senders = new ArrayList<>();
        Map<String, String> kinds = new LinkedHashMap<>();
        top.sequence("senders", true).ifPresent(list -> {
            if (list.items().isEmpty()) {
                problems.add(new ConfigProblem(list.position(), "notifiers senders is empty; define at least one"
                        + " {id: ..., kind: webhook | email, ...}"));
            }
            for (ConfigNode item : list.items()) {
                sender(item, catalog, folder, kinds, problems).ifPresent(senders::add);
            }
        });
        problems.addAll(top.problems());
        Optional<Roster> roster = Optional.empty();
        if (rosterFile.isPresent() && problems.isEmpty()) {
            try {
                roster = Optional.of(RosterLoader.load(folder.resolve(rosterFile.get().strip()), kinds));
            } catch (ConfigException e) {
                problems.addAll(e.problems());
            }
        }
        if (!problems.isEmpty()) {
            throw new ConfigException(problems);
        }
        return Optional.of(new NotifySetup(roster.orElseThrow(), senders, folder));
    }

    private static Optional<Sender> sender(ConfigNode item, NotifierCatalog catalog, Path folder,
            Map<String, String> kinds, List<ConfigProblem> problems) {
        if (!(item instanceof ConfigNode.Mapping mapping)) {
            problems.add(new ConfigProblem(item.position(), "a sender must be a mapping {id: ..., kind: ...}, got "
                    + item.kind()));
            return Optional.empty();
        }
        SettingsReader head = new SettingsReader(mapping, "a sender");
        Optional<String> id = head.text("id", true).map(String::strip);
        Optional<String> kind = head.text("kind", true).map(String::strip);
        problems.addAll(head.problems());
        if (id.isEmpty() || kind.isEmpty()) {
            return Optional.empty();
        }
        if (kinds.containsKey(id.get())) {
            problems.add(new ConfigProblem(head.position("id"), "duplicate sender id '" + id.get() + "'"));
            return Optional.empty();
        }
        Optional<NotifierFactory> factory = catalog.kind(kind.get());
        if (factory.isEmpty()) {
            problems.add(new ConfigProblem(head.position("kind"), "sender '" + id.get() + "' has unknown kind '"
                    + kind.get() + "'" + NameMatch.closest(kind.get(), catalog.kinds())
                    .map(c -> "; did you mean '" + c + "'?").orElse("; installed: " + String.join(", ",
                            catalog.kinds()))));
            return Optional.empty();
        }
        List<ConfigNode.Entry> rest = mapping.entries().stream()
                .filter(e -> !e.key().equals("id") && !e.key().equals("kind")).toList();
        SettingsReader settings = new SettingsReader(new ConfigNode.Mapping(rest, mapping.position()),
                "sender '" + id.get() + "'");
        problems.addAll(factory.get().problems(settings, folder));
        kinds.put(id.get(), kind.get());
        SettingsReader fresh = new SettingsReader(settings.mapping(), "sender '" + id.get() + "'");
        return Optional.of(new Sender(id.get(), factory.get(), fresh));
    }

    public Roster roster() {
        return roster;
    }

    /** The sender ids, in file order. */
    public List<String> senderIds() {
        return senders.stream().map(Sender::id).toList();
    }

    /** Builds the notifiers (no I/O yet) and the service on {@code journal}'s outbox; not started. */
    public NotifyService service(Journal journal, TimeSource time, String site) {
        Map<String, Notifier> notifiers = new LinkedHashMap<>();
        for (Sender sender : senders) {
            notifiers.put(sender.id(), sender.factory().create(sender.id(), sender.settings(), folder));
        }
        return new NotifyService(roster, notifiers, journal, time, site);
    }
}
