import { ChangeDetectionStrategy, Component, DestroyRef, computed, effect, inject, input, signal } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import type { SchemeDocument } from '@trabeate/contracts';
import {
  CAUTION,
  stairChecks,
  type BeamLineDiagram,
  type LevelKind,
  type Scheme,
  type SchemeResult,
} from '@trabeate/structural';
import { StateMarker } from '../../shared/state-marker/state-marker';
import { BeamLineChart } from './beam-line-chart';
import { SEVERITY_LABELS, SOURCE_KIND_LABELS, numbersOf, ruleLabel } from './check-labels';
import type { PlanWorkerPort } from './plan-protocol';
import { createPlanWorker } from './plan-worker-factory';
import { ResultsTable, type ScheduleColumn, type ScheduleRow } from './results-table';

export type ResultsView = 'lines' | 'columns' | 'beams' | 'footings' | 'stairs';

const VIEWS: { id: ResultsView; label: string }[] = [
  { id: 'lines', label: 'Beam lines' },
  { id: 'columns', label: 'Column schedule' },
  { id: 'beams', label: 'Beam schedule' },
  { id: 'footings', label: 'Footing schedule' },
  { id: 'stairs', label: 'Stairs' },
];

interface LineOption {
  key: string;
  lineId: string;
  level: LevelKind;
  label: string;
}

const LEVEL_WORDS: Record<LevelKind, string> = { floor: 'Typical floor', roof: 'Roof' };

const WITHIN = {
  ok: { shape: 'done' as const, tone: 'neutral' as const, text: 'Within' },
  over: { shape: 'stop' as const, tone: 'alert' as const, text: 'Over' },
};
const CHECK_STATES = {
  pass: { shape: 'done' as const, tone: 'neutral' as const, text: 'Meets it' },
  fail: { shape: 'stop' as const, tone: 'alert' as const, text: 'Fails' },
};

/**
 * The engine's results for the live document: beam-line moment and shear envelopes with the
 * governing preliminary depth, column, beam and footing schedules, and the stair flights against
 * the code family's limits. The diagrams come from the engine's worker (a scheme's loads are
 * rebuilt for them, which takes longer than a frame); the schedules read the result the page
 * already has.
 */
