import type { LibraryQuery, ScenarioStatus } from '@kinetwin/shared/protocol/library-api';

/** Rows per page the library offers; the first is the default. */
export const LIBRARY_PAGE_SIZES = [25, 50, 100] as const;

/** Status filter of the library: the server's default (everything but archived) or one status, or all. */
export type StatusFilter = '' | ScenarioStatus | 'all';

/** Sortable columns, named as the server's `sort` parameter. */
export type LibrarySort = 'updatedAt' | 'name' | 'owner' | 'status';

/** What the library page asks for, as the user set it (page is 0-based like MatPaginator's). */
export interface LibraryView {
  search: string;
  tag: string;
  owner: number | null;
  status: StatusFilter;
  sort: LibrarySort;
  order: 'asc' | 'desc';
  pageIndex: number;
  pageSize: number;
}

export const DEFAULT_LIBRARY_VIEW: LibraryView = {
  search: '',
  tag: '',
  owner: null,
  status: '',
  sort: 'updatedAt',
  order: 'desc',
  pageIndex: 0,
  pageSize: LIBRARY_PAGE_SIZES[0],
};

/**
 * The server query for a view: blank filters are left out (the server refuses empty or unknown
 * parameters), the tag is lower-cased like the server stores it, pages count from 1.
 * @example libraryQuery({ ...DEFAULT_LIBRARY_VIEW, search: ' arm ', pageIndex: 1 })
 * // { q: 'arm', sort: 'updatedAt', order: 'desc', page: 2, pageSize: 25 }
 */
export function libraryQuery(view: LibraryView): LibraryQuery {
  const query: LibraryQuery = { sort: view.sort, order: view.order, page: view.pageIndex + 1, pageSize: view.pageSize };
  const search = view.search.trim();
  if (search) query.q = search;
  const tag = view.tag.trim().toLowerCase();
  if (tag) query.tag = tag;
  if (view.owner !== null) query.owner = view.owner;
  if (view.status) query.status = view.status;
  return query;
}
