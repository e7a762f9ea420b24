/**
 * Version of the physics: part of every point id, so results of different physics never mix. Bump it with
 * any change that alters a model's outputs.
 */
export const MODEL_VERSION = '0.7.0';
