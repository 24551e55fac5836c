/**
 * Words for a comment anchor ("anova:W:R" -> "ANOVA row W:R"), so a thread says what it is about
 * without the reader decoding the anchor syntax.
 */
export function anchorLabel(anchor: string): string {
  if (anchor === 'analysis') return 'Whole analysis';
  const [panel, ...rest] = anchor.split(':');
  const item = rest.join(':');
  if (panel === 'anova') return `ANOVA row ${item}`;
  if (panel === 'tukey') return `Comparison ${item}`;
  if (panel === 'descriptives') return `Descriptives ${item}`;
  if (panel === 'chart') {
    const [kind, ...what] = rest;
    const names: Record<string, string> = {
      'main-effects': 'Main-effects chart',
      interaction: 'Interaction chart',
      box: 'Spread-per-level chart',
      residuals: 'Residuals chart',
      qq: 'Q-Q chart',
      dispersion: 'Scatter-per-setting chart',
    };
    const name = names[kind] ?? `Chart ${kind}`;
    return what.length > 0 ? `${name} ${what.join(' × ')}` : name;
  }
  return `${panel} ${item}`.trim();
}
