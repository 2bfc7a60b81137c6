package org.cryowarden.daemon.mqtt;

import java.util.concurrent.ThreadFactory;
import java.util.concurrent.atomic.AtomicInteger;

/** Names the link's threads so that a thread dump (and the leak test) tells which link and which role they serve. */
final class LinkThreads implements ThreadFactory {

    /** Every thread of every link starts with this. */
    static final String PREFIX = "cryowarden-mqtt-";

    private final String name;
    private final AtomicInteger count = new AtomicInteger();

    LinkThreads(String clientId, String role) {
        this.name = PREFIX + clientId + "-" + role;
    }

    @Override
    public Thread newThread(Runnable task) {
        Thread thread = new Thread(task, name + "-" + count.incrementAndGet());
        thread.setDaemon(true);
        return thread;
    }

    static boolean isLinkThread(Thread thread) {
        return thread.getName().startsWith(PREFIX);
    }
}
