import { interactionChoices } from './model-terms';

describe('interactionChoices', () => {
  it('offers nothing for one factor and the single pair for two', () => {
    expect(interactionChoices(['W'])).toEqual([]);
    expect(interactionChoices(['W', 'R'])).toEqual(['W:R']);
  });

  it('offers every pair, then the three-factor term, in model order', () => {
    // 3 factors: C(3,2) = 3 pairs + 1 triple (common practice, no source)
    expect(interactionChoices(['W', 'R', 'T'])).toEqual(['W:R', 'W:T', 'R:T', 'W:R:T']);
    // 4 factors: 2^4 - 1 - 4 = 11 interaction terms (common practice, no source)
    expect(interactionChoices(['A', 'B', 'C', 'D'])).toHaveLength(11);
  });
});
