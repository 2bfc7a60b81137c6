package org.cryowarden.daemon.replay;

import java.time.Duration;
import java.time.Instant;
import java.util.Objects;
import org.cryowarden.rules.engine.CommandResult;
import org.cryowarden.rules.engine.Engine;

/**
 * A recorded operator command, replayed into the engine at the instant it was given. Each kind calls the
 * {@link Engine} method of the same name.
 */
public sealed interface OperatorAction {

    Instant instant();

    /** Who acted. */
    String operator();

    /** The alarm or interlock acted on. */
    String target();

    /** Gives the command to {@code engine}. */
    CommandResult applyTo(Engine engine);

    record Acknowledge(Instant instant, String alarmId, String operator, String note) implements OperatorAction {
        public Acknowledge {
            Objects.requireNonNull(instant, "instant");
            Objects.requireNonNull(alarmId, "alarmId");
            Objects.requireNonNull(note, "note");
        }

        @Override
        public String target() {
            return alarmId;
        }

        @Override
        public CommandResult applyTo(Engine engine) {
            return engine.acknowledge(alarmId, operator, note);
        }
    }

    record Shelve(Instant instant, String alarmId, String operator, Duration duration, String reason)
            implements OperatorAction {
        public Shelve {
            Objects.requireNonNull(instant, "instant");
            Objects.requireNonNull(alarmId, "alarmId");
            Objects.requireNonNull(duration, "duration");
            Objects.requireNonNull(reason, "reason");
        }

        @Override
        public String target() {
            return alarmId;
        }

        @Override
        public CommandResult applyTo(Engine engine) {
            return engine.shelve(alarmId, operator, duration, reason);
        }
    }

    record Unshelve(Instant instant, String alarmId, String operator) implements OperatorAction {
        public Unshelve {
            Objects.requireNonNull(instant, "instant");
            Objects.requireNonNull(alarmId, "alarmId");
        }

        @Override
        public String target() {
            return alarmId;
        }

        @Override
        public CommandResult applyTo(Engine engine) {
            return engine.unshelve(alarmId, operator);
        }
    }

    record RemoveFromService(Instant instant, String alarmId, String operator, String reason)
            implements OperatorAction {
        public RemoveFromService {
            Objects.requireNonNull(instant, "instant");
            Objects.requireNonNull(alarmId, "alarmId");
            Objects.requireNonNull(reason, "reason");
        }

        @Override
        public String target() {
            return alarmId;
        }

        @Override
        public CommandResult applyTo(Engine engine) {
            return engine.removeFromService(alarmId, operator, reason);
        }
    }

    record ReturnToService(Instant instant, String alarmId, String operator) implements OperatorAction {
        public ReturnToService {
            Objects.requireNonNull(instant, "instant");
            Objects.requireNonNull(alarmId, "alarmId");
        }

        @Override
        public String target() {
            return alarmId;
        }

        @Override
        public CommandResult applyTo(Engine engine) {
            return engine.returnToService(alarmId, operator);
        }
    }

    record Reset(Instant instant, String interlockId, String operator) implements OperatorAction {
        public Reset {
            Objects.requireNonNull(instant, "instant");
            Objects.requireNonNull(interlockId, "interlockId");
        }

        @Override
        public String target() {
            return interlockId;
        }

        @Override
        public CommandResult applyTo(Engine engine) {
            return engine.reset(interlockId, operator);
        }
    }

    /** The reset of a locked-out fill controller: the daemon's {@code reset} verb on a fill id. */
    record ResetFill(Instant instant, String fillId, String operator) implements OperatorAction {
        public ResetFill {
            Objects.requireNonNull(instant, "instant");
            Objects.requireNonNull(fillId, "fillId");
        }

        @Override
        public String target() {
            return fillId;
        }

        @Override
        public CommandResult applyTo(Engine engine) {
            return engine.resetFill(fillId, operator);
        }
    }

    record Bypass(Instant instant, String interlockId, String operator, String reason, Duration duration)
            implements OperatorAction {
        public Bypass {
            Objects.requireNonNull(instant, "instant");
            Objects.requireNonNull(interlockId, "interlockId");
            Objects.requireNonNull(reason, "reason");
            Objects.requireNonNull(duration, "duration");
        }

        @Override
        public String target() {
            return interlockId;
        }

        @Override
        public CommandResult applyTo(Engine engine) {
            return engine.bypass(interlockId, operator, reason, duration);
        }
    }

    record EndBypass(Instant instant, String interlockId, String operator) implements OperatorAction {
        public EndBypass {
            Objects.requireNonNull(instant, "instant");
            Objects.requireNonNull(interlockId, "interlockId");
        }

        @Override
        public String target() {
            return interlockId;
        }

        @Override
        public CommandResult applyTo(Engine engine) {
            return engine.endBypass(interlockId, operator);
        }
    }
}
