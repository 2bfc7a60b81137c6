package org.cryowarden.rules.physics;

/**
 * Which side of the lambda point (T90 = 2.1768 K on the saturated vapour curve) a helium-4 bath is on. Below it
 * the liquid is superfluid: it creeps as a film and leaks through gaps that are tight at 4.2 K, and
 * superconducting level probes can read high.
 */
public enum HeliumPhase {
    HE_I("He I"),
    HE_II("He II");

    private final String label;

    HeliumPhase(String label) {
        this.label = label;
    }

    /** "He I" or "He II", as the trade writes it. */
    public String label() {
        return label;
    }

    @Override
    public String toString() {
        return label;
    }
}
