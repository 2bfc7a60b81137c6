package org.cryowarden.daemon.demo;

/** The safety caution the demo prints first and last. */
final class Caution {

    static final String TEXT = """
            CAUTION: cryowarden is a supervisory and alerting layer, not a certified safety system. It never replaces
            hardwired oxygen monitoring, relief valves, burst discs or what local codes require. This night, its site
            and its instruments are invented for the demo.""";

    static final String SHORT = "Supervisory layer only: never a replacement for hardwired oxygen monitoring,"
            + " relief devices or local codes.";

    private Caution() {
    }
}
