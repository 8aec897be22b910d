import { TestBed } from '@angular/core/testing';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Subject } from 'rxjs';
import { NoticeErrorHandler } from './notice-error-handler';

describe('NoticeErrorHandler', () => {
  const dismissed = new Subject<void>();
  const open = jest.fn(() => ({ afterDismissed: () => dismissed }));

  beforeEach(() => {
    open.mockClear();
    jest.spyOn(console, 'error').mockImplementation(() => undefined);
    TestBed.configureTestingModule({
      providers: [NoticeErrorHandler, { provide: MatSnackBar, useValue: { open } }],
    });
  });

  afterEach(() => jest.restoreAllMocks());

  const settle = () => new Promise((resolve) => setTimeout(resolve, 0));

  it('logs the error and tells the user in plain words', async () => {
    const handler = TestBed.inject(NoticeErrorHandler);
    const boom = new Error('boom');
    handler.handleError(boom);
    await settle();

    expect(console.error).toHaveBeenCalledWith(boom);
    expect(open).toHaveBeenCalledTimes(1);
    expect(open.mock.calls[0]).toEqual(
      expect.arrayContaining(['Something went wrong on this page. If it keeps happening, reload it.', 'Dismiss']),
    );
  });

  it('shows one notice for a burst of errors, and a new one after it is dismissed', async () => {
    const handler = TestBed.inject(NoticeErrorHandler);
    handler.handleError(new Error('first'));
    handler.handleError(new Error('second'));
    await settle();
    expect(open).toHaveBeenCalledTimes(1);
    expect(console.error).toHaveBeenCalledTimes(2);

    dismissed.next();
    handler.handleError(new Error('third'));
    await settle();
    expect(open).toHaveBeenCalledTimes(2);
  });
});
