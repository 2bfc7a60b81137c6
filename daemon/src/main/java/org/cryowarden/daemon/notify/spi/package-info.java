/**
 * The notifier plugin SPI: {@link org.cryowarden.daemon.notify.spi.NotifierFactory} (discovered with
 * {@link java.util.ServiceLoader}), {@link org.cryowarden.daemon.notify.spi.Notifier} (one attempt per call),
 * {@link org.cryowarden.daemon.notify.spi.Notice} and {@link org.cryowarden.daemon.notify.spi.Delivery}. The host
 * owns queueing (the journal's outbox), ordering, retries with backoff and the journal records of every attempt.
 */
package org.cryowarden.daemon.notify.spi;
