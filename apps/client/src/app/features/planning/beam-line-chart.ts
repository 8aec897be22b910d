import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { BeamLineDiagram } from '@trabeate/structural';
import { StackOnPhone } from '../../shared/stacked-table/stack-on-phone';

export type ChartKind = 'moment' | 'shear';

/** A figure to one decimal with a true minus sign (kN, kN·m). */
export function fig(v: number): string {
  const s = (Math.abs(v) < 0.05 ? 0 : v).toFixed(1);
  return s.startsWith('-') ? `−${s.slice(1)}` : s;
}

const W = 640;
const H = 250;
const M = { left: 64, right: 44, top: 22, bottom: 66 };

let nextId = 0;

/**
 * One envelope diagram of a beam line, drawn by hand in SVG: the largest and smallest values at
 * every station (moment: sagging positive, up; shear: upward on the left-hand part positive),
 * the supports, the peaks of each span, and for shear the largest factored reaction at each
 * support. A table of the same values follows for those who do not read the drawing.
 */
@Component({
  imports: [StackOnPhone],
  selector: 'tb-beam-line-chart',
  template: `
    @let g = geometry();
    <figure class="chart" [attr.data-testid]="kind() + '-chart'">
      <svg
        [attr.viewBox]="'0 0 ' + w + ' ' + h"
        role="img"
        [attr.aria-labelledby]="uid + '-t ' + uid + '-d'"
        preserveAspectRatio="xMidYMid meet"
      >
        <title [attr.id]="uid + '-t'">{{ title() }}</title>
        <desc [attr.id]="uid + '-d'">{{ description() }}</desc>
        <path class="band" [attr.d]="g.band" />
        <line class="axis" [attr.x1]="m.left" [attr.x2]="w - m.right" [attr.y1]="g.zero" [attr.y2]="g.zero" />
        <line class="axis" [attr.x1]="m.left" [attr.x2]="m.left" [attr.y1]="m.top" [attr.y2]="h - m.bottom" />
        @for (t of g.yTicks; track $index) {
          <line class="tick" [attr.x1]="m.left - 4" [attr.x2]="m.left" [attr.y1]="t.y" [attr.y2]="t.y" />
          <text class="tick-label" [attr.x]="m.left - 6" [attr.y]="t.y + 4" text-anchor="end">{{ t.label }}</text>
        }
        <path class="upper" [attr.d]="g.upper" [attr.data-testid]="kind() + '-upper'" />
        <path class="lower" [attr.d]="g.lower" [attr.data-testid]="kind() + '-lower'" />
        @for (s of g.supports; track $index) {
          <path class="support" [attr.d]="s.mark" />
          <text class="support-label" [attr.x]="s.x" [attr.y]="h - m.bottom + 24" text-anchor="middle">
            {{ s.label }}
          </text>
          @if (s.reaction) {
            <text class="reaction" [attr.x]="s.x" [attr.y]="h - m.bottom + 37" text-anchor="middle">
              {{ s.reaction }}
            </text>
          }
        }
        @for (p of g.peaks; track $index) {
          <text class="peak" [attr.x]="p.x" [attr.y]="p.y" text-anchor="middle">{{ p.label }}</text>
        }
        <text class="axis-label" [attr.x]="(m.left + w - m.right) / 2" [attr.y]="h - 6" text-anchor="middle">
          Distance along line {{ diagram().label }} (m)
        </text>
        <text
          class="axis-label"
          [attr.transform]="'translate(14 ' + (m.top + h - m.bottom) / 2 + ') rotate(-90)'"
          text-anchor="middle"
        >
          {{ unitLabel() }}
        </text>
      </svg>
      <figcaption [attr.data-testid]="kind() + '-peaks'">{{ caption() }}</figcaption>
    </figure>
    <details class="values">
      <summary>{{ kind() === 'moment' ? 'Moment' : 'Shear' }} values as a table</summary>
      <table tbStackOnPhone class="tb-dense-table" [attr.data-testid]="kind() + '-values'">
        <thead>
          <tr>
            <th scope="col" class="tb-figure">Distance (m)</th>
            <th scope="col">Span</th>
            <th scope="col" class="tb-figure">Largest ({{ unit() }})</th>
            <th scope="col" class="tb-figure">Smallest ({{ unit() }})</th>
          </tr>
        </thead>
        <tbody>
          @for (r of rows(); track $index) {
            <tr>
              <td class="tb-figure">{{ r.s }}</td>
              <td>{{ r.member }}</td>
              <td class="tb-figure">{{ r.hi }}</td>
              <td class="tb-figure">{{ r.lo }}</td>
            </tr>
          }
        </tbody>
      </table>
    </details>
  `,
  styles: `
    :host {
      display: block;
    }
    .chart {
      margin: 0;
    }
    svg {
      width: 100%;
      max-width: 760px;
      height: auto;
      display: block;
      font-family: var(--tb-font-numbers, inherit);
    }
    .band {
      fill: color-mix(in srgb, var(--mat-sys-primary, #345) 14%, transparent);
      stroke: none;
    }
    .upper,
    .lower {
      fill: none;
      stroke: var(--mat-sys-primary, #345);
      stroke-width: 2;
    }
    .lower {
      stroke-dasharray: 6 3;
    }
    .axis,
    .tick {
      stroke: var(--mat-sys-on-surface, #222);
      stroke-width: 1;
    }
    .support {
      fill: var(--mat-sys-on-surface, #222);
    }
    text {
      font-size: 11px;
      fill: var(--mat-sys-on-surface, #222);
    }
    .axis-label {
      font-size: 12px;
      font-weight: 700;
    }
    .peak {
      font-weight: 700;
    }
    figcaption {
      font-size: 0.875rem;
      margin: 0.25rem 0 0.5rem;
    }
    .values {
      margin-bottom: 1rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BeamLineChart {
  readonly diagram = input.required<BeamLineDiagram>();
  readonly kind = input.required<ChartKind>();

  protected readonly w = W;
  protected readonly h = H;
  protected readonly m = M;
  protected readonly uid = `tb-blc-${nextId++}`;

  protected readonly unit = computed(() => (this.kind() === 'moment' ? 'kN·m' : 'kN'));
  protected readonly unitLabel = computed(() =>
    this.kind() === 'moment' ? 'Moment (kN·m), sagging +' : 'Shear (kN), upward on the left +',
  );
  private readonly levelWord = computed(() => (this.diagram().level === 'roof' ? 'roof' : 'typical floor'));
  protected readonly title = computed(
    () =>
      `${this.kind() === 'moment' ? 'Bending moment' : 'Shear force'} envelope, line ${this.diagram().label}, ${this.levelWord()}`,
  );

  private values(st: BeamLineDiagram['stations'][number]): [number, number] {
    return this.kind() === 'moment' ? [st.maxMomentKNm, st.minMomentKNm] : [st.maxShearKN, st.minShearKN];
  }

  /** the largest sagging and hogging over the line, from the envelope's exact figures */
  readonly peaks = computed(() => {
    const d = this.diagram();
    let sag = d.members[0];
    let hog = d.members[0];
    let shear = d.members[0];
    for (const mb of d.members) {
      if (mb.maxMomentKNm > sag.maxMomentKNm) sag = mb;
      if (mb.minMomentKNm < hog.minMomentKNm) hog = mb;
      if (mb.maxShearKN > shear.maxShearKN) shear = mb;
    }
    return { sag, hog, shear };
  });

  protected readonly caption = computed(() => {
    const { sag, hog, shear } = this.peaks();
    if (this.kind() === 'moment')
      return `Largest sagging ${fig(sag.maxMomentKNm)} kN·m in ${sag.id} at ${sag.maxMomentAtM.toFixed(2)} m; largest hogging ${fig(hog.minMomentKNm)} kN·m in ${hog.id} at ${hog.minMomentAtM.toFixed(2)} m.`;
    return `Largest shear ${fig(shear.maxShearKN)} kN in ${shear.id}; largest factored reaction ${fig(Math.max(...this.diagram().supports.map((s) => s.maxReactionKN)))} kN.`;
  });

  protected readonly description = computed(() => {
    const d = this.diagram();
    const spans = d.members.map((mb) => `${mb.id} ${mb.lengthM.toFixed(2)} m`).join(', ');
    return `${this.caption()} Spans: ${spans}. Solid line: largest value over the load arrangements; dashed line: smallest.`;
  });

  protected readonly rows = computed(() => {
    const d = this.diagram();
    return d.stations.map((st) => {
      const [hi, lo] = this.values(st);
      return { s: st.s.toFixed(2), member: d.members[st.member]?.id ?? '', hi: fig(hi), lo: fig(lo) };
    });
  });

  protected readonly geometry = computed(() => {
    const d = this.diagram();
    const total = d.members.reduce((a, mb) => Math.max(a, mb.startS + mb.lengthM), 0) || 1;
    let vMax = 0;
    let vMin = 0;
    for (const st of d.stations) {
      const [hi, lo] = this.values(st);
      vMax = Math.max(vMax, hi);
      vMin = Math.min(vMin, lo);
    }
    if (vMax - vMin < 1e-9) vMax = vMin + 1;
    const x = (s: number) => M.left + (s / total) * (W - M.left - M.right);
    const y = (v: number) => M.top + ((vMax - v) / (vMax - vMin)) * (H - M.top - M.bottom);
    const pt = (s: number, v: number) => `${x(s).toFixed(1)} ${y(v).toFixed(1)}`;
    const upper = d.stations.map((st, i) => `${i ? 'L' : 'M'}${pt(st.s, this.values(st)[0])}`).join(' ');
    const lower = d.stations.map((st, i) => `${i ? 'L' : 'M'}${pt(st.s, this.values(st)[1])}`).join(' ');
    const back = [...d.stations]
      .reverse()
      .map((st) => `L${pt(st.s, this.values(st)[1])}`)
      .join(' ');
    const band = d.stations.length ? `${upper} ${back} Z` : '';
    const zero = y(0);
    const base = H - M.bottom;
    const supports = d.supports
      .filter((s) => s.columnId !== null)
      .map((s) => ({
        x: x(s.s),
        mark: `M${x(s.s).toFixed(1)} ${base.toFixed(1)} l-6 10 h12 z`,
        label: s.columnId as string,
        reaction: this.kind() === 'shear' ? `R ${fig(s.maxReactionKN)} kN` : '',
      }));
    const peaks: { x: number; y: number; label: string }[] = [];
    if (this.kind() === 'moment')
      for (const mb of d.members) {
        if (mb.maxMomentKNm > 0.05)
          peaks.push({
            x: x(mb.startS + mb.maxMomentAtM),
            y: Math.max(M.top + 10, y(mb.maxMomentKNm) - 5),
            label: fig(mb.maxMomentKNm),
          });
        if (mb.minMomentKNm < -0.05)
          peaks.push({
            x: x(mb.startS + mb.minMomentAtM),
            y: Math.min(base - 2, y(mb.minMomentKNm) + 13),
            label: fig(mb.minMomentKNm),
          });
      }
    const yTicks = [vMax, 0, vMin].filter((v, i, a) => a.indexOf(v) === i).map((v) => ({ y: y(v), label: fig(v) }));
    return { upper, lower, band, zero, supports, peaks, yTicks };
  });
}
