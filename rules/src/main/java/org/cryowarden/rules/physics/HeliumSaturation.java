package org.cryowarden.rules.physics;

/**
 * A point on a helium saturated vapour curve: the bath temperature that belongs to a measured vapour pressure.
 *
 * @param temperatureKelvin T90 in kelvin
 * @param pressurePascal    the absolute vapour pressure in pascal it was computed from
 * @param phase             He I or He II (for helium-3, always {@link HeliumPhase#HE_I}: normal liquid)
 */
public record HeliumSaturation(double temperatureKelvin, double pressurePascal, HeliumPhase phase) {
}
