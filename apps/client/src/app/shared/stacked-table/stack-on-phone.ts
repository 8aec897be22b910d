import { DestroyRef, Directive, ElementRef, afterNextRender, inject } from '@angular/core';

/**
 * A table that turns into stacked rows on a phone (the `tb-stack-on-phone` rules in styles.scss):
 * each body cell shows its column's name before its value. A cell names its column with
 * `data-label`; where a template gives none, this fills it in from the header cell above it
 * (colspans counted), and again for rows added later, so a table needs no label written twice.
 * A header's own text is used; a header with no text (an actions column) leaves its cells unlabelled.
 */
@Directive({
  selector: 'table[tbStackOnPhone]',
  host: { class: 'tb-stack-on-phone' },
})
export class StackOnPhone {
  private readonly table = inject<ElementRef<HTMLTableElement>>(ElementRef).nativeElement;

  constructor() {
    const destroyRef = inject(DestroyRef);
    afterNextRender(() => {
      this.label();
      const watch = new MutationObserver(() => this.label());
      watch.observe(this.table, { childList: true, subtree: true, characterData: true });
      destroyRef.onDestroy(() => watch.disconnect());
    });
  }

  /** Header names by column position (a header spanning two columns names both). */
  private headers(): string[] {
    const row = this.table.tHead?.rows[this.table.tHead.rows.length - 1];
    const names: string[] = [];
    for (const th of Array.from(row?.cells ?? [])) {
      const name = (th.getAttribute('data-label') ?? th.textContent ?? '').replace(/\s+/g, ' ').trim();
      for (let i = 0; i < Math.max(1, th.colSpan); i++) names.push(name);
    }
    return names;
  }

  private label(): void {
    const names = this.headers();
    for (const body of Array.from(this.table.tBodies)) {
      for (const row of Array.from(body.rows)) {
        let column = 0;
        for (const cell of Array.from(row.cells)) {
          const name = names[column];
          // A cell's own label wins; only missing or filled-in ones follow the header.
          if (name && (!cell.hasAttribute('data-label') || cell.hasAttribute('data-label-auto'))) {
            if (cell.getAttribute('data-label') !== name) cell.setAttribute('data-label', name);
            cell.setAttribute('data-label-auto', '');
          }
          column += Math.max(1, cell.colSpan);
        }
      }
    }
  }
}
