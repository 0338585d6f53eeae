/**
 * US EPA (2013) "Aquatic Life Ambient Water Quality Criteria for Ammonia — Freshwater",
 * EPA 822-R-13-001 (docs/sources.md §2). The criteria protect wild populations; Fernwater shows
 * them as cautions, not as aquarium rules.
 */

export interface AmmoniaCriteria {
  /** Chronic criterion (30-day average), mg TAN-N/L. The highest 4-day average should stay below 2.5 times it. */
  chronicTanMgNPerL: number;
  /** Acute criterion (1-hour average) for waters where salmonids are absent, mg TAN-N/L. */
  acuteTanMgNPerL: number;
}

/**
 * Acute and chronic ammonia criteria (mg total ammonia nitrogen per litre) at a pH and
 * temperature (°C). Acute, salmonids absent:
 * 0.7249 · (0.0114/(1 + 10^(7.204 − pH)) + 1.6181/(1 + 10^(pH − 7.204))) · min(51.93, 23.12 · 10^(0.036(20 − T))).
 * Chronic: 0.8876 · (0.0278/(1 + 10^(7.688 − pH)) + 1.1994/(1 + 10^(pH − 7.688))) · 2.126 · 10^(0.028(20 − max(T, 7))).
 */
export function ammoniaCriteria(pH: number, temperatureC: number): AmmoniaCriteria {
  const acutePh = 0.0114 / (1 + Math.pow(10, 7.204 - pH)) + 1.6181 / (1 + Math.pow(10, pH - 7.204));
  const acuteT = Math.min(51.93, 23.12 * Math.pow(10, 0.036 * (20 - temperatureC)));
  const chronicPh = 0.0278 / (1 + Math.pow(10, 7.688 - pH)) + 1.1994 / (1 + Math.pow(10, pH - 7.688));
  const chronicT = 2.126 * Math.pow(10, 0.028 * (20 - Math.max(temperatureC, 7)));
  return { acuteTanMgNPerL: 0.7249 * acutePh * acuteT, chronicTanMgNPerL: 0.8876 * chronicPh * chronicT };
}
