package org.cryowarden.drivers.poll;

import org.cryowarden.rules.Reading;

/**
 * Where a bus poller delivers readings: called on the poller's thread, once per reading, in poll order. It must
 * return quickly (hand the reading to a bounded queue); an exception it throws is logged and counted, and the
 * poller carries on.
 */
@FunctionalInterface
public interface ReadingSink {
    void accept(Reading reading);
}
