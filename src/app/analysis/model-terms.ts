/**
 * The interactions a user may add for the chosen factors: every pair, and with three or more factors
 * the higher-order combinations too, in model order (A:B before A:C before B:C before A:B:C).
 */
export function interactionChoices(factors: readonly string[]): string[] {
  const out: string[] = [];
  const n = factors.length;
  for (let size = 2; size <= n; size++) {
    const pick = (start: number, chosen: string[]): void => {
      if (chosen.length === size) {
        out.push(chosen.join(':'));
        return;
      }
      for (let i = start; i < n; i++) pick(i + 1, [...chosen, factors[i]]);
    };
    pick(0, []);
  }
  return out;
}
