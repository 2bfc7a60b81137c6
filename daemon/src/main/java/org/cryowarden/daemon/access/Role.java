package org.cryowarden.daemon.access;

/**
 * What an operator may do, each role including the ones before it: a viewer only reads; an operator acknowledges,
 * shelves and unshelves alarms; a supervisor also resets latched interlocks and bypasses them, the commands that
 * can leave a plant unprotected.
 */
public enum Role {
    VIEWER, OPERATOR, SUPERVISOR;

    /** The least role a command verb needs. */
    static Role needed(String verb) {
        return switch (verb) {
            case "ack", "shelve", "unshelve" -> OPERATOR;
            case "reset", "bypass" -> SUPERVISOR;
            default -> throw new IllegalArgumentException("unknown command verb '" + verb + "'");
        };
    }

    boolean allows(String verb) {
        return compareTo(needed(verb)) >= 0;
    }

    String label() {
        return name().toLowerCase(java.util.Locale.ROOT);
    }
}
