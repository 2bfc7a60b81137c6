package org.cryowarden.rules.config;

import java.util.Map;
import java.util.Optional;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.model.SiteDef;

/**
 * What a site file yielded, for the checks across files: the site as far as it loaded, and every id it
 * declared, even those whose definition had errors (so that a rule naming them is not reported twice).
 *
 * @param site       empty when the file could not be read as YAML at all
 * @param channelIds measured and derived channels, in file order
 * @param outputIds  outputs, in file order
 */
record SiteFile(
        Optional<SiteDef> site,
        String label,
        Map<String, SourcePosition> channelIds,
        Map<String, SourcePosition> outputIds,
        SourceMap sources) {

    SiteFile {
        channelIds = java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(channelIds));
        outputIds = java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(outputIds));
    }

    static SiteFile unreadable(String label) {
        return new SiteFile(Optional.empty(), label, Map.of(), Map.of(), new SourceMap());
    }
}
