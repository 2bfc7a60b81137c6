package org.cryowarden.simulator.model;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.physics.Cryogen;

/**
 * A dewar or cryostat bath stepped in time. Heat (normal leak, heater, loss of vacuum, quench) evaporates
 * {@code Q dt / L} of liquid (latent heat and liquid density of {@link Cryogen}, so 1 W boils the 1.39 L/h of
 * helium of {@code BoilOff}); the vapour joins the gas space, whose pressure is taken proportional to the vapour
 * mass per volume with the saturated vapour density at the normal boiling point ({@code p = m p0 / (V rho_v0)});
 * gas leaves through the vent (check valve), the relief valve and, once ruptured, the burst disc, each flowing in
 * proportion to the pressure above its opening point. The pressure of a step is solved implicitly (backward
 * Euler, bisection), which stays stable when a quench drives a relief at hundreds of grams per second. The bath
 * sits at saturation for its pressure (ITS-90 for helium, Span et al. for nitrogen); the sensible heat of
 * warming the liquid and thermal stratification are neglected.
 *
 * <p>Heat flux on loss of insulating vacuum is applied to the wetted area {@code pi D h + pi D^2 / 4} (bottom
 * taken as flat), ramping with the vacuum-space pressure. Every kilogram is booked: what leaves goes to the
 * recovery line or into the room, and the ledger closes to rounding. Owned by the simulation thread.
 */
public final class Vessel {

    private static final double PASCAL_PER_MILLIBAR = 100;

    private final VesselSpec spec;
    private final Room room;
    private final Cryogen fluid;
    private final double latentHeat;
    private final double liquidDensity;
    /** kg of vapour per m3 per Pa: the saturated vapour density at the normal boiling point over 1 atm. */
    private final double vapourDensityPerPascal;

    private double liquidKg;
    private double vapourKg;
    private double pressure;
    private double heatLoadWatts;

    private boolean ventBlocked;
    private double leakFraction;
    private double scriptedFillKgPerSecond;
    private double fillUntilKg = Double.POSITIVE_INFINITY;
    private double valveFillKgPerSecond;
    private boolean fillValveOpen;
    private boolean heaterOn;
    private double extraHeatWatts;

    private boolean vacuumLost;
    private double vacuumLostAt;
    private double vacuumRiseSeconds;
    private double lossHeatFlux;

    private final Map<String, Double> magnetKelvin = new LinkedHashMap<>();
    private final List<Quench> quenches = new ArrayList<>();
    private final Map<String, Double> stageKelvin = new LinkedHashMap<>();

    private boolean burstOpen;
    private boolean reliefOpen;
    private int reliefLifts;

    private final double initialKg;
    private double filledKg;
    private double toRecoveryKg;
    private double toRoomKg;

    public Vessel(VesselSpec spec, Room room) {
        this.spec = spec;
        this.room = room;
        this.fluid = spec.fluid();
        this.latentHeat = fluid.latentHeatJoulePerKg();
        this.liquidDensity = fluid.liquidDensityKgPerCubicMetre();
        this.vapourDensityPerPascal = fluid.saturatedVapourDensityKgPerCubicMetre()
                / Quantity.STANDARD_ATMOSPHERE_PA;
        this.liquidKg = spec.initialLiquidCubicMetres() * liquidDensity;
        this.pressure = spec.initialPressurePascal();
        this.vapourKg = pressure * vapourDensityPerPascal * ullage();
        this.heaterOn = spec.heaterWatts() > 0;
        this.initialKg = liquidKg + vapourKg;
        double bath = bathKelvin();
        for (MagnetSpec magnet : spec.magnets()) {
            magnetKelvin.put(magnet.id(), bath);
        }
        for (StageSpec stage : spec.stages()) {
            stageKelvin.put(stage.id(), stage.kelvin());
        }
    }

    public VesselSpec spec() {
        return spec;
    }

    public String id() {
        return spec.id();
    }

    public Room room() {
        return room;
    }

