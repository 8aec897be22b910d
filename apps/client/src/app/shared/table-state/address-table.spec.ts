import { TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { AddressTable, addressTable, oneOf, positiveInt, readTableQuery, tableParams } from './address-table';

describe('address table state', () => {
  it('reads a hand-edited address into a state the server accepts', () => {
    const q = readTableQuery(
      { page: '0', pageSize: '5000', sort: 'password', direction: 'sideways', q: `  ${'x'.repeat(150)} ` },
      ['number', 'title'] as const,
      { sort: 'number', direction: 'asc' },
    );
    expect(q).toEqual({ page: 1, pageSize: 100, sort: 'number', direction: 'asc', q: 'x'.repeat(100) });
    expect(readTableQuery({ page: '3', direction: 'asc' }, ['a'] as const, { sort: 'a', direction: 'desc' })).toEqual({
      page: 3,
      pageSize: 25,
      sort: 'a',
      direction: 'asc',
      q: '',
    });
    expect(positiveInt('2.5', 7)).toBe(7);
    expect(oneOf('archived', ['active', 'archived'] as const, 'active')).toBe('archived');
    expect(oneOf('deleted', ['active', 'archived'] as const, '')).toBe('');
  });

  it('sends paging and sort always, and leaves empty filters out of the request', () => {
    const params = tableParams(
      { page: 2, pageSize: 50, sort: 'total', direction: 'desc', q: '' },
      { state: '', clientId: 'c1', projectId: null },
    );
    expect(params.toString()).toBe('page=2&pageSize=50&sort=total&direction=desc&clientId=c1');
  });

  describe('writing back to the address', () => {
    let table: AddressTable;
    let navigate: jest.SpyInstance;
    beforeEach(() => {
      TestBed.configureTestingModule({ providers: [provideRouter([])] });
      navigate = jest.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
      table = TestBed.runInInjectionContext(() => addressTable());
    });
    const last = () => navigate.mock.calls.at(-1)?.[1]?.queryParams;

    it('keeps page 1 and the default page size out of the address', () => {
      table.paged({ pageIndex: 0, pageSize: 25, length: 90 });
      expect(last()).toEqual({ page: null, pageSize: null });
      table.paged({ pageIndex: 2, pageSize: 50, length: 90 });
      expect(last()).toEqual({ page: 3, pageSize: 50 });
    });

    it('turns the "no sort" click into the default sort and starts from page 1', () => {
      table.sorted({ active: 'title', direction: '' });
      expect(last()).toEqual({ sort: null, direction: null, page: null });
      table.sorted({ active: 'title', direction: 'desc' });
      expect(last()).toEqual({ sort: 'title', direction: 'desc', page: null });
    });

    it('waits for a pause in typing, and clearing drops a pending search', () => {
      jest.useFakeTimers();
      try {
        table.searchTyped(' beam ');
        expect(navigate).not.toHaveBeenCalled();
        jest.advanceTimersByTime(300);
        expect(last()).toEqual({ q: 'beam', page: null });
        table.searchTyped('col');
        table.clear(['state']);
        expect(last()).toEqual({ q: null, page: null, state: null });
        jest.advanceTimersByTime(1000);
        expect(navigate).toHaveBeenCalledTimes(2);
      } finally {
        jest.useRealTimers();
      }
    });

    it('merges a chosen filter into the address and removes an empty one', () => {
      table.filter('stage', 'column_layout');
      expect(navigate.mock.calls.at(-1)?.[1]).toEqual({
        queryParams: { stage: 'column_layout', page: null },
        queryParamsHandling: 'merge',
      });
      table.filter('stage', '');
      expect(last()).toEqual({ stage: null, page: null });
    });
  });
});
