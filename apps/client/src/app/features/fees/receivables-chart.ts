import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { AGE_BAND_LABELS, AGE_BANDS, type Receivables } from '@trabeate/contracts';
import { formatMinor } from './money';

const BAR_H = 22;
const GAP = 14;
const LABEL_W = 150;
const WIDTH = 560;

/**
 * What is owed by age, one bar per age band for a currency, drawn as plain SVG (no chart library:
 * a handful of bars does not need one). Each bar carries its amount as text; the longer the wait,
 * the denser the hatching, so the bands differ without colour.
 */
@Component({
  selector: 'tb-receivables-chart',
  template: `
    @for (c of charts(); track c.currency) {
      <figure>
        <figcaption>Owed in {{ c.currency }} by days past due ({{ c.total }} in all)</figcaption>
        <svg
          [attr.viewBox]="'0 0 ' + width + ' ' + c.height"
          role="img"
          [attr.aria-label]="c.summary"
          preserveAspectRatio="xMinYMin meet"
        >
          <defs>
            @for (b of c.bars; track b.key) {
              <pattern
                [attr.id]="'hatch-' + b.key"
                patternUnits="userSpaceOnUse"
                [attr.width]="b.spacing"
                [attr.height]="b.spacing"
              >
                <rect [attr.width]="b.spacing" [attr.height]="b.spacing" class="fill" />
                <path [attr.d]="'M0,' + b.spacing + ' l' + b.spacing + ',-' + b.spacing" class="hatch" />
              </pattern>
            }
          </defs>
          @for (b of c.bars; track b.key; let i = $index) {
            <g [attr.transform]="'translate(0,' + i * step + ')'">
              <text x="0" [attr.y]="barH * 0.7" class="label">{{ b.label }}</text>
              <rect
                [attr.x]="labelW"
                y="0"
                [attr.width]="b.w"
                [attr.height]="barH"
                [attr.fill]="'url(#hatch-' + b.key + ')'"
                class="bar"
              />
              <text [attr.x]="labelW + b.w + 6" [attr.y]="barH * 0.7" class="amount">{{ b.amount }}</text>
            </g>
          }
        </svg>
      </figure>
    }
  `,
  styles: `
    figure {
      margin: 0 0 1rem;
      max-width: 40rem;
    }
    figcaption {
      font: var(--mat-sys-label-large);
      margin-bottom: 0.5rem;
    }
    svg {
      width: 100%;
      height: auto;
    }
    .label,
    .amount {
      font: 12px sans-serif;
      fill: var(--mat-sys-on-surface);
    }
    .fill {
      fill: var(--mat-sys-surface-container-high);
    }
    .hatch {
      stroke: var(--mat-sys-on-surface-variant);
      stroke-width: 1.5;
    }
    .bar {
      stroke: var(--mat-sys-on-surface);
      stroke-width: 1;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReceivablesChart {
  readonly receivables = input.required<Receivables>();
  protected readonly width = WIDTH;
  protected readonly labelW = LABEL_W;
  protected readonly barH = BAR_H;
  protected readonly step = BAR_H + GAP;

  protected readonly charts = computed(() => {
    const byCurrency = new Map<string, Record<string, number>>();
    for (const r of this.receivables().rows) {
      const sums = byCurrency.get(r.currency) ?? Object.fromEntries(AGE_BANDS.map((b) => [b, 0]));
      for (const b of AGE_BANDS) sums[b] += r.bands[b];
      byCurrency.set(r.currency, sums);
    }
    return [...byCurrency.entries()].map(([currency, sums]) => {
      const max = Math.max(...AGE_BANDS.map((b) => sums[b]), 1);
      const room = WIDTH - LABEL_W - 110;
      const bars = AGE_BANDS.map((b, i) => ({
        key: `${currency}-${b}`,
        label: AGE_BAND_LABELS[b],
        w: Math.max((sums[b] / max) * room, sums[b] > 0 ? 2 : 0),
        amount: formatMinor(sums[b], currency),
        spacing: 12 - i * 2,
      }));
      const total = formatMinor(
        AGE_BANDS.reduce((a, b) => a + sums[b], 0),
        currency,
      );
      return {
        currency,
        total,
        bars,
        height: AGE_BANDS.length * (BAR_H + GAP),
        summary: `Owed in ${currency}: ${bars.map((b) => `${b.label} ${b.amount}`).join('; ')}`,
      };
    });
  });
}