    // ---- events and outputs -------------------------------------------------------------------------------

    public void setVentBlocked(boolean blocked) {
        this.ventBlocked = blocked;
    }

    /** Sends {@code fraction} (0-1) of the vent flow into the room instead of the recovery line. */
    public void setLeakFraction(double fraction) {
        this.leakFraction = Math.max(0, Math.min(1, fraction));
    }

    /** A scripted transfer of liquid at a rate (kg/s) until the liquid reaches {@code untilKg} (infinite: full). */
    public void startFill(double kgPerSecond, double untilKg) {
        this.scriptedFillKgPerSecond = kgPerSecond;
        this.fillUntilKg = untilKg;
    }

    public void stopFill() {
        this.scriptedFillKgPerSecond = 0;
        this.fillUntilKg = Double.POSITIVE_INFINITY;
    }

    /** The rate a fill valve output passes while open, kg/s of liquid. */
    public void setFillValveRate(double kgPerSecond) {
        this.valveFillKgPerSecond = kgPerSecond;
    }

    public void setFillValveOpen(boolean open) {
        this.fillValveOpen = open;
    }

    public void setHeaterOn(boolean on) {
        this.heaterOn = on;
    }

    /** An additional steady heat load (a scripted change of the heat leak), W. */
    public void setExtraHeat(double watts) {
        this.extraHeatWatts = watts;
    }

    /** Air (or helium) enters the insulating vacuum: heat flux on the wetted area, ramping as the space fills. */
    public void loseVacuum(double now, double heatFluxWattsPerSquareMetre, double riseSeconds) {
        if (vacuumLost) {
            return;
        }
        vacuumLost = true;
        vacuumLostAt = now;
        vacuumRiseSeconds = Math.max(1e-3, riseSeconds);
        lossHeatFlux = heatFluxWattsPerSquareMetre;
    }

    /** Quenches a magnet of this bath: its stored energy goes into the bath over its quench time. */
    public void quench(String magnetId, double now, Optional<Double> energyJoules, Optional<Double> seconds) {
        MagnetSpec magnet = spec.magnets().stream().filter(m -> m.id().equals(magnetId)).findFirst()
                .orElseThrow(() -> new IllegalArgumentException("no magnet " + magnetId + " in " + spec.id()));
        quenches.add(new Quench(magnet, now, energyJoules.orElse(magnet.storedEnergyJoules()),
                Math.max(1e-3, seconds.orElse(magnet.quenchSeconds()))));
    }

    // ---- stepping -----------------------------------------------------------------------------------------

    /** Advances by {@code dt} seconds ending at {@code now} (seconds since the start). */
    public void step(double now, double dt) {
        double start = now - dt;
        double ambient = room.spec().pressurePascal();
        double quenchJoules = 0;
        for (Quench quench : quenches) {
            double overlap = Math.min(now, quench.start + quench.seconds) - Math.max(start, quench.start);
            if (overlap > 0) {
                quenchJoules += quench.joules * overlap / quench.seconds;
            }
        }
        quenches.removeIf(q -> q.start + q.seconds <= start - 3600);
        double heatWatts = spec.heatLoadWatts() + extraHeatWatts + (heaterOn ? spec.heaterWatts() : 0)
                + vacuumLossWatts(now) + quenchJoules / dt;
        heatLoadWatts = heatWatts;

        double evaporated = Math.min(liquidKg, heatWatts * dt / latentHeat);
        double fillRate = scriptedFillKgPerSecond + (fillValveOpen ? valveFillKgPerSecond : 0);
        double headroomKg = spec.geometry().capacityCubicMetres() * liquidDensity - (liquidKg - evaporated);
        double fill = Math.max(0, Math.min(fillRate * dt, headroomKg));
        if (scriptedFillKgPerSecond > 0 && liquidKg - evaporated + fill >= fillUntilKg) {
            fill = Math.max(0, fillUntilKg - (liquidKg - evaporated));
            stopFill();
        }
        liquidKg = liquidKg - evaporated + fill;
        filledKg += fill;

        Flows flows = solve(vapourKg + evaporated, dt, ambient);
        if (!burstOpen && spec.burstDisc().isPresent() && flows.pressure >= spec.burstDisc().get().setPascal()) {
            burstOpen = true;
            flows = solve(vapourKg + evaporated, dt, ambient);
        }
        book(flows, vapourKg + evaporated);
        pressure = flows.pressure;
        boolean opened = flows.relief > 0;
        if (opened && !reliefOpen) {
            reliefLifts++;
        }
        reliefOpen = opened;
        updateTemperatures(now, dt);
    }

