// Weather units for a run's conditions. 1 inHg = 3.386389 kPa (mercury at 0 °C, the
// conventional value: NIST SP 811, 2008 edition, Appendix B.8).
export const KPA_PER_INHG = 3.386389;

export const fToC = (f: number) => ((f - 32) * 5) / 9;
export const cToF = (c: number) => (c * 9) / 5 + 32;
export const inHgToKPa = (inHg: number) => inHg * KPA_PER_INHG;
export const kPaToInHg = (kpa: number) => kpa / KPA_PER_INHG;
