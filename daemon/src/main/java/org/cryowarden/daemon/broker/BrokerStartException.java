package org.cryowarden.daemon.broker;

/**
 * The embedded broker could not be started; the message says why and what the operator can do next.
 * Checked, because a taken port or a full temp folder is a fact of the machine, not a programming error.
 */
public final class BrokerStartException extends Exception {

    BrokerStartException(String message) {
        super(message);
    }

    BrokerStartException(String message, Throwable cause) {
        super(message, cause);
    }
}
