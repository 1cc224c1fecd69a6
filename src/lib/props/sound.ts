// Kept apart from the sensor schema, so the sensor form does not ship the validation library.

/** Speed of sound in dry air from its temperature, m/s: 331.3 * sqrt(1 + T/273.15). */
export function speedOfSound(airTempC: number): number {
	return 331.3 * Math.sqrt(1 + airTempC / 273.15);
}
