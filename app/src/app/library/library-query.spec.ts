import { DEFAULT_LIBRARY_VIEW, libraryQuery } from './library-query';

describe('libraryQuery', () => {
  it('sends only sort and paging for the default view, with pages counted from 1', () => {
    expect(libraryQuery(DEFAULT_LIBRARY_VIEW)).toEqual({ sort: 'updatedAt', order: 'desc', page: 1, pageSize: 25 });
  });

  it('trims the search, lower-cases the tag and keeps owner and status', () => {
    expect(libraryQuery({ ...DEFAULT_LIBRARY_VIEW, search: '  gantry ', tag: ' Demo ', owner: 7, status: 'signed-off', sort: 'name', order: 'asc', pageIndex: 2, pageSize: 50 })).toEqual({
      q: 'gantry',
      tag: 'demo',
      owner: 7,
      status: 'signed-off',
      sort: 'name',
      order: 'asc',
      page: 3,
      pageSize: 50,
    });
  });

  it('leaves out blank search and tag so the server sees no empty parameter', () => {
    const query = libraryQuery({ ...DEFAULT_LIBRARY_VIEW, search: '   ', tag: ' ' });
    expect('q' in query).toBe(false);
    expect('tag' in query).toBe(false);
  });
});
