package org.cryowarden.daemon.journal;

import java.util.List;

/** One step of the journal's schema: applied once, in order, in one transaction; never edited once released. */
record Migration(int version, String description, List<String> statements) {

    Migration {
        statements = List.copyOf(statements);
    }
}
