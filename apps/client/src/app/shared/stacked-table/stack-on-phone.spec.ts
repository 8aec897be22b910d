import { Component, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { StackOnPhone } from './stack-on-phone';

@Component({
  imports: [StackOnPhone],
  template: `
    <table tbStackOnPhone>
      <thead>
        <tr>
          <th>Client</th>
          <th colspan="2">Owed <span>today</span></th>
          <th></th>
        </tr>
      </thead>
      <tbody>
        @for (r of rows(); track r) {
          <tr>
            <td>{{ r }}</td>
            <td>1</td>
            <td data-label="Overdue">2</td>
            <td><button type="button">Open</button></td>
          </tr>
        }
      </tbody>
    </table>
  `,
})
class Host {
  readonly rows = signal(['Larchmere Housing']);
}

const flush = () => new Promise((r) => setTimeout(r));

describe('StackOnPhone', () => {
  it('marks the table for stacking and names each cell after its column, keeping a label the template gives', async () => {
    const fixture = TestBed.createComponent(Host);
    fixture.detectChanges();
    await fixture.whenStable();
    const table = fixture.nativeElement.querySelector('table') as HTMLTableElement;
    expect(table.classList).toContain('tb-stack-on-phone');
    const labels = (row: number) =>
      Array.from(table.tBodies[0].rows[row].cells).map((c) => c.getAttribute('data-label'));
    // The colspan header names both columns under it; the empty actions header names nothing.
    expect(labels(0)).toEqual(['Client', 'Owed today', 'Overdue', null]);

    // Rows added later are labelled too.
    fixture.componentInstance.rows.set(['Larchmere Housing', 'Quillon Estates']);
    fixture.detectChanges();
    await flush();
    expect(labels(1)).toEqual(['Client', 'Owed today', 'Overdue', null]);
  });
});
