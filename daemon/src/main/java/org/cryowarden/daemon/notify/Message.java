package org.cryowarden.daemon.notify;

import com.fasterxml.jackson.databind.node.ObjectNode;

/**
 * One thing to tell one contact, before it is split over the contact's reach entries into notices.
 *
 * @param id   stable: derived from the journal sequence number of the event that caused it, the step and the
 *             contact, so a replayed night gives the same ids and a retried notice keeps its id
 * @param kind {@code alarm}, {@code reminder}, {@code taken}, {@code recovered}, {@code flood}, {@code flood-ended}
 *             or {@code digest}
 * @param json the fields of the notice; the dispatcher adds nothing but {@code id} and {@code contact}
 */
record Message(String id, Roster.Contact contact, String kind, String subject, String text, ObjectNode json) {
}
