import { HttpErrorResponse, httpResource } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
} from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import { MatSelect } from '@angular/material/select';
import { MatInput } from '@angular/material/input';
import { MatPaginator, type PageEvent } from '@angular/material/paginator';
import { Router, RouterLink } from '@angular/router';
import {
  schemeConflictSchema,
  schemeDetailSchema,
  schemeVersionListSchema,
  type CheckSeverity,
  type SchemeCheck,
  type SchemeConflict,
  type SchemeDetail,
} from '@trabeate/contracts';
import { CAUTION, type SchemeResult } from '@trabeate/structural';
import { errorMessage } from '../../core/auth/api-error';
import { DayTimePipe } from '../../shared/dates/app-dates';
import { DEFAULT_PAGE_SIZE, PAGE_SIZES, positiveInt } from '../../shared/table-state/address-table';
import { SEVERITY_LABELS, SOURCE_KIND_LABELS, numbersOf, ruleLabel } from './check-labels';
import { BoundaryPanel } from './boundary-panel';
import { StairsPanel, type FlightDraft } from './stairs-panel';
import { SecondaryBeamsPanel, type PlacingStep, type SecondaryEnds } from './secondary-beams-panel';
import { FootingOptions } from './footing-options';
import type { FootingChoice } from './footing-options-model';
import {
  addColumn,
  clearFootingChoice,
  editorKey,
  moveColumnTo,
  moveSelection,
  parseSpacings,
  select,
  setBasis,
  setFootingChoice,
  setGridSpacings,
  spacingsOf,
  startEditing,
  undo,
  redo,
  deleteChosen,
  updateColumn,
  deleteVertex,
  insertVertex,
  moveVertex,
  selectVertex,
  togglePropertyLine,
  addSecondaryBeam,
  deleteSecondaryBeam,
  selectSecondary,
  updateSecondaryBeam,
  hasChoice,
  addStair,
  deleteStair,
  updateStair,
  PLAN_COORD_M,
  SECTION_MM,
  typedCoordinate,
  typedNumber,
  type ColumnPatch,
  type DesignBasis,
  type EditorState,
  type PlanPart,
} from './editor-model';
import type { AnalyseRequest, PlanWorkerPort, SchemeChecks } from './plan-protocol';
import { createPlanWorker } from './plan-worker-factory';
import { PlanView, type ColumnDrop, type ColumnPick, type PlanTap, type VertexDrop } from './plan-view';
import { ResultsPanel } from './results-panel';
import { SchemesApi, schemeUrl } from './schemes-api';
import { SchemeOutputs } from './scheme-outputs';
import { SchemeBasisPanel } from './scheme-basis-panel';

type SeverityFilter = CheckSeverity | 'all';

/** keyboard step for moving the selection, m (Shift moves ten) */
/** Highest page of saves read from the address: beyond any real history, short of absurd offsets. */
const MAX_SAVES_PAGE = 10_000;

export const KEY_STEP_M = 0.05;

/**
 * A performance mark for bench:editor's drop → checks phases: posted to the engine's worker, its
 * answer arrived (where the page has the User Timing API; jsdom has not). Negligible cost.
 */
function phaseMark(name: string, seq: number): void {
  if (typeof performance.mark === 'function') performance.mark(name, { detail: seq });
}

/**
 * One scheme on its plan, with the engine's checks beside it, and the plan editor. The engine runs
 * in a Web Worker on every edit; the server runs it again on save and its stored results remain
 * the record.
 */
