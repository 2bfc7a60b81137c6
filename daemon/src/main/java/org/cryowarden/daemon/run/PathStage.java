package org.cryowarden.daemon.run;

import jdk.jfr.Category;
import jdk.jfr.Description;
import jdk.jfr.Enabled;
import jdk.jfr.Label;
import jdk.jfr.Name;
import jdk.jfr.StackTrace;

/**
 * A point on the path from a reading to its published event, as a Flight Recorder event: the latency bench turns
 * it on (in-process) to see which hand-off the time goes to. Off unless a recording enables it, and then a
 * disabled event costs nothing: {@link #isEnabled()} is folded to {@code false} by the JIT and the object never
 * leaves the stack.
 */
@Name(PathStage.NAME)
@Label("Alarm path stage")
@Category("cryowarden")
@Description("A reading or event passing one hand-off between the transport and the MQTT publish")
@Enabled(false)
@StackTrace(false)
public final class PathStage extends jdk.jfr.Event {

    public static final String NAME = "org.cryowarden.PathStage";

    /** A reading was handed to the engine's inbox (poller thread); key: the channel. */
    public static final String OFFERED = "offered";
    /** The engine produced events from a reading (engine thread); key: the channel. */
    public static final String EVALUATED = "evaluated";
    /** The batch of those events was queued for the journal (engine thread); key: the first event's subject. */
    public static final String QUEUED = "queued";
    /** The journal thread took the batch to record it; key: the first event's subject. */
    public static final String TAKEN = "taken";
    /** The journal committed the batch; key: the event's subject, seq: its sequence number. */
    public static final String COMMITTED = "committed";
    /** The outbox handed the event to the MQTT link; seq: its sequence number. */
    public static final String SENT = "sent";

    @Label("Stage")
    String stage;

    @Label("Key")
    String key;

    @Label("Sequence number")
    long seq;

    @Label("Monotonic time (ns)")
    long nanos;

    /** Marks {@code stage} of {@code key} now, when a recording listens. */
    static void mark(String stage, String key, long seq) {
        PathStage event = new PathStage();
        if (event.isEnabled()) {
            event.stage = stage;
            event.key = key;
            event.seq = seq;
            event.nanos = System.nanoTime();
            event.commit();
        }
    }
}
