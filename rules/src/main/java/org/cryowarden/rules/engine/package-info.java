/**
 * The deterministic rule engine: readings and clock ticks in, alarm transitions, interlock trips and output
 * commands out, with the ISA-18.2 (IEC 62682) alarm lifecycle.
 *
 * <p>The public face is {@link org.cryowarden.rules.engine.Engine}, built from an
 * {@link org.cryowarden.rules.engine.EngineConfig} and a {@link org.cryowarden.rules.TimeSource}, the sealed
 * {@link org.cryowarden.rules.engine.EngineEvent} family, {@link org.cryowarden.rules.engine.CommandResult}, the
 * status and snapshot records, and the {@link org.cryowarden.rules.engine.DerivedFunctions} catalogue. Everything
 * else is package-private machinery. The engine has no threads, does no I/O and never sleeps: the daemon calls it
 * from one thread.
 *
 * <p>cryowarden is a supervisory layer, not a certified safety system: it never replaces hardwired oxygen
 * monitoring, relief devices or local codes.
 */
package org.cryowarden.rules.engine;