@Component({
  selector: 'tb-results-panel',
  imports: [BeamLineChart, MatIcon, MatProgressSpinner, ResultsTable, StateMarker],
  templateUrl: './results-panel.html',
  styleUrl: './results-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ResultsPanel {
  /** the document as edited, and the engine's result for it (null while the first run is under way) */
  readonly document = input<SchemeDocument | undefined>(undefined);
  readonly result = input<SchemeResult | null>(null);

  protected readonly caution = CAUTION;
  protected readonly views = VIEWS;
  protected readonly severityLabels = SEVERITY_LABELS;
  protected readonly ruleLabel = ruleLabel;
  protected readonly numbersOf = numbersOf;
  /**
   * the view shown; none until the engineer picks one, so that the diagrams (a second engine run
   * per edit) are only computed once someone looks at them
   */
  protected readonly view = signal<ResultsView | null>(null);

  // ---- beam lines ----

  private readonly chosenLine = signal<string | null>(null);
  protected readonly lineOptions = computed((): LineOption[] =>
    (this.result()?.beamLines ?? []).map((b) => ({
      key: `${b.level}|${b.lineId}`,
      lineId: b.lineId,
      level: b.level,
      label: `${LEVEL_WORDS[b.level]} · line ${b.label}`,
    })),
  );
  /** the chosen line, or the first when none is chosen or the chosen one has gone */
  protected readonly line = computed((): LineOption | null => {
    const opts = this.lineOptions();
    return opts.find((o) => o.key === this.chosenLine()) ?? opts[0] ?? null;
  });
  protected readonly diagram = signal<BeamLineDiagram | null>(null);
  protected readonly diagramFault = signal<string | null>(null);
  protected readonly drawing = signal(false);

  /** preliminary depth of each span of the chosen line, and the one that governs the line */
  protected readonly depthRows = computed(() => {
    const l = this.line();
    return (this.result()?.sizes.beams ?? []).filter((b) => b.lineId === l?.lineId);
  });
  protected readonly governing = computed(() => {
    const rows = this.depthRows();
    if (!rows.length) return null;
    const g = rows.reduce((a, b) => (b.adoptedDepthMm > a.adoptedDepthMm ? b : a));
    const byMoment = g.governs === 'moment';
    return {
      depthMm: g.adoptedDepthMm,
      memberId: g.memberId,
      rule: byMoment ? 'the design moment' : 'the span/depth ratio',
      source: byMoment ? g.momentSource : g.spanDepthSource,
      kind: SOURCE_KIND_LABELS[byMoment ? g.momentKind : g.spanDepthKind],
      providedMm: g.providedDepthMm,
    };
  });
  protected readonly depthColumns: ScheduleColumn[] = [
    { key: 'member', label: 'Span' },
    { key: 'span', label: 'Length (m)', numeric: true, digits: 2 },
    { key: 'condition', label: 'Support' },
    { key: 'moment', label: 'Design moment (kN·m)', numeric: true, digits: 1 },
    { key: 'fromSpan', label: 'By span/depth (mm)', numeric: true },
    { key: 'fromMoment', label: 'By moment (mm)', numeric: true },
    { key: 'governs', label: 'Governs' },
    { key: 'adopted', label: 'Preliminary depth (mm)', numeric: true },
    { key: 'provided', label: 'Given depth (mm)', numeric: true },
  ];
  protected readonly depthTable = computed<ScheduleRow[]>(() =>
    this.depthRows().map((b) => ({
      member: b.memberId,
      span: b.spanM,
      condition: b.condition,
      moment: b.designMomentKNm,
      fromSpan: Math.round(b.fromSpanDepthMm),
      fromMoment: Math.round(b.fromMomentMm),
      governs: b.governs === 'moment' ? 'moment' : 'span/depth',
      adopted: b.adoptedDepthMm,
      provided: b.providedDepthMm,
    })),
  );
  /** failed checks on the chosen line's spans */
  protected readonly lineChecks = computed(() => {
    const ids = new Set(this.depthRows().map((b) => b.memberId));
    const l = this.line();
    return (this.result()?.checks ?? []).filter(
      (c) => c.elements.some((e) => ids.has(e)) || (l !== null && c.elements.includes(l.lineId)),
    );
  });

  // ---- column schedule ----

  protected readonly storeys = computed(() => {
    const n = this.result()?.loads.columns[0]?.deadKN.length ?? 0;
    return Array.from({ length: n }, (_, i) => i + 1);
  });
  protected readonly storey = signal(1);
  protected readonly steelNote = computed(() => {
    const s = this.result()?.limits?.columnSteelRatio;
    return s ? `${(s.value * 100).toFixed(1)} % steel assumed (${s.source}, ${SOURCE_KIND_LABELS[s.kind]})` : '';
  });
  protected readonly columnColumns: ScheduleColumn[] = [
    { key: 'column', label: 'Column' },
    { key: 'dead', label: 'Dead (kN)', numeric: true },
    { key: 'live', label: 'Imposed (kN)', numeric: true },
    { key: 'factored', label: 'Factored (kN)', numeric: true },
    { key: 'tributary', label: 'Service by area (kN)', numeric: true },
    { key: 'difference', label: 'Area check (%)', numeric: true, digits: 1 },
    { key: 'provided', label: 'Section (mm)' },
    { key: 'capacity', label: 'Capacity (kN)', numeric: true },
    { key: 'required', label: 'Square needed (mm)', numeric: true },
    { key: 'use', label: 'Load / capacity (%)', numeric: true },
    { key: 'steel', label: 'Steel needed (%)', numeric: true, digits: 2 },
    { key: 'state', label: 'State', states: WITHIN },
  ];
  protected readonly columnRows = computed<ScheduleRow[]>(() => {
    const r = this.result();
    if (!r) return [];
    const k = Math.min(this.storey(), this.storeys().length) - 1;
    if (k < 0) return [];
    const sizes = new Map(r.sizes.columns.map((c) => [c.columnId, c]));
    return r.loads.columns.map((c) => {
      const s = sizes.get(c.columnId);
      const service = c.deadKN[k] + c.liveKN[k];
      const u = s?.utilisation[k] ?? 0;
      return {
        column: c.columnId,
        dead: c.deadKN[k],
        live: c.liveKN[k],
        factored: c.factoredKN[k],
        tributary: c.tributaryKN[k],
        difference: service > 0 ? ((c.tributaryKN[k] - service) / service) * 100 : null,
        provided: s ? `${s.providedMm[0]} × ${s.providedMm[1]}` : null,
        capacity: s?.providedCapacityKN ?? null,
        required: s?.requiredSideMm[k] ?? null,
        use: u * 100,
        steel: s?.steelRatio[k] === undefined ? null : s.steelRatio[k] * 100,
        state: u <= 1 ? 'ok' : 'over',
      };
    });
  });

  // ---- beam and footing schedules ----

  protected readonly beamColumns: ScheduleColumn[] = [
    { key: 'member', label: 'Span' },
    { key: 'line', label: 'Line' },
    ...this.depthColumns.slice(1),
  ];
  protected readonly beamRows = computed<ScheduleRow[]>(() => {
    const label = new Map((this.result()?.beamLines ?? []).map((b) => [b.lineId, b.label]));
    return (this.result()?.sizes.beams ?? []).map((b) => ({
      member: b.memberId,
      line: label.get(b.lineId) ?? b.lineId,
      span: b.spanM,
      condition: b.condition,
      moment: b.designMomentKNm,
      fromSpan: Math.round(b.fromSpanDepthMm),
      fromMoment: Math.round(b.fromMomentMm),
      governs: b.governs === 'moment' ? 'moment' : 'span/depth',
      adopted: b.adoptedDepthMm,
      provided: b.providedDepthMm,
    }));
  });
  protected readonly footingColumns: ScheduleColumn[] = [
    { key: 'column', label: 'Column' },
    { key: 'service', label: 'Service load (kN)', numeric: true },
    { key: 'factored', label: 'Factored load (kN)', numeric: true },
    { key: 'area', label: 'Area needed (m²)', numeric: true, digits: 2 },
    { key: 'side', label: 'Square side (m)', numeric: true, digits: 2 },
    { key: 'thickness', label: 'Thickness (m)', numeric: true, digits: 2 },
    { key: 'pressure', label: 'Factored pressure (kPa)', numeric: true },
  ];
  protected readonly footingRows = computed<ScheduleRow[]>(() =>
    (this.result()?.sizes.footings ?? []).map((f) => ({
      column: f.columnId,
      service: f.serviceKN,
      factored: f.factoredKN,
      area: f.areaM2,
      side: f.adoptedSideM,
      thickness: f.thicknessM,
      pressure: f.factoredPressureKPa,
    })),
  );

  // ---- stairs ----

  protected readonly flights = computed(() => {
    const doc = this.document();
    const limits = this.result()?.limits;
    if (!doc || !limits) return [];
    const checks = stairChecks(doc as Scheme, limits);
    return doc.stairs.map((f) => ({
      flight: f,
      riseM: (f.risers * f.riserMm) / 1000,
      goingM: ((f.risers - 1) * f.treadMm) / 1000,
      rows: checks
        .filter((c) => c.elements.includes(f.id))
        .map<ScheduleRow>((c) => ({
          measure: ruleLabel(c.ruleId),
          value: c.value,
          limit: `${c.sense === 'max' ? 'at most' : 'at least'} ${c.limit} ${c.unit}`,
          source: `${c.source} (${SOURCE_KIND_LABELS[c.sourceKind]})`,
          state: c.status,
        })),
    }));
  });
  protected readonly stairColumns: ScheduleColumn[] = [
    { key: 'measure', label: 'Measure' },
    { key: 'value', label: 'Value (mm or count)', numeric: true },
    { key: 'limit', label: 'Limit' },
    { key: 'source', label: 'Source' },
    { key: 'state', label: 'State', states: CHECK_STATES },
  ];

  private readonly worker: PlanWorkerPort = createPlanWorker();
  private seq = 0;

  constructor() {
    this.worker.onReply = (reply) => {
      if (reply.seq !== this.seq) return; // an answer for an earlier edit or line
      this.drawing.set(false);
      if (reply.kind === 'diagram') {
        this.diagramFault.set(null);
        this.diagram.set(reply.diagram);
      } else if (reply.kind === 'failed') {
        this.diagram.set(null);
        this.diagramFault.set(reply.message);
      }
    };
    // the chosen line's diagrams follow every edit while the beam lines are shown
    effect(() => {
      const doc = this.document();
      const l = this.line();
      const ok = this.result()?.ok;
      if (this.view() !== 'lines' || !doc || !l || !ok) return;
      this.drawing.set(true);
      this.worker.post({ kind: 'diagram', seq: ++this.seq, document: doc, lineId: l.lineId, level: l.level });
    });
    inject(DestroyRef).onDestroy(() => this.worker.terminate());
  }

  protected chooseLine(key: string): void {
    this.chosenLine.set(key);
  }

  protected chooseStorey(v: string): void {
    this.storey.set(Number(v));
  }
}
