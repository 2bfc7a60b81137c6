package org.cryowarden.simulator.model;

import java.util.List;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.rules.physics.Cryogen;
import org.cryowarden.rules.physics.VerticalVessel;

/**
 * A dewar or cryostat bath: its liquid, geometry and pressure devices.
 *
 * @param neckCubicMetres             gas space above the straight shell (top head, neck), always vapour
 * @param heatLoadWatts               the normal heat leak into the liquid
 * @param heaterWatts                 a bath heater's power while its output is on (0 for none)
 * @param vacuumMillibar              the insulating vacuum while it holds
 * @param initialPressurePascal       absolute bath pressure at the start
 */
public record VesselSpec(String id, String roomId, Cryogen fluid, VerticalVessel geometry, double diameterMetres,
        double neckCubicMetres, double initialLiquidCubicMetres, double heatLoadWatts, double heaterWatts,
        VentSpec vent, Optional<ReliefSpec> relief, Optional<ReliefSpec> burstDisc, List<MagnetSpec> magnets,
        List<StageSpec> stages, double vacuumMillibar, double initialPressurePascal) {

    public VesselSpec {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(roomId, "roomId");
        Objects.requireNonNull(fluid, "fluid");
        Objects.requireNonNull(geometry, "geometry");
        Objects.requireNonNull(vent, "vent");
        Objects.requireNonNull(relief, "relief");
        Objects.requireNonNull(burstDisc, "burstDisc");
        magnets = List.copyOf(magnets);
        stages = List.copyOf(stages);
        if (!(neckCubicMetres > 0)) {
            throw new IllegalArgumentException("a vessel needs a gas space above the liquid, got " + neckCubicMetres);
        }
    }

    /** Total inner volume: the shell and bottom plus the neck. */
    public double innerCubicMetres() {
        return geometry.capacityCubicMetres() + neckCubicMetres;
    }
}
