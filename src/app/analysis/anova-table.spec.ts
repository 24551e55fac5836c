import { TestBed } from '@angular/core/testing';
import { AnovaTable } from './anova-table';
import { WARPBREAKS_ANOVA } from './warpbreaks-fixture';

async function render(alpha: number) {
  const fixture = TestBed.createComponent(AnovaTable);
  fixture.componentRef.setInput('rows', WARPBREAKS_ANOVA);
  fixture.componentRef.setInput('alpha', alpha);
  fixture.componentRef.setInput('names', { wool: 'Wool', tension: 'Tension' });
  fixture.componentRef.setInput('commentable', true);
  await fixture.whenStable();
  return fixture.nativeElement as HTMLElement;
}

describe('AnovaTable', () => {
  it('marks significant rows with an icon, the word and bold type, besides the tint', async () => {
    // R 4.2.2 warpbreaks two-way p: wool 0.0582, tension 0.000693, wool:tension 0.0210 (warpbreaks.json twoWay.table)
    const el = await render(0.05);
    const row = (source: string) => el.querySelector(`tr[data-source="${source}"]`) as HTMLElement;
    for (const source of ['tension', 'wool:tension']) {
      expect(row(source).classList).toContain('significant');
      expect(row(source).querySelector('mat-icon')?.textContent?.trim()).toBe('star');
      expect(row(source).querySelector('[data-testid=significance]')?.textContent?.trim()).toBe('Significant');
    }
    expect(row('wool').classList).not.toContain('significant');
    expect(row('wool').querySelector('[data-testid=significance]')?.textContent?.trim()).toBe('Not significant');
    expect(row('wool:tension').querySelector('th')?.textContent).toContain('Wool × Tension');
  });

  it('shows the R numbers for each row and leaves F and p empty on the residual row', async () => {
    const el = await render(0.05);
    const cells = Array.from((el.querySelector('tr[data-source="tension"]') as HTMLElement).querySelectorAll('td')).map((td) => td.textContent?.trim());
    // df 2, SS 2034, MS 1017, F 8.498, p 0.000693 (R 4.2.2, warpbreaks.json twoWay.table, 4 significant digits)
    expect(cells.slice(0, 4)).toEqual(['2', '2034', '1017', '8.498']);
    expect(cells[4]).toMatch(/^star\s*0\.000693\s*Significant$/);
    const residual = Array.from((el.querySelector('tr[data-source="Residual"]') as HTMLElement).querySelectorAll('td')).map((td) => td.textContent?.trim());
    expect(residual.slice(3, 5)).toEqual(['', '']);
    expect(residual.join('')).not.toContain('ignificant');
  });

  it('offers a comment button on every effect row but not on the residual row', async () => {
    const el = await render(0.05);
    expect(el.querySelectorAll('tr[data-source] td.comment button')).toHaveLength(3);
  });

  it('moves the marks with α', async () => {
    const el = await render(0.1);
    expect(el.querySelectorAll('tr.significant')).toHaveLength(3);
  });
});
