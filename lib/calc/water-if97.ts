/**
 * Water properties from IAPWS-IF97: Region 1 (compressed liquid) and Region 4 (saturation).
 * Source: IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997,
 * equations 7 (Region 1 Gibbs energy, Table 2 coefficients) and 30–31 (saturation line, Table 34).
 * Units: T in K, p in MPa (absolute), results SI.
 */

const R = 0.461526; // kJ/(kg·K), specific gas constant of water (IF97 eq. 1)

// Region 1: I, J, n (IF97 Table 2).
const R1: ReadonlyArray<readonly [number, number, number]> = [
  [0, -2, 0.14632971213167],
  [0, -1, -0.84548187169114],
  [0, 0, -0.3756360367204e1],
  [0, 1, 0.33855169168385e1],
  [0, 2, -0.95791963387872],
  [0, 3, 0.15772038513228],
  [0, 4, -0.16616417199501e-1],
  [0, 5, 0.81214629983568e-3],
  [1, -9, 0.28319080123804e-3],
  [1, -7, -0.60706301565874e-3],
  [1, -1, -0.18990068218419e-1],
  [1, 0, -0.32529748770505e-1],
  [1, 1, -0.21841717175414e-1],
  [1, 3, -0.5283835796993e-4],
  [2, -3, -0.47184321073267e-3],
  [2, 0, -0.30001780793026e-3],
  [2, 1, 0.47661393906987e-4],
  [2, 3, -0.44141845330846e-5],
  [2, 17, -0.72694996297594e-15],
  [3, -4, -0.31679644845054e-4],
  [3, 0, -0.28270797985312e-5],
  [3, 6, -0.85205128120103e-9],
  [4, -5, -0.22425281908e-5],
  [4, -2, -0.65171222895601e-6],
  [4, 10, -0.14341729937924e-12],
  [5, -8, -0.40516996860117e-6],
  [8, -11, -0.12734301741641e-8],
  [8, -6, -0.17424871230634e-9],
  [21, -29, -0.68762131295531e-18],
  [23, -31, 0.14478307828521e-19],
  [29, -38, 0.26335781662795e-22],
  [30, -39, -0.11947622640071e-22],
  [31, -40, 0.18228094581404e-23],
  [32, -41, -0.93537087292458e-25],
];

/** Region 1 validity: 273.15 K ≤ T ≤ 623.15 K, p_sat(T) ≤ p ≤ 100 MPa. */
export const REGION1_T_MIN_K = 273.15;
export const REGION1_T_MAX_K = 623.15;

/** Specific volume, m³/kg, in Region 1 (IF97 Table 3: v = π γ_π R T / p). */
export function specificVolumeRegion1(tK: number, pMPa: number): number {
  const pi = pMPa / 16.53;
  const tau = 1386 / tK;
  let gammaPi = 0;
  for (const [i, j, n] of R1) {
    gammaPi += -n * i * (7.1 - pi) ** (i - 1) * (tau - 1.222) ** j;
  }
  // R in kJ/(kg·K) with p in MPa gives v in 1e-3 m³/kg.
  return (pi * gammaPi * R * tK) / pMPa / 1000;
}

/** Density of liquid water, kg/m³ (Region 1). */
export function waterDensity(tK: number, pMPa: number): number {
  return 1 / specificVolumeRegion1(tK, pMPa);
}

// Region 4 coefficients n1..n10 (IF97 Table 34).
const N4 = [
  0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2, 0.1202082470247e5,
  -0.32325550322333e7, 0.1491510861353e2, -0.48232657361591e4, 0.40511340542057e6,
  -0.23855557567849, 0.65017534844798e3,
] as const;

/** Saturation pressure, MPa, for 273.15 K ≤ T ≤ 647.096 K (IF97 eq. 30). */
export function saturationPressure(tK: number): number {
  const [n1, n2, n3, n4, n5, n6, n7, n8, n9, n10] = N4;
  const theta = tK + n9 / (tK - n10);
  const A = theta * theta + n1 * theta + n2;
  const B = n3 * theta * theta + n4 * theta + n5;
  const C = n6 * theta * theta + n7 * theta + n8;
  return ((2 * C) / (-B + Math.sqrt(B * B - 4 * A * C))) ** 4;
}

/** Saturation temperature, K, for 611.213 Pa ≤ p ≤ 22.064 MPa (IF97 eq. 31). */
export function saturationTemperature(pMPa: number): number {
  const [n1, n2, n3, n4, n5, n6, n7, n8, n9, n10] = N4;
  const beta = pMPa ** 0.25;
  const E = beta * beta + n3 * beta + n6;
  const F = n1 * beta * beta + n4 * beta + n7;
  const Gc = n2 * beta * beta + n5 * beta + n8;
  const D = (2 * Gc) / (-F - Math.sqrt(F * F - 4 * E * Gc));
  return (n10 + D - Math.sqrt((n10 + D) ** 2 - 4 * (n9 + n10 * D))) / 2;
}

/**
 * Dynamic viscosity of liquid water, Pa·s, by the Vogel equation fitted to handbook data:
 * μ = A·10^(B/(T − C)), A = 2.414e-5 Pa·s, B = 247.8 K, C = 140 K (common engineering fit,
 * within about 2.5 % from 0 to 370 °C). Checked against CRC Handbook values in the tests.
 */
export function waterViscosity(tK: number): number {
  return 2.414e-5 * 10 ** (247.8 / (tK - 140));
}

/** Specific isobaric heat capacity of liquid water in Region 1, J/(kg·K) (IF97 Table 3: cp = −τ² γ_ττ R). */
export function waterCp(tK: number, pMPa: number): number {
  const pi = pMPa / 16.53;
  const tau = 1386 / tK;
  let gammaTauTau = 0;
  for (const [i, j, n] of R1) {
    gammaTauTau += n * (7.1 - pi) ** i * j * (j - 1) * (tau - 1.222) ** (j - 2);
  }
  return -tau * tau * gammaTauTau * R * 1000;
}
