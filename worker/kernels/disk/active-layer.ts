/**
 * Providers of the MRI-active column Σ_a (g cm^-2, both faces together) that layered transport uses
 * (Gammie 1996): α_eff Σ = α_active Σ_a′ + α_dead (Σ − Σ_a′), Σ_a′ = min(Σ_a, Σ).
 * Each provider is registered by a descriptor so `--list` and the worker discover them.
 */

export interface ActiveLayerInput {
  /** Surface density, g cm^-2. */
  readonly sigma: number;
  /** Midplane temperature, K. */
  readonly temperature: number;
  /** Radius, cm. */
  readonly radius: number;
  /** Keplerian angular frequency at the cell, s^-1 (with T it sets the scale height and the density). */
  readonly omega: number;
  /** Time since t = 0 (collapse onset, or the given disk), s: what decays (²⁶Al) needs it. */
  readonly time: number;
  /** Index of the cell on the grid, so a provider can keep per-cell state from one pass to the next. */
  readonly index: number;
  /**
   * Midplane temperature the column would have with dead-zone transport only (α_dead, plus gravitational
   * instability), K, for providers that ask for it (`quiescentFrom`); where the midplane is cooler than
   * `quiescentFrom` it is the midplane temperature itself (the quiescent one is lower still).
   */
  readonly quiescentTemperature?: number;
  /**
   * True when the call only probes dΣ_a/dΣ at Σ(1 + ε) for the flux linearisation: a provider with a cache
   * answers from it (a layer's depth does not follow a 10⁻⁴ change of Σ), so the probe never re-runs a kernel.
   */
  readonly derivativeProbe?: boolean;
}

/**
 * Σ_a of one cell, g cm^-2. A provider that keeps state between calls (a cache) exposes `reset`, which the
 * integrator calls when a run starts, so that a run stays a pure function of its parameters.
 */
export type ActiveColumn = ((cell: ActiveLayerInput) => number) & {
  readonly reset?: () => void;
  /**
   * Set when the provider reads `quiescentTemperature` (a thermal switch on the dead column's temperature): the
   * midplane temperature, K, from which on it needs the quiescent one (below, the switch is off either way).
   */
  readonly quiescentFrom?: number;
};

export interface ActiveLayerProvider<Options> {
  readonly name: string;
  readonly description: string;
  create(options: Options): ActiveColumn;
}

/** The whole column is MRI-active everywhere. */
export const uniformActiveLayer: ActiveLayerProvider<Record<string, never>> = {
  name: 'uniform',
  description: 'whole column active (no dead zone)',
  create: () => (cell) => cell.sigma,
};

/** A layer of fixed column on each face is active, e.g. what cosmic rays ionize (Gammie 1996: ~100 g cm^-2). */
export const fixedColumnActiveLayer: ActiveLayerProvider<{ sigmaActiveFace: number }> = {
  name: 'fixed_column',
  description: 'a fixed column per face is active (Gammie 1996 layered disk)',
  create: ({ sigmaActiveFace }) => {
    const both = 2 * sigmaActiveFace;
    return () => both;
  },
};

/**
 * α_eff from the layered rule, without dividing by an empty cell: where Σ ≤ Σ_a the whole column is active.
 */
export function layeredAlpha(sigma: number, sigmaActive: number, alphaActive: number, alphaDead: number): number {
  if (sigma <= sigmaActive) return alphaActive;
  return alphaDead + ((alphaActive - alphaDead) * sigmaActive) / sigma;
}
