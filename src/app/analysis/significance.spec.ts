import { markSignificance } from './significance';
import { WARPBREAKS_ANOVA } from './warpbreaks-fixture';

// p-values: R 4.2.2 summary(aov(breaks ~ wool * tension)), shared/reference/r-datasets/warpbreaks.json twoWay.table
const [wool, tension, interaction] = WARPBREAKS_ANOVA;

describe('markSignificance', () => {
  it('marks tension and the interaction at α = 0.05, not wool (p = 0.0582)', () => {
    expect(markSignificance(tension.p, 0.05).significant).toBe(true);
    expect(markSignificance(interaction.p, 0.05).significant).toBe(true);
    expect(markSignificance(wool.p, 0.05).significant).toBe(false);
  });

  it('follows the chosen α: wool becomes significant at 0.1, the interaction (p = 0.021) is not at 0.01', () => {
    expect(markSignificance(wool.p, 0.1).significant).toBe(true);
    expect(markSignificance(interaction.p, 0.01).significant).toBe(false);
  });

  it('marks with an icon and words, not only a colour', () => {
    const mark = markSignificance(tension.p, 0.05);
    expect(mark.icon).not.toBe('');
    expect(mark.label).toBe('Significant');
    expect(mark.description).toContain('0.000693');
    expect(markSignificance(wool.p, 0.05).label).toBe('Not significant');
  });

  it('treats p equal to α as not below it', () => {
    // common practice, no source: the test rejects when p < α
    expect(markSignificance(0.05, 0.05).significant).toBe(false);
  });

  it('gives no mark to a row without a test', () => {
    expect(markSignificance(null, 0.05)).toMatchObject({ significant: false, icon: '', label: '' });
  });

  it('names a bad α', () => {
    expect(() => markSignificance(0.01, 0.5)).toThrow(/got 0.5/);
    expect(() => markSignificance(0.01, 0)).toThrow(/got 0/);
  });
});
