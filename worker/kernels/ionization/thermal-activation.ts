/**
 * The thermal threshold switch: above T_MRI ≈ 1000 K collisional ionization of potassium makes the whole
 * column MRI-active (Umebayashi 1983; Gammie 1996 takes ~1000 K; common practice). To keep α from jumping as a
 * cell crosses it, the active column is blended over T_MRI ± ΔT with a smoothstep weight w (0 below, 1 above,
 * continuous slope): Σ_a = Σ_a,ion + (Σ − Σ_a,ion) w(T). The alternative is Saha branch (c), which computes the
 * alkali ions themselves (electron-fraction.ts); the two are not combined.
 */

/** w(T): 0 at T ≤ T_MRI − ΔT, 1 at T ≥ T_MRI + ΔT, 3s² − 2s³ between (s = (T − T_MRI + ΔT)/(2ΔT)); a step at ΔT = 0. */
export function thermalWeight(temperature: number, tMri: number, halfWidth: number): number {
  if (temperature >= tMri + halfWidth) return 1;
  if (temperature < tMri - halfWidth || !(halfWidth > 0)) return 0;
  const s = (temperature - tMri + halfWidth) / (2 * halfWidth);
  return s * s * (3 - 2 * s);
}

/** Σ_a with the thermal blend; exactly Σ where w = 1 and exactly Σ_a,ion where w = 0. */
export function blendThermal(sigma: number, sigmaActiveIon: number, weight: number): number {
  if (weight >= 1) return sigma;
  if (weight <= 0) return sigmaActiveIon;
  return sigmaActiveIon + (sigma - sigmaActiveIon) * weight;
}
