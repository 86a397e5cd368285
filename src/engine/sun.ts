// Sun position and irradiance on a panel (forecast-engine.md, model steps 1–6).
import { getPosition } from 'suncalc';

const RAD = Math.PI / 180;

/** Solar constant used by the engine, W/m² (Kopp & Lean 2011, GRL 38 L01706: 1360.8 ± 0.5). */
export const SOLAR_CONSTANT = 1361;
/** Ground reflectance for the isotropic model's ground term (forecast-engine.md step 6). */
export const ALBEDO = 0.2;

/** Sun position in compass degrees: altitude (refracted) and azimuth (north = 0, east = 90). */
export interface SunPosition {
  altitudeDeg: number;
  azimuthDeg: number;
}

/**
 * Apparent sun position at an instant from suncalc 2.x, which already returns degrees, azimuth
 * clockwise from north and altitude with standard refraction (Meeus 16.4 at 1010 mbar / 10 °C).
 */
export function sunPosition(ms: number, lat: number, lon: number): SunPosition {
  const p = getPosition(new Date(ms), lat, lon);
  return { altitudeDeg: p.altitude, azimuthDeg: p.azimuth };
}

/**
 * Extraterrestrial normal irradiance, W/m²: Gsc·(1 + 0.033·cos(360°·n/365)) with Gsc = 1361
 * (Duffie & Beckman, Solar Engineering of Thermal Processes, eq. 1.4.1b; n = day of year).
 */
export function extraterrestrial(dayOfYear: number): number {
  return SOLAR_CONSTANT * (1 + 0.033 * Math.cos((2 * Math.PI * dayOfYear) / 365));
}

/**
 * Clear-sky global horizontal irradiance, W/m² (Haurwitz 1945, as in Reno, Hansen & Stein,
 * SAND2012-2389): 1098·cos z·exp(−0.059/cos z) for cos z > 0, else 0.
 */
export function haurwitz(cosZ: number): number {
  if (!(cosZ > 0)) return 0;
  return 1098 * cosZ * Math.exp(-0.059 / cosZ);
}

/** Cloud factor G/Gclear = 1 − 0.75·(N/8)^3.4, N in oktas (Kasten & Czeplak 1980, Solar Energy 24:177). */
export function kastenCzeplak(oktas: number): number {
  const c = Math.min(8, Math.max(0, oktas)) / 8;
  return 1 - 0.75 * Math.pow(c, 3.4);
}

/** Diffuse fraction DHI/GHI from the clearness index (Erbs, Klein & Duffie 1982, Solar Energy 28:293, eq. 1). */
export function erbsDiffuseFraction(kt: number): number {
  if (kt <= 0.22) return 1 - 0.09 * kt;
  // 0.9511 − 0.1604·kt + 4.388·kt² − 16.638·kt³ + 12.336·kt⁴, in Horner form.
  if (kt <= 0.8) return 0.9511 + kt * (-0.1604 + kt * (4.388 + kt * (-16.638 + kt * 12.336)));
  return 0.165;
}

/** Horizontal irradiance split into its parts, W/m². */
export interface Irradiance {
  ghi: number;
  dhi: number;
  dni: number;
  kt: number;
}

/**
 * Splits GHI into beam and diffuse with Erbs: kt = GHI/(E0·max(cos z, 0.065)) clipped to [0, 1]
 * (the clip as in pvlib's erbs), DHI = kd·GHI, DNI = (GHI − DHI)/cos z.
 */
export function splitErbs(ghi: number, cosZ: number, e0: number): Irradiance {
  if (!(cosZ > 0) || !(ghi > 0)) return { ghi: 0, dhi: 0, dni: 0, kt: 0 };
  const kt = Math.min(1, Math.max(0, ghi / (e0 * Math.max(cosZ, 0.065))));
  const dhi = erbsDiffuseFraction(kt) * ghi;
  return { ghi, dhi, dni: (ghi - dhi) / cosZ, kt };
}

/**
 * Cosine of the angle of incidence on a tilted plane (Duffie & Beckman §1.6, azimuths from north):
 * cos θ = cos z·cos β + sin z·sin β·cos(γsun − γpanel).
 */
export function cosIncidence(zenithDeg: number, sunAzimuthDeg: number, tiltDeg: number, panelAzimuthDeg: number): number {
  const z = zenithDeg * RAD;
  const b = tiltDeg * RAD;
  return cosIncidenceTrig(Math.cos(z), Math.sin(z), Math.cos(b), Math.sin(b), Math.cos((sunAzimuthDeg - panelAzimuthDeg) * RAD));
}

/** The same cos θ from precomputed cosines and sines (the hot loop reuses them across arrays and hours). */
export function cosIncidenceTrig(cosZ: number, sinZ: number, cosTilt: number, sinTilt: number, cosAzimuthDiff: number): number {
  return cosZ * cosTilt + sinZ * sinTilt * cosAzimuthDiff;
}

/**
 * Plane-of-array irradiance with the isotropic sky (Liu & Jordan 1963; Duffie & Beckman §2.15):
 * DNI·max(0, cos θ) + DHI·(1 + cos β)/2 + GHI·ρ·(1 − cos β)/2.
 */
export function poaIsotropic(dni: number, dhi: number, ghi: number, cosTheta: number, tiltDeg: number, albedo = ALBEDO): number {
  return poaIsotropicCos(dni, dhi, ghi, cosTheta, Math.cos(tiltDeg * RAD), albedo);
}

/** The same sum with cos β precomputed. */
export function poaIsotropicCos(dni: number, dhi: number, ghi: number, cosTheta: number, cosTilt: number, albedo = ALBEDO): number {
  return dni * (cosTheta > 0 ? cosTheta : 0) + (dhi * (1 + cosTilt)) / 2 + (ghi * albedo * (1 - cosTilt)) / 2;
}
