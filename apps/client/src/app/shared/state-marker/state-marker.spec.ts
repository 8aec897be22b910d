import { Component, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { REVISION_STATE_LABELS } from '../../features/drawings/drawing-labels';
import { INVOICE_STATE_LABELS } from '../../features/fees/invoice-state';
import { STATE_MARKERS } from '../../features/projects/project-labels';
import { StateMarker, type MarkerShape, type MarkerTone } from './state-marker';

const SHAPES: MarkerShape[] = ['open', 'half', 'wait', 'back', 'done', 'late', 'stop'];

@Component({
  imports: [StateMarker],
  template: `<tb-state-marker [shape]="shape()" [tone]="tone()">Waiting for review</tb-state-marker>`,
})
class Host {
  readonly shape = signal<MarkerShape>('open');
  readonly tone = signal<MarkerTone>('neutral');
}

describe('StateMarker: a state reads by shape and words, colour only on top', () => {
  const render = (shape: MarkerShape, tone: MarkerTone = 'neutral') => {
    const fixture = TestBed.createComponent(Host);
    fixture.componentInstance.shape.set(shape);
    fixture.componentInstance.tone.set(tone);
    fixture.detectChanges();
    return fixture.nativeElement.querySelector('tb-state-marker') as HTMLElement;
  };
  /** The figure as drawn, without Angular's comment nodes: what a black-and-white print shows. */
  const figure = (el: HTMLElement) =>
    Array.from(el.querySelector('svg')!.children)
      .map((c) => c.outerHTML)
      .join('');

  it('draws seven different figures, each in the current text colour', () => {
    const figures = SHAPES.map((s) => figure(render(s)));
    expect(new Set(figures).size).toBe(SHAPES.length);
    for (const f of figures) {
      expect(f).toContain('currentColor');
      // The one other ink is the tick drawn on the filled square, set by a theme variable.
      expect(f.replaceAll('var(--tb-marker-on, #fff)', '')).not.toMatch(/#[0-9a-f]{3,6}|rgb\(/i);
    }
  });

  it('says its state in words; the figure is hidden from screen readers', () => {
    const el = render('wait', 'accent');
    expect(el.textContent?.trim()).toBe('Waiting for review');
    expect(el.querySelector('svg')?.getAttribute('aria-hidden')).toBe('true');
    expect(el.getAttribute('data-shape')).toBe('wait');
  });

  it('changes only the colour with the tone: the figure stays the same', () => {
    expect(figure(render('back', 'alert'))).toBe(figure(render('back', 'neutral')));
  });

  it('gives every stage state its own shape, so the stage bays read even without words', () => {
    const shapes = Object.values(STATE_MARKERS).map((m) => m.shape);
    expect(new Set(shapes).size).toBe(shapes.length);
  });

  it('never tells two revision or invoice states apart by colour alone', () => {
    for (const labels of [
      Object.values(REVISION_STATE_LABELS).map((l) => ({ words: l.label, shape: l.shape })),
      Object.values(INVOICE_STATE_LABELS).map((l) => ({ words: l.text, shape: l.shape })),
    ]) {
      const apart = new Set(labels.map((l) => `${l.shape}/${l.words}`));
      expect(apart.size).toBe(labels.length);
      expect(new Set(labels.map((l) => l.words)).size).toBe(labels.length);
    }
  });
});
