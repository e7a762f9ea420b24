/**
 * Far-ultraviolet photons from the star, or from neighbouring massive stars, ionize carbon and sulphur in a
 * thin surface layer of each face (Perez-Becker & Chiang 2011: columns of order 0.01–0.1 g cm^-2 with
 * x_e ~ 1e-5–1e-4; from memory). The layer is a step: within `layerColumn` of a face the electron fraction is
 * at least `xe`; below it the FUV photons are gone. Per face: each face has its own layer.
 */

/** Electron fraction floor the FUV layer sets at face column `faceColumn` (g cm^-2); 0 below the layer. */
export function fuvElectronFraction(layerColumn: number, xe: number, faceColumn: number): number {
  return faceColumn <= layerColumn ? xe : 0;
}
