package org.cryowarden.rules.config;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.model.RuleSet;

/**
 * Loads a site file and its rule-set files and checks them together, reporting every problem of every file
 * in one run: first each file on its own, then {@link CrossFileValidator} across them, then the driver
 * settings through the {@link DriverSettingsValidator} the caller passes in.
 */
public final class ConfigurationLoader {

    private ConfigurationLoader() {
    }

    /**
     * @param site      a {@code *-site.yaml} file
     * @param ruleFiles {@code *-rules.yaml} files, possibly none; their rules and interlocks are merged
     * @param drivers   checks driver-specific settings; {@link DriverSettingsValidator#acceptAll()} skips that
     * @throws ConfigException with every problem, site file first, then the rule files in the order given
     */
    public static Configuration load(Path site, List<Path> ruleFiles, DriverSettingsValidator drivers)
            throws ConfigException {
        Objects.requireNonNull(site, "site");
        Objects.requireNonNull(drivers, "drivers");
        Problems problems = new Problems();
        List<String> labels = new ArrayList<>();
        labels.add(site.toString());
        for (Path file : ruleFiles) {
            labels.add(file.toString());
        }
        problems.orderFiles(labels);
        SiteFile siteFile = SiteLoader.read(site, problems, drivers);
        List<RuleFile> files = new ArrayList<>();
        for (Path file : ruleFiles) {
            files.add(RuleSetLoader.read(file, problems));
        }
        CrossFileValidator.validate(siteFile, files, problems);
        RuleSet merged = RuleSetLoader.merge(files, problems);
        problems.throwIfAny();
        return new Configuration(siteFile.site().orElseThrow(), merged, site.toString(),
                labels.subList(1, labels.size()));
    }
}