@Component({
  selector: 'tb-planning-page',
  imports: [
    BoundaryPanel,
    DayTimePipe,
    FootingOptions,
    MatButton,
    MatFormField,
    MatIcon,
    MatInput,
    MatLabel,
    MatOption,
    MatPaginator,
    MatProgressSpinner,
    MatSelect,
    PlanView,
    ResultsPanel,
    RouterLink,
    SchemeOutputs,
    SecondaryBeamsPanel,
    StairsPanel,
    SchemeBasisPanel,
  ],
  templateUrl: './planning-page.html',
  styleUrls: ['../../shared/page/page.scss', './planning-page.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlanningPage {
  /** Route-bound `:projectId` and `:schemeId`. */
  readonly projectId = input.required<string>();
  readonly schemeId = input.required<string>();
  /**
   * Route-bound `?saves=open&savesPage=&savesPerPage=`: the save history and the page of it shown,
   * kept in the address so a reload or a shared link opens the same page (strings as they arrive).
   */
  readonly saves = input<string>();
  readonly savesPage = input<string>();
  readonly savesPerPage = input<string>();

  protected readonly caution = CAUTION;
  /** the column inspector's typed fields, in order (orientation is a select of its own) */
  protected readonly inspectorFields = [
    { key: 'x', label: 'x (m)', mode: 'decimal', testId: 'col-x' },
    { key: 'y', label: 'y (m)', mode: 'decimal', testId: 'col-y' },
    { key: 'widthMm', label: 'Width (mm)', mode: 'numeric', testId: 'col-width' },
    { key: 'depthMm', label: 'Depth (mm)', mode: 'numeric', testId: 'col-depth' },
  ] as const;
  protected readonly keyStep = KEY_STEP_M;
  protected readonly severityLabels = SEVERITY_LABELS;
  protected readonly sourceKindLabels = SOURCE_KIND_LABELS;
  protected readonly ruleLabel = ruleLabel;
  protected readonly numbersOf = numbersOf;

  protected readonly scheme = httpResource(() => schemeUrl(this.projectId(), this.schemeId()), {
    parse: (body) => schemeDetailSchema.parse(body),
  });
  protected readonly detail = computed(() => (this.scheme.hasValue() ? this.scheme.value() : undefined));

  private readonly api = inject(SchemesApi);
  private readonly router = inject(Router);
  /** the editor's state: the document as edited, the selection and undo history */
  protected readonly editor = signal<EditorState | null>(null);
  protected readonly doc = computed(() => this.editor()?.doc ?? this.detail()?.document);
  /** the version this editing session started from (and saves on top of) */
  protected readonly baseVersion = signal(0);
  /** the document as last saved or loaded, to tell whether there is anything to save */
  private readonly savedDoc = signal<unknown>(null);
  protected readonly dirty = computed(() => !!this.editor() && this.editor()!.doc !== this.savedDoc());
  protected readonly canEdit = computed(() => !!this.detail()?.canEdit && !this.detail()?.archivedAt);
  protected readonly saving = signal(false);
  protected readonly saveError = signal<string | null>(null);
  protected readonly conflict = signal<SchemeConflict | null>(null);
  /** the earlier save shown in the editor, when one was opened from the history */
  protected readonly openedVersion = signal<number | null>(null);
  protected readonly historyOpen = computed(() => this.saves() === 'open');
  /** the report and plan sheet of the version this session started from */
  protected readonly outputsOpen = signal(false);
  protected readonly historyBusy = signal(false);
  /** the page of saves shown, newest first (the server pages them: a long-lived scheme has hundreds) */
  protected readonly historyPage = computed(() => {
    const size = Number(this.savesPerPage());
    // whatever the address holds, a page the paginator offers: junk reads as the first page
    return {
      page: positiveInt(this.savesPage(), 1, MAX_SAVES_PAGE),
      pageSize: PAGE_SIZES.includes(size) ? size : DEFAULT_PAGE_SIZE,
    };
  });
  protected readonly historySizes = PAGE_SIZES;
  protected readonly history = httpResource(
    () => {
      if (!this.historyOpen()) return undefined;
      const { page, pageSize } = this.historyPage();
      return `${schemeUrl(this.projectId(), this.schemeId())}/versions?page=${page}&pageSize=${pageSize}`;
    },
    { parse: (body) => schemeVersionListSchema.parse(body) },
  );

  protected readonly selectedColumn = computed(() => {
    const e = this.editor();
    if (!e || e.selection.length !== 1) return null;
    return e.doc.columns.find((c) => c.id === e.selection[0]) ?? null;
  });
  /** the chosen boundary vertex or secondary beam */
  protected readonly part = computed(() => this.editor()?.part ?? null);
  protected readonly chosenVertex = computed(() => {
    const p = this.part();
    return p?.kind === 'vertex' ? p.index : null;
  });
  protected readonly chosenSecondary = computed(() => {
    const p = this.part();
    return p?.kind === 'secondary' ? p.id : null;
  });
  /** placing a secondary beam by two presses on the plan: the step, and the first press */
  protected readonly placing = signal<PlacingStep>('off');
  private placeStart: PlanTap | null = null;
  protected readonly anythingChosen = computed(() => {
    const e = this.editor();
    return !!e && hasChoice(e);
  });
  /** what is chosen, in words, for the plan's live line */
  protected readonly chosenText = computed(() => {
    const e = this.editor();
    const p = e?.part;
    if (p?.kind === 'vertex') return `Chosen: boundary corner ${p.index + 1}`;
    if (p?.kind === 'secondary') return `Chosen: secondary beam ${p.id}`;
    return e?.selection.length ? `Chosen: ${e.selection.join(', ')}` : 'Nothing chosen.';
  });
  /** the column whose footing options are open (from the inspector), or null */
  protected readonly footingFocus = signal<{ columnId: string } | null>(null);
  /** columns with footing options: their own pad crosses a property line or meets another */
  protected readonly footingColumns = computed(() => {
    const f = this.result()?.footings;
    return new Set([...(f?.boundary ?? []).map((o) => o.columnId), ...(f?.combined ?? []).flatMap((o) => o.columnIds)]);
  });
  protected readonly spacingText = computed(() => {
    const d = this.doc();
    return d ? { x: spacingsOf(d, 'x').join(' '), y: spacingsOf(d, 'y').join(' ') } : { x: '', y: '' };
  });
  protected readonly spacingError = signal<{ x: string | null; y: string | null }>({ x: null, y: null });
  protected readonly fieldError = signal<string | null>(null);

  private readonly worker: PlanWorkerPort = createPlanWorker();
  private seq = 0;
  /** whether the worker is running a document now; while it is, only the newest edit waits */
  private busy = false;
  private waiting: AnalyseRequest | null = null;
  /** the edit (seq) whose checks are on screen; bench:editor reads it to time drop → checks */
  protected readonly checkedSeq = signal(0);
  protected readonly postedSeq = signal(0);
  /** the checks of the newest edit answered; the whole result follows them a moment later */
  protected readonly checked = signal<SchemeChecks | null>(null);
  protected readonly result = signal<SchemeResult | null>(null);
  protected readonly engineFault = signal<string | null>(null);
  protected readonly checking = signal(false);

  protected readonly severity = signal<SeverityFilter>('all');
  protected readonly rule = signal<string>('all');
  /** index into `failed` of the chosen check */
  protected readonly selected = signal<number | null>(null);

  /** failed checks as the engine lists them (errors first) */
  protected readonly failed = computed<SchemeCheck[]>(() =>
    (this.checked()?.checks ?? []).filter((c) => c.status === 'fail'),
  );
  protected readonly rules = computed(() => [...new Set(this.failed().map((c) => c.ruleId))].sort());
  protected readonly shown = computed(() =>
    this.failed()
      .map((check, index) => ({ check, index }))
      .filter(
        ({ check }) =>
          (this.severity() === 'all' || check.severity === this.severity()) &&
          (this.rule() === 'all' || check.ruleId === this.rule()),
      ),
  );
  /**
   * The list shows a page of checks at a time: a large scheme fails hundreds, and laying out every
   * one of them again on each edit held the screen for tens of milliseconds. The plan keeps a
   * marker for each.
   */
  protected readonly checkPage = signal({ index: 0, size: 25 });
  protected readonly checkPageSizes = [25, 50, 100];
  /** the page shown: the one asked for, or the last there is when the list has shrunk under it */
  protected readonly checkPageIndex = computed(() => {
    const { index, size } = this.checkPage();
    return Math.min(index, Math.max(0, Math.ceil(this.shown().length / size) - 1));
  });
  protected readonly pagedShown = computed(() => {
    const size = this.checkPage().size;
    const from = this.checkPageIndex() * size;
    return this.shown().slice(from, from + size);
  });
  protected readonly counts = computed(() => {
    const c = { error: 0, warning: 0, info: 0 };
    for (const x of this.failed()) c[x.severity]++;
    return c;
  });
  protected readonly chosen = computed(() => {
    const i = this.selected();
    return i === null ? null : (this.failed()[i] ?? null);
  });

  constructor() {
    // a page past the last (an old link, a hand-typed number) turns to the last page there is
    effect(() => {
      if (!this.history.hasValue()) return;
      const { total, pageSize } = this.history.value();
      const last = Math.max(1, Math.ceil(total / pageSize));
      if (this.historyPage().page > last) untracked(() => this.showSaves({ savesPage: last === 1 ? null : last }));
    });
    this.worker.onReply = (reply) => {
      // An analysis answers with its checks, then its whole result; both were posted in one task,
      // so once the checks (or a fault) arrive the worker is free for the next edit.
      if (reply.kind === 'checks' || reply.kind === 'failed') {
        phaseMark('tb-engine-replied', reply.seq);
        this.busy = false;
        this.sendWaiting();
      }
      if (reply.seq !== this.seq) return; // an answer to an older edit
      if (reply.kind === 'checks') {
        this.checking.set(false);
        this.checkedSeq.set(reply.seq);
        this.engineFault.set(null);
        this.checked.set(reply.checks);
      } else if (reply.kind === 'result') this.result.set(reply.result);
      else if (reply.kind === 'failed') {
        this.checking.set(false);
        this.checkedSeq.set(reply.seq);
        this.engineFault.set(reply.message);
      }
    };
    // a loaded (or reloaded, or restored) scheme starts a fresh editing session
    effect(() => {
      const d = this.detail();
      if (d) this.begin(d);
    });
    // the engine re-runs on every edit; answers to older edits are dropped by their seq
    effect(() => {
      const doc = this.doc();
      if (!doc) return;
      this.selected.set(null);
      this.checking.set(true);
      // Edits that come faster than the engine answers replace one another: only the newest
      // document waits for the worker, so a drop is never queued behind stale ones.
      this.waiting = { kind: 'analyse', seq: ++this.seq, document: doc };
      this.postedSeq.set(this.seq);
      this.sendWaiting();
    });
    inject(DestroyRef).onDestroy(() => this.worker.terminate());
  }

  private sendWaiting(): void {
    if (this.busy || !this.waiting) return;
    const request = this.waiting;
    this.waiting = null;
    this.busy = true;
    phaseMark('tb-engine-posted', request.seq);
    this.worker.post(request);
  }

  /** Writes the history's state to the address (null removes a key); the inputs read it back. */
  private showSaves(queryParams: Record<string, string | number | null>): void {
    void this.router.navigate([], { queryParams, queryParamsHandling: 'merge', replaceUrl: true });
  }

  /** closing drops the page too: reopened, the history starts from the newest saves */
  protected toggleHistory(): void {
    this.showSaves(this.historyOpen() ? { saves: null, savesPage: null } : { saves: 'open' });
  }

  /** Page 1 and the default size stay out of the address, so the plain link is the newest saves. */
  protected historyPaged(e: PageEvent): void {
    this.showSaves({
      savesPage: e.pageIndex === 0 ? null : e.pageIndex + 1,
      savesPerPage: e.pageSize === DEFAULT_PAGE_SIZE ? null : e.pageSize,
    });
  }

  /** after a save or a restore the newest saves are what matters: back to the first page */
  private showNewestSaves(): void {
    if (this.historyPage().page === 1) this.history.reload();
    else this.showSaves({ savesPage: null });
  }

  protected choose(index: number): void {
    this.selected.set(this.selected() === index ? null : index);
    // chosen from its marker on the plan: the list turns to the page that has it
    const at = this.shown().findIndex((s) => s.index === index);
    const size = this.checkPage().size;
    if (at >= 0 && Math.floor(at / size) !== this.checkPageIndex())
      this.checkPage.set({ index: Math.floor(at / size), size });
  }

  protected checksPaged(e: PageEvent): void {
    this.checkPage.set({ index: e.pageIndex, size: e.pageSize });
  }

  protected setSeverity(v: SeverityFilter): void {
    this.severity.set(v);
    this.selected.set(null);
    this.checkPage.update((p) => ({ ...p, index: 0 }));
  }

  protected setRule(v: string): void {
    this.rule.set(v);
    this.selected.set(null);
    this.checkPage.update((p) => ({ ...p, index: 0 }));
  }

  private begin(d: SchemeDetail): void {
    const state = startEditing(d.document);
    this.editor.set(state);
    this.savedDoc.set(state.doc);
    this.baseVersion.set(d.current.version);
    this.openedVersion.set(null);
    this.conflict.set(null);
    this.saveError.set(null);
  }

  private apply(next: EditorState | null): boolean {
    const e = this.editor();
    if (!next || !e || !this.canEdit()) return false;
    if (next !== e) this.editor.set(next);
    return true;
  }

  protected pick(p: ColumnPick): void {
    const e = this.editor();
    if (e) this.editor.set(select(e, p.id, p.extend));
  }

  /** a drag ended: the grabbed column moves to the drop point; a selection it belongs to moves with it */
  protected dropped(d: ColumnDrop): void {
    const e = this.editor();
    if (!e) return;
    const c = e.doc.columns.find((x) => x.id === d.id);
    if (!c) return;
    if (e.selection.includes(d.id) && e.selection.length > 1) this.apply(moveSelection(e, d.x - c.x, d.y - c.y));
    else this.apply(moveColumnTo(select(e, d.id), d.id, d));
  }

  protected pickPart(p: PlanPart): void {
    const e = this.editor();
    if (!e) return;
    if (p.kind === 'vertex') this.editor.set(selectVertex(e, p.index));
    else this.editor.set({ ...e, selection: [], part: p });
  }

  protected togglePlacing(): void {
    this.placeStart = null;
    this.placing.set(this.placing() === 'off' ? 'start' : 'off');
  }

  /** a press on the plan: while placing a secondary beam, its first and then its second end */
  protected tapped(t: PlanTap): void {
    const e = this.editor();
    if (!e || this.placing() === 'off') return;
    if (this.placing() === 'start' || !this.placeStart) {
      this.placeStart = t;
      this.placing.set('end');
      return;
    }
    const a = this.placeStart;
    this.placeStart = null;
    this.placing.set('off');
    this.apply(addSecondaryBeam(e, a, t, Math.max(a.toleranceM, t.toleranceM)));
  }

  protected addSecondary(b: SecondaryEnds): void {
    const e = this.editor();
    if (e) this.apply(addSecondaryBeam(e, b.start, b.end, 0));
  }

  protected updateSecondary(b: Required<SecondaryEnds>): void {
    const e = this.editor();
    if (e) this.apply(updateSecondaryBeam(e, b.id, b));
  }

  protected removeSecondary(id: string): void {
    const e = this.editor();
    if (e) this.apply(deleteSecondaryBeam(e, id));
  }

  protected chooseSecondary(id: string): void {
    const e = this.editor();
    if (e) this.editor.set(selectSecondary(e, id));
  }

  protected saveStair(f: FlightDraft): void {
    const e = this.editor();
    if (!e) return;
    const { id, ...flight } = f;
    this.apply(id ? updateStair(e, id, flight) : addStair(e, flight));
  }

  protected removeStair(id: string): void {
    const e = this.editor();
    if (e) this.apply(deleteStair(e, id));
  }

  protected vertexDropped(d: VertexDrop): void {
    const e = this.editor();
    if (e) this.apply(moveVertex(e, d.index, d));
  }

  protected insertVertex(segment: number): void {
    const e = this.editor();
    if (e) this.apply(insertVertex(e, segment));
  }

  protected deleteVertex(index: number): void {
    const e = this.editor();
    if (e) this.apply(deleteVertex(e, index));
  }

  protected toggleProperty(segment: number): void {
    const e = this.editor();
    if (e) this.apply(togglePropertyLine(e, segment));
  }

  /** set by Escape: the next Tab with nothing chosen leaves the plan rather than choosing again */
  private tabLeaves = false;

  protected planFocused(): void {
    this.tabLeaves = false;
  }

  protected key(ev: KeyboardEvent): void {
    const e = this.editor();
    if (!e || !this.canEdit()) return;
    // The plan never traps the keyboard: after Escape, Tab leaves it; Tab past the last element
    // (Shift+Tab before the first) lets go of everything and the focus moves on as usual. With
    // nothing chosen, Tab from something inside the plan (a zoom button, a check marker, a corner)
    // is the browser's too: only Tab on the editor itself starts choosing elements.
    if (ev.key === 'Tab' && !hasChoice(e) && (this.tabLeaves || ev.target !== ev.currentTarget)) return;
    if (ev.key === 'Escape' && this.placing() !== 'off') this.togglePlacing(); // and lets go as ever
    const next = editorKey(e, ev, KEY_STEP_M);
    if (!this.apply(next)) return;
    this.tabLeaves = ev.key === 'Escape';
    if (ev.key === 'Tab' && next && !hasChoice(next)) return;
    ev.preventDefault();
  }

  protected addAtCentre(): void {
    const e = this.editor();
    if (!e) return;
    const from = e.doc.columns.find((c) => c.id === e.selection[e.selection.length - 1]);
    const xs = e.doc.grid.filter((g) => g.x !== undefined).map((g) => g.x as number);
    const ys = e.doc.grid.filter((g) => g.y !== undefined).map((g) => g.y as number);
    const mid = (v: number[]) => (v.length ? (Math.min(...v) + Math.max(...v)) / 2 : 0);
    this.apply(addColumn(e, from ? { x: from.x + 1, y: from.y } : { x: mid(xs), y: mid(ys) }));
  }

  protected deleteChosen(): void {
    const e = this.editor();
    if (e) this.apply(deleteChosen(e));
  }

  protected undo(): void {
    const e = this.editor();
    if (e) this.apply(undo(e));
  }

  protected redo(): void {
    const e = this.editor();
    if (e) this.apply(redo(e));
  }

  /** a typed value for the chosen column; a value that is not a number is refused with a message */
  protected setField(id: string, field: keyof ColumnPatch, text: string): void {
    const e = this.editor();
    if (!e) return;
    const section = field === 'widthMm' || field === 'depthMm';
    const v = section ? typedNumber(text, SECTION_MM.min, SECTION_MM.max) : typedCoordinate(text);
    if (v === null) {
      this.fieldError.set(
        section
          ? `A section side is a number of millimetres from ${SECTION_MM.min} to ${SECTION_MM.max}.`
          : `A coordinate is a number of metres between −${PLAN_COORD_M} and ${PLAN_COORD_M}.`,
      );
      return;
    }
    this.fieldError.set(null);
    this.apply(updateColumn(e, id, { [field]: v }));
  }

  /** opens the footing options of a column (from the inspector) and brings them into view */
  protected showFootings(columnId: string): void {
    this.footingFocus.set({ columnId }); // a new object, so asking again reopens it
    queueMicrotask(() =>
      document.querySelector('[data-testid="footing-site-detail"]')?.scrollIntoView?.({ block: 'nearest' }),
    );
  }

  /** The basis panel's Apply: one undoable edit, after which the engine re-runs as on any edit. */
  protected applyBasis(basis: DesignBasis): void {
    const e = this.editor();
    if (e) this.apply(setBasis(e, basis));
  }

  protected recordFooting(choice: FootingChoice): void {
    const e = this.editor();
    if (e) this.apply(setFootingChoice(e, choice));
  }

  protected clearFooting(columnId: string): void {
    const e = this.editor();
    if (e) this.apply(clearFootingChoice(e, columnId));
  }

  protected setOrientation(id: string, deg: 0 | 90): void {
    const e = this.editor();
    if (e) this.apply(updateColumn(e, id, { orientationDeg: deg }));
  }

  /** checks the spacing list as it is typed; the grid changes when the list is applied */
  protected checkSpacings(axis: 'x' | 'y', text: string): void {
    const r = parseSpacings(text);
    this.spacingError.update((s) => ({ ...s, [axis]: 'error' in r ? r.error : null }));
  }

  protected applySpacings(axis: 'x' | 'y', text: string): void {
    const e = this.editor();
    const r = parseSpacings(text);
    if (!e) return;
    if ('error' in r) {
      this.spacingError.update((s) => ({ ...s, [axis]: r.error }));
      return;
    }
    this.apply(setGridSpacings(e, axis, r.spacings));
  }

  protected async save(): Promise<void> {
    const e = this.editor();
    if (!e || this.saving()) return;
    this.saving.set(true);
    this.saveError.set(null);
    try {
      const saved = await this.api.save(this.projectId(), this.schemeId(), this.baseVersion(), e.doc);
      this.baseVersion.set(saved.current.version);
      this.savedDoc.set(e.doc);
      this.openedVersion.set(null);
      this.conflict.set(null);
      if (this.historyOpen()) this.showNewestSaves();
    } catch (err) {
      const c =
        err instanceof HttpErrorResponse && err.status === 409 ? schemeConflictSchema.safeParse(err.error) : null;
      if (c?.success) this.conflict.set(c.data);
      else this.saveError.set(errorMessage(err, 'The scheme could not be saved.'));
    } finally {
      this.saving.set(false);
    }
  }

  /** the conflict's first way out: drop these edits and load the newer save */
  protected reload(): void {
    this.conflict.set(null);
    this.scheme.reload();
  }

  /** the conflict's second way out: keep both, these edits going into a new scheme */
  protected async saveAsCopy(): Promise<void> {
    const e = this.editor();
    if (!e || this.saving()) return;
    this.saving.set(true);
    try {
      const copy = await this.api.duplicate(this.projectId(), this.schemeId());
      await this.api.save(this.projectId(), copy.id, copy.current.version, e.doc);
      this.conflict.set(null);
      await this.router.navigate(['/projects', this.projectId(), 'schemes', copy.id]);
    } catch (err) {
      this.saveError.set(errorMessage(err, 'The copy could not be saved.'));
    } finally {
      this.saving.set(false);
    }
  }

  /** shows an earlier save in the editor; saving it makes it the newest version */
  protected async openVersion(version: number): Promise<void> {
    this.historyBusy.set(true);
    try {
      const v = await this.api.version(this.projectId(), this.schemeId(), version);
      const e = this.editor();
      if (!e) return;
      this.editor.set({ ...e, doc: v.document, selection: [], past: [...e.past, e.doc], future: [] });
      this.openedVersion.set(version);
    } catch (err) {
      this.saveError.set(errorMessage(err, 'That version could not be opened.'));
    } finally {
      this.historyBusy.set(false);
    }
  }

  protected async restoreVersion(version: number): Promise<void> {
    this.historyBusy.set(true);
    try {
      await this.api.restoreVersion(this.projectId(), this.schemeId(), version);
      this.scheme.reload();
      this.showNewestSaves();
    } catch (err) {
      this.saveError.set(errorMessage(err, 'That version could not be restored.'));
    } finally {
      this.historyBusy.set(false);
    }
  }

  protected loadError(err: unknown): string {
    return errorMessage(err, 'The scheme could not be loaded.');
  }
}
