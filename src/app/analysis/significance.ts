import { formatP } from './format';

/** How a p-value is marked in tables: never by colour alone (an icon and words carry the same meaning). */
export interface SignificanceMark {
  significant: boolean;
  /** Material Symbols ligature shown before the p-value, '' when none */
  icon: string;
  /** short words read by everyone, screen readers included */
  label: string;
  /** full sentence for the tooltip / accessible description */
  description: string;
}

/**
 * Marks a term as significant when p < α (strictly: a p equal to α is not below the threshold).
 * A term without a p (the residual row, a non-estimable term) gets no mark and says why.
 *
 * @param p the term's p-value, null when there is none
 * @param alpha the significance level chosen for the analysis, 0 < α ≤ 0.2
 * @throws RangeError when alpha is outside (0, 0.2]
 */
export function markSignificance(p: number | null | undefined, alpha: number): SignificanceMark {
  if (!(alpha > 0 && alpha <= 0.2)) throw new RangeError(`alpha must be in (0, 0.2], got ${alpha}`);
  if (p === null || p === undefined || !Number.isFinite(p)) {
    return { significant: false, icon: '', label: '', description: 'No test for this row.' };
  }
  if (p < alpha) {
    return {
      significant: true,
      icon: 'star',
      label: 'Significant',
      description: `p = ${formatP(p)} is below α = ${alpha}: this term's effect is unlikely to be noise alone.`,
    };
  }
  return {
    significant: false,
    icon: '',
    label: 'Not significant',
    description: `p = ${formatP(p)} is not below α = ${alpha}: the data do not show this effect clearly.`,
  };
}
