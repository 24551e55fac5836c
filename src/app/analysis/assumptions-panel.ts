import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { AnalysisTests } from '../../../server/stats/types';
import { formatNumber, formatP } from './format';

interface Check {
  name: string;
  statistic: string;
  p: number;
  passed: boolean;
  meaning: string;
}

/**
 * Assumption checks with what each result means for this ANOVA. When equal spread or normality is in
 * doubt, the tests that do without that assumption (Welch, Kruskal–Wallis) are shown alongside.
 */
@Component({
  selector: 'sm-assumptions-panel',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatIconModule],
  template: `
    <ul class="checks">
      @for (c of checks(); track c.name) {
        <li [class.failed]="!c.passed" [attr.data-check]="c.name">
          <mat-icon aria-hidden="true">{{ c.passed ? 'check_circle' : 'warning' }}</mat-icon>
          <div>
            <b>{{ c.name }}</b> — {{ c.statistic }}, p = {{ p(c.p) }}:
            <span class="verdict">{{ c.passed ? 'no sign of a problem' : 'assumption in doubt' }}</span>
            <div class="meaning">{{ c.meaning }}</div>
          </div>
        </li>
      }
    </ul>
    @if (alternatives().length > 0) {
      <h3>Alongside, because an assumption is in doubt</h3>
      <ul class="checks">
        @for (a of alternatives(); track a.name) {
          <li [attr.data-check]="a.name">
            <mat-icon aria-hidden="true">balance</mat-icon>
            <div>
              <b>{{ a.name }}</b> — {{ a.statistic }}, p = {{ p(a.p) }}
              <div class="meaning">{{ a.meaning }}</div>
            </div>
          </li>
        }
      </ul>
    }
  `,
  styles: `
    .checks {
      list-style: none;
      margin: 0;
      padding: 0;
      display: grid;
      gap: 8px;
    }
    li {
      display: flex;
      gap: 10px;
      align-items: flex-start;
    }
    li mat-icon {
      color: var(--mat-sys-primary);
      flex: none;
    }
    li.failed mat-icon,
    li.failed .verdict {
      color: var(--mat-sys-error);
      font-weight: 500;
    }
    .meaning {
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
    h3 {
      font: var(--mat-sys-title-small);
      margin: 14px 0 8px;
    }
  `,
})
export class AssumptionsPanel {
  readonly tests = input.required<AnalysisTests>();
  readonly alpha = input.required<number>();
  protected readonly p = formatP;

  protected readonly checks = computed<Check[]>(() => {
    const t = this.tests();
    const a = this.alpha();
    const out: Check[] = [];
    if (t.levene) {
      const passed = t.levene.p >= a;
      out.push({ name: 'Levene (mean-centred)', statistic: `F(${t.levene.df1}, ${formatNumber(t.levene.df2)}) = ${formatNumber(t.levene.f)}`, p: t.levene.p, passed, meaning: passed ? 'The scatter looks alike across the cells, as the ANOVA assumes.' : 'The scatter differs between cells; the ANOVA F can mislead, most when cell sizes differ. Read Welch below.' });
    }
    if (t.brownForsythe) {
      const passed = t.brownForsythe.p >= a;
      out.push({ name: 'Brown–Forsythe (median-centred)', statistic: `F(${t.brownForsythe.df1}, ${formatNumber(t.brownForsythe.df2)}) = ${formatNumber(t.brownForsythe.f)}`, p: t.brownForsythe.p, passed, meaning: passed ? 'The robust version of the spread check agrees: no clear difference in scatter.' : 'Even the robust spread check finds unequal scatter between cells.' });
    }
    if (t.bartlett) {
      const passed = t.bartlett.p >= a;
      out.push({ name: 'Bartlett', statistic: `χ²(${t.bartlett.df}) = ${formatNumber(t.bartlett.statistic)}`, p: t.bartlett.p, passed, meaning: passed ? 'Equal variances are plausible (this test is sensitive to non-normal data).' : 'Variances look unequal; Bartlett also reacts to non-normal data, so compare with Levene.' });
    }
    if (t.shapiro) {
      const passed = t.shapiro.p >= a;
      out.push({ name: 'Shapiro–Wilk on residuals', statistic: `W = ${formatNumber(t.shapiro.w)}`, p: t.shapiro.p, passed, meaning: passed ? 'The residuals are compatible with a normal distribution.' : 'The residuals depart from normal: look at the Q-Q plot for outliers or skew; read Kruskal–Wallis below.' });
    }
    return out;
  });

  protected readonly alternatives = computed<Check[]>(() => {
    const t = this.tests();
    const failed = this.checks().filter((c) => !c.passed);
    if (failed.length === 0) return [];
    const out: Check[] = [];
    if (t.welch) out.push({ name: 'Welch ANOVA over the cells', statistic: `F(${t.welch.df1}, ${formatNumber(t.welch.df2)}) = ${formatNumber(t.welch.f)}`, p: t.welch.p, passed: true, meaning: 'Compares cell means without assuming equal scatter.' });
    if (t.kruskal) out.push({ name: 'Kruskal–Wallis over the cells', statistic: `H = ${formatNumber(t.kruskal.statistic)}, df = ${t.kruskal.df}`, p: t.kruskal.p, passed: true, meaning: 'Compares the cells by ranks, without assuming normal data.' });
    return out;
  });
}