    private double vacuumLossWatts(double now) {
        if (!vacuumLost) {
            return 0;
        }
        double wetted = Math.PI * spec.diameterMetres() * liquidHeight()
                + Math.PI * spec.diameterMetres() * spec.diameterMetres() / 4;
        return lossHeatFlux * wetted * vacuumFilled(now);
    }

    /** 0 with a good vacuum, 1 once the vacuum space has reached room pressure. */
    private double vacuumFilled(double now) {
        return vacuumLost ? 1 - Math.exp(-(now - vacuumLostAt) / vacuumRiseSeconds) : 0;
    }

    /** Pressure and flows (kg over the step) when {@code gasKg} of vapour is in the gas space before venting. */
    private Flows solve(double gasKg, double dt, double ambient) {
        double perKg = 1 / (vapourDensityPerPascal * ullage());
        double lo = 0;
        double hi = gasKg;
        for (int i = 0; i < 200 && hi - lo > 1e-15 * Math.max(gasKg, 1e-30); i++) {
            double mid = 0.5 * (lo + hi);
            if (mid + dt * totalFlow(mid * perKg, ambient) < gasKg) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        double p = 0.5 * (lo + hi) * perKg;
        return new Flows(p, dt * ventFlow(p, ambient), dt * reliefFlow(p), dt * burstFlow(p, ambient));
    }

    private double totalFlow(double p, double ambient) {
        return ventFlow(p, ambient) + reliefFlow(p) + burstFlow(p, ambient);
    }

    private double ventFlow(double p, double ambient) {
        if (ventBlocked) {
            return 0;
        }
        VentSpec vent = spec.vent();
        return vent.conductance() * Math.max(0, p - ambient - vent.crackingPascal());
    }

    private double reliefFlow(double p) {
        return spec.relief().map(r -> r.conductance() * Math.max(0, p - r.setPascal())).orElse(0.0);
    }

    private double burstFlow(double p, double ambient) {
        return burstOpen ? spec.burstDisc().map(b -> b.conductance() * Math.max(0, p - ambient)).orElse(0.0) : 0;
    }

    /** Sends the step's outflows to their destinations and keeps the rest as vapour; the ledger closes exactly. */
    private void book(Flows flows, double gasKg) {
        double out = flows.vent + flows.relief + flows.burst;
        double scale = out > gasKg ? gasKg / out : 1;
        double vent = flows.vent * scale;
        double relief = flows.relief * scale;
        double burst = flows.burst * scale;
        if (spec.vent().destination() == Destination.RECOVERY) {
            send(Destination.ROOM, vent * leakFraction);
            send(Destination.RECOVERY, vent - vent * leakFraction);
        } else {
            send(Destination.ROOM, vent);
        }
        send(spec.relief().map(ReliefSpec::destination).orElse(Destination.ROOM), relief);
        send(spec.burstDisc().map(ReliefSpec::destination).orElse(Destination.ROOM), burst);
        vapourKg = gasKg - vent - relief - burst;
    }

    private void send(Destination destination, double kg) {
        if (kg <= 0) {
            return;
        }
        if (destination == Destination.ROOM) {
            room.release(fluid, kg);
            toRoomKg += kg;
        } else {
            toRecoveryKg += kg;
        }
    }

    private void updateTemperatures(double now, double dt) {
        double bath = bathKelvin();
        for (MagnetSpec magnet : spec.magnets()) {
            double temperature = magnetKelvin.get(magnet.id());
            Optional<Quench> active = quenches.stream()
                    .filter(q -> q.magnet.id().equals(magnet.id()) && q.start <= now)
                    .reduce((a, b) -> b);
            if (active.isPresent() && now <= active.get().start + active.get().seconds) {
                Quench q = active.get();
                temperature = bath + (magnet.peakKelvin() - bath) * (now - q.start) / q.seconds;
            } else if (liquidKg > 0) {
                temperature += (bath - temperature) * (1 - Math.exp(-dt / Math.max(1e-3, magnet.recoverySeconds())));
            }
            magnetKelvin.put(magnet.id(), temperature);
        }
        for (StageSpec stage : spec.stages()) {
            double target = vacuumLost ? room.spec().temperatureKelvin() : stage.kelvin();
            double temperature = stageKelvin.get(stage.id());
            temperature += (target - temperature) * (1 - Math.exp(-dt / Math.max(1e-3, stage.warmupSeconds())));
            stageKelvin.put(stage.id(), temperature);
        }
    }

    // ---- readings of the true state ----------------------------------------------------------------------

    private double ullage() {
        return spec.innerCubicMetres() - liquidKg / liquidDensity;
    }

    public double liquidCubicMetres() {
        return liquidKg / liquidDensity;
    }

    /** Liquid height above the lowest point of the bottom, through the vessel geometry. */
    public double liquidHeight() {
        double volume = Math.min(liquidCubicMetres(), spec.geometry().capacityCubicMetres());
        return spec.geometry().heightMetres(Math.max(0, volume));
    }

    public double pressurePascal() {
        return pressure;
    }

    public double bathKelvin() {
        return Saturation.kelvin(fluid, pressure);
    }

    public double vacuumMillibar(double now) {
        double ambientMillibar = room.spec().pressurePascal() / PASCAL_PER_MILLIBAR;
        return spec.vacuumMillibar() + (ambientMillibar - spec.vacuumMillibar()) * vacuumFilled(now);
    }

    public double magnetKelvin(String magnetId) {
        Double value = magnetKelvin.get(magnetId);
        if (value == null) {
            throw new IllegalArgumentException("no magnet " + magnetId + " in " + spec.id());
        }
        return value;
    }

    public double stageKelvin(String stageId) {
        Double value = stageKelvin.get(stageId);
        if (value == null) {
            throw new IllegalArgumentException("no stage " + stageId + " in " + spec.id());
        }
        return value;
    }

    public double massKg() {
        return liquidKg + vapourKg;
    }

    public double heatLoadWatts() {
        return heatLoadWatts;
    }

    public boolean reliefOpen() {
        return reliefOpen;
    }

    public int reliefLifts() {
        return reliefLifts;
    }

    public boolean burstDiscOpen() {
        return burstOpen;
    }

    public double initialKg() {
        return initialKg;
    }

    public double filledKg() {
        return filledKg;
    }

    public double toRecoveryKg() {
        return toRecoveryKg;
    }

    public double toRoomKg() {
        return toRoomKg;
    }

    VesselState snapshot(double now) {
        double volume = liquidCubicMetres();
        return new VesselState(spec.id(), fluid, volume * 1000, liquidHeight(),
                volume / spec.geometry().capacityCubicMetres(), pressure, bathKelvin(),
                Saturation.inRange(fluid, pressure), heatLoadWatts, ventBlocked, reliefOpen, reliefLifts, burstOpen,
                vacuumMillibar(now), vacuumLost, magnetKelvin, stageKelvin, massKg(), initialKg, filledKg,
                toRecoveryKg, toRoomKg);
    }

    private record Flows(double pressure, double vent, double relief, double burst) {
    }

    private record Quench(MagnetSpec magnet, double start, double joules, double seconds) {
    }
}
