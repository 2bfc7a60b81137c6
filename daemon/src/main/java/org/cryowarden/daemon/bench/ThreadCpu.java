package org.cryowarden.daemon.bench;

import java.lang.management.ManagementFactory;
import java.lang.management.ThreadInfo;
import java.lang.management.ThreadMXBean;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * CPU time of the process's Java threads at one instant, by thread, so that two of them tell which of the daemon's
 * threads spent a footprint run's CPU: a budget that is missed is missed by somebody, and the pollers' wake-ups, the
 * engine and the MQTT link call for different remedies. Threads of one role (the pollers of several buses, the
 * link's pool) are summed under one name.
 */
final class ThreadCpu {

    private final Map<Long, Long> cpuById;
    private final Map<Long, String> roleById;

    ThreadCpu(Map<Long, Long> cpuById, Map<Long, String> roleById) {
        this.cpuById = cpuById;
        this.roleById = roleById;
    }

    /** Every live Java thread's CPU time now, but those in {@code excluded} (the bench device's threads). */
    static ThreadCpu now(Set<Long> excluded) {
        ThreadMXBean threads = ManagementFactory.getThreadMXBean();
        Map<Long, Long> cpu = new HashMap<>();
        Map<Long, String> roles = new HashMap<>();
        for (ThreadInfo info : threads.getThreadInfo(threads.getAllThreadIds())) {
            if (info == null || excluded.contains(info.getThreadId())) {
                continue;
            }
            long nanos = threads.getThreadCpuTime(info.getThreadId());
            if (nanos >= 0) {
                cpu.put(info.getThreadId(), nanos);
                roles.put(info.getThreadId(), role(info.getThreadName()));
            }
        }
        return new ThreadCpu(cpu, roles);
    }

    /**
     * CPU nanoseconds by role spent between {@code earlier} and this, largest first; a thread started in between
     * counts from zero, one that ended in between is missing (its time stays in the process total).
     */
    Map<String, Long> since(ThreadCpu earlier) {
        Map<String, Long> byRole = new HashMap<>();
        cpuById.forEach((id, nanos) -> byRole.merge(roleById.get(id),
                Math.max(0, nanos - earlier.cpuById.getOrDefault(id, 0L)), Long::sum));
        List<Map.Entry<String, Long>> sorted = new ArrayList<>(byRole.entrySet());
        sorted.sort(Map.Entry.<String, Long>comparingByValue().reversed().thenComparing(Map.Entry.comparingByKey()));
        Map<String, Long> result = new LinkedHashMap<>();
        sorted.forEach(entry -> result.put(entry.getKey(), entry.getValue()));
        return result;
    }

    /**
     * "poller bus-2" and "poller bus-3" are both "poller"; "cryowarden-mqtt-site-1-paho-4" is "mqtt link paho";
     * Paho's "MQTT Rec: site-1" is "MQTT Rec".
     */
    static String role(String threadName) {
        if (threadName.startsWith("poller ")) {
            return "poller";
        }
        if (threadName.startsWith("MQTT ") && threadName.contains(":")) {
            return threadName.substring(0, threadName.indexOf(':')); // Paho names its threads after the client id
        }
        String numbered = threadName.replaceAll("[ #-]*\\d+$", "");
        if (numbered.startsWith("cryowarden-mqtt-")) {
            return "mqtt link " + numbered.substring(numbered.lastIndexOf('-') + 1);
        }
        return numbered;
    }
}
