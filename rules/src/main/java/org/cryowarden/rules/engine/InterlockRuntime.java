package org.cryowarden.rules.engine;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Optional;
import java.util.Set;
import org.cryowarden.rules.model.InterlockDef;
import org.cryowarden.rules.model.OutputAction;

/**
 * One interlock: tripped by the activation of any alarm that names it, latched until every such alarm's condition
 * is clear and an operator resets it, and inert while bypassed (the alarms still raise). When a bypass ends while a
 * cause alarm is still active the interlock trips at once, so a bypass can never silently outlive its expiry.
 */
final class InterlockRuntime {

    private final Core core;
    final String id;
    final InterlockDef def;
    final List<AlarmRuntime> causes = new ArrayList<>();
    private final Set<String> outputs = new LinkedHashSet<>();

    boolean tripped;
    private Instant trippedAt;
    private final List<String> trippedBy = new ArrayList<>();

    private boolean bypassed;
    private String bypassOwner;
    private String bypassReason;
    private Duration bypassDuration;
    private long bypassUntil;
    private Instant bypassUntilWall;
    private final Timer bypassTimer = new Timer() {
        @Override
        void expire() {
            endBypass(Optional.empty(), "bypass by " + bypassOwner + " expired after " + Texts.duration(bypassDuration));
        }
    };

    InterlockRuntime(Core core, InterlockDef def) {
        this.core = core;
        this.id = def.id();
        this.def = def;
        for (OutputAction action : def.actions()) {
            outputs.add(action.output());
        }
    }

    boolean acts(String output) {
        return outputs.contains(output);
    }

    void causeActivated(AlarmRuntime alarm, String cause) {
        if (bypassed) {
            return;
        }
        if (tripped) {
            if (!trippedBy.contains(alarm.id)) {
                trippedBy.add(alarm.id);
            }
            return;
        }
        trip(alarm, "tripped by " + alarm.id + ": " + cause);
    }

    private void trip(AlarmRuntime alarm, String cause) {
        tripped = true;
        trippedAt = core.wall;
        trippedBy.clear();
        trippedBy.add(alarm.id);
        List<OutputCommand> commands = new ArrayList<>();
        for (OutputAction action : def.actions()) {
            commands.add(new OutputCommand(core.wall, action.output(), action.value(), id,
                    "interlock " + id + " tripped by " + alarm.id));
        }
        core.emit(new InterlockTripped(core.wall, id, alarm.id, commands, cause));
        commands.forEach(core::emit);
    }

    String reset(String operator) {
        if (!tripped) {
            return "interlock " + id + " is not tripped: there is nothing to reset";
        }
        for (AlarmRuntime cause : causes) {
            if (cause.raw() || cause.active) {
                return "interlock " + id + " cannot be reset while its cause persists: alarm " + cause.id
                        + " is still active (" + cause.rawCause + "); clear the cause first, then reset";
            }
        }
        tripped = false;
        trippedAt = null;
        trippedBy.clear();
        List<OutputCommand> commands = new ArrayList<>();
        for (String output : outputs) {
            if (!core.heldByOtherTrip(output, this)) {
                commands.add(new OutputCommand(core.wall, output, core.outputs.get(output).safeValue(), id,
                        "interlock " + id + " reset by " + operator + ": back to the safe value"));
            }
        }
        core.emit(new InterlockReset(core.wall, id, operator, commands, "reset by " + operator));
        commands.forEach(core::emit);
        return null;
    }

    String bypass(String owner, String reason, Duration duration) {
        if (bypassed) {
            return "interlock " + id + " is already bypassed by " + bypassOwner + " until " + bypassUntilWall
                    + ": end that bypass first";
        }
        if (duration.isZero() || duration.isNegative()) {
            return "a bypass needs a positive duration, got " + Texts.duration(duration);
        }
        if (reason.isBlank()) {
            return "a bypass needs a reason the next operator can read";
        }
        startBypass(owner, reason.strip(), duration, duration);
        core.emit(new BypassStarted(core.wall, id, owner, bypassReason, bypassUntilWall, duration,
                "bypassed by " + owner + " for " + Texts.duration(duration) + ": " + bypassReason));
        return null;
    }

    private void startBypass(String owner, String reason, Duration duration, Duration remaining) {
        bypassed = true;
        bypassOwner = owner;
        bypassReason = reason;
        bypassDuration = duration;
        bypassUntil = core.now + remaining.toNanos();
        bypassUntilWall = core.wall.plus(remaining);
        core.timers.schedule(bypassTimer, bypassUntil);
    }

    String endBypass(String operator) {
        if (!bypassed) {
            return "interlock " + id + " is not bypassed";
        }
        endBypass(Optional.of(operator), "bypass ended by " + operator);
        return null;
    }

    private void endBypass(Optional<String> operator, String cause) {
        bypassed = false;
        core.timers.cancel(bypassTimer);
        core.emit(new BypassEnded(core.wall, id, bypassOwner, operator, cause));
        if (!tripped) {
            for (AlarmRuntime alarm : causes) {
                if (alarm.active) {
                    trip(alarm, "tripped by " + alarm.id + " at the end of the bypass: the alarm is still active ("
                            + alarm.rawCause + ")");
                    break;
                }
            }
        }
    }

    Optional<Bypass> bypassInfo() {
        if (!bypassed) {
            return Optional.empty();
        }
        long remaining = Math.max(0, bypassUntil - core.time.monotonicNanos());
        return Optional.of(new Bypass(bypassOwner, bypassReason, bypassUntilWall, Duration.ofNanos(remaining)));
    }

    InterlockStatus status() {
        return new InterlockStatus(id, def.description(), tripped, Optional.ofNullable(trippedAt), trippedBy,
                bypassInfo());
    }

    EngineSnapshot.InterlockRecord record() {
        return new EngineSnapshot.InterlockRecord(id, tripped, Optional.ofNullable(trippedAt), trippedBy, bypassInfo());
    }

    /** Takes back a latched trip and a bypass; returns the commands that re-assert a trip's outputs. */
    List<OutputCommand> restore(EngineSnapshot.InterlockRecord record) {
        tripped = record.tripped();
        trippedAt = record.trippedAt().orElse(null);
        trippedBy.clear();
        trippedBy.addAll(record.causes());
        if (record.bypass().isPresent()) {
            Bypass bypass = record.bypass().get();
            Duration byWall = Duration.between(core.wall, bypass.until());
            Duration remaining = byWall.compareTo(bypass.remaining()) < 0 ? byWall : bypass.remaining();
            if (remaining.isNegative()) {
                remaining = Duration.ZERO;
            }
            startBypass(bypass.owner(), bypass.reason(), remaining, remaining);
        }
        List<OutputCommand> commands = new ArrayList<>();
        if (tripped) {
            for (OutputAction action : def.actions()) {
                commands.add(new OutputCommand(core.wall, action.output(), action.value(), id,
                        "interlock " + id + " still tripped after the restart"));
            }
        }
        return commands;
    }
}
