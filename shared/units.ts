/**
 * Conversions between the user-facing units (suffix in every name: `_au`, `_msun`, `_myr`, ...) and the cgs
 * values the kernels use. Kernels never call these: conversion happens once, at the edge.
 */
import { AU_CGS, DAY_CGS, L_SUN_CGS, MYR_CGS, M_SUN_CGS, R_SUN_CGS, YEAR_CGS } from './constants.js';

export const auToCm = (au: number): number => au * AU_CGS;
export const cmToAu = (cm: number): number => cm / AU_CGS;
export const msunToG = (msun: number): number => msun * M_SUN_CGS;
export const gToMsun = (g: number): number => g / M_SUN_CGS;
export const myrToS = (myr: number): number => myr * MYR_CGS;
export const sToMyr = (s: number): number => s / MYR_CGS;
export const yrToS = (yr: number): number => yr * YEAR_CGS;
export const lsunToErgS = (lsun: number): number => lsun * L_SUN_CGS;
export const rsunToCm = (rsun: number): number => rsun * R_SUN_CGS;
export const daysToS = (days: number): number => days * DAY_CGS;
/** Mass flow in g s^-1 to M_sun yr^-1. */
export const gsToMsunYr = (gs: number): number => (gs * YEAR_CGS) / M_SUN_CGS;
/** Mass flow in M_sun yr^-1 to g s^-1. */
export const msunYrToGs = (msunYr: number): number => (msunYr * M_SUN_CGS) / YEAR_CGS;
