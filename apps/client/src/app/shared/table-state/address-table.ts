import { HttpParams } from '@angular/common/http';
import { DestroyRef, inject } from '@angular/core';
import type { PageEvent } from '@angular/material/paginator';
import type { Sort } from '@angular/material/sort';
import { Router } from '@angular/router';

// A table whose sort, filters and page are sorted, filtered and paged by the server and kept in
// the address, so reload, back and a shared link all return to the same view. The lists of
// projects, drawings and invoices read and write that state through these few pieces.

export const PAGE_SIZES = [10, 25, 50, 100];
export const DEFAULT_PAGE_SIZE = 25;
/** Typing waits this long for a pause before the list is asked again. */
export const SEARCH_DELAY_MS = 300;
const MAX_PAGE_SIZE = 100;
const MAX_SEARCH = 100;

/** The address's page state as strings, exactly as route-bound query parameters arrive. */
export interface RawTableQuery {
  readonly page?: string;
  readonly pageSize?: string;
  readonly sort?: string;
  readonly direction?: string;
  readonly q?: string;
}

/** The page state once read: whatever the address held, something the server accepts. */
export interface TableQuery<S extends string> {
  readonly page: number;
  readonly pageSize: number;
  readonly sort: S;
  readonly direction: 'asc' | 'desc';
  readonly q: string;
}

/** A whole number of at least 1 (capped at max), else the fallback. */
export function positiveInt(value: string | undefined, fallback: number, max = Infinity): number {
  const n = Number(value);
  return Number.isInteger(n) && n >= 1 ? Math.min(n, max) : fallback;
}

/** The value when it is one of the allowed ones, else the fallback (an unknown filter is no filter). */
export function oneOf<T extends string, F extends string = T>(
  value: string | undefined,
  allowed: readonly T[],
  fallback: F,
): T | F {
  return allowed.includes(value as T) ? (value as T) : fallback;
}

/** Reads page, page size, sort, direction and search from the address, each checked. */
export function readTableQuery<S extends string>(
  raw: RawTableQuery,
  sorts: readonly S[],
  defaults: { sort: S; direction: 'asc' | 'desc' },
): TableQuery<S> {
  const other = defaults.direction === 'asc' ? 'desc' : 'asc';
  return {
    page: positiveInt(raw.page, 1),
    pageSize: positiveInt(raw.pageSize, DEFAULT_PAGE_SIZE, MAX_PAGE_SIZE),
    sort: oneOf(raw.sort, sorts, defaults.sort),
    direction: raw.direction === other ? other : defaults.direction,
    q: (raw.q ?? '').trim().slice(0, MAX_SEARCH),
  };
}

/**
 * The request's query: page, size, sort, direction and search, then the filters under the names
 * the API uses. Empty filters (and an empty search) are left out rather than sent blank.
 */
export function tableParams(
  query: TableQuery<string>,
  filters: Record<string, string | number | null | undefined> = {},
): HttpParams {
  let params = new HttpParams()
    .set('page', query.page)
    .set('pageSize', query.pageSize)
    .set('sort', query.sort)
    .set('direction', query.direction);
  for (const [key, value] of Object.entries({ q: query.q, ...filters })) {
    if (value !== '' && value != null) params = params.set(key, value);
  }
  return params;
}

/**
 * Writes the table's state back to the address (merged with what is there; null removes a key).
 * Create it in a component's field initialiser: `protected readonly table = addressTable();`.
 */
export class AddressTable {
  private readonly router = inject(Router);
  private searchTimer?: ReturnType<typeof setTimeout>;

  constructor() {
    inject(DestroyRef).onDestroy(() => clearTimeout(this.searchTimer));
  }

  go(queryParams: Record<string, string | number | null>): void {
    void this.router.navigate([], { queryParams, queryParamsHandling: 'merge' });
  }

  /** Typing waits for a pause before asking the server, and starts again from page 1. */
  searchTyped(value: string): void {
    clearTimeout(this.searchTimer);
    this.searchTimer = setTimeout(() => this.go({ q: value.trim() || null, page: null }), SEARCH_DELAY_MS);
  }

  /** A filter chosen (an empty choice removes it); the list starts again from page 1. */
  filter(key: string, value: string | null | undefined): void {
    this.go({ [key]: value || null, page: null });
  }

  /** Material offers a third "no sort" click; the server always sorts, so that means the default. */
  sorted(sort: Sort): void {
    if (!sort.direction) this.go({ sort: null, direction: null, page: null });
    else this.go({ sort: sort.active, direction: sort.direction, page: null });
  }

  /** Page 1 and the default size stay out of the address, so the plain link is the first page. */
  paged(event: PageEvent): void {
    this.go({
      page: event.pageIndex === 0 ? null : event.pageIndex + 1,
      pageSize: event.pageSize === DEFAULT_PAGE_SIZE ? null : event.pageSize,
    });
  }

  /** Clears the search and the named filters, back to page 1. */
  clear(filterKeys: readonly string[]): void {
    clearTimeout(this.searchTimer);
    this.go({ q: null, page: null, ...Object.fromEntries(filterKeys.map((k) => [k, null])) });
  }
}

export function addressTable(): AddressTable {
  return new AddressTable();
}
