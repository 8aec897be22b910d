import { LiveAnnouncer } from '@angular/cdk/a11y';
import { ANIMATION_MODULE_TYPE } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MatDialog } from '@angular/material/dialog';
import { firstValueFrom } from 'rxjs';
import { StageActionDialog, type StageActionDialogData } from './stage-action-dialog';

describe('StageActionDialog', () => {
  let announced: string[];
  const settle = async () => {
    await new Promise((r) => setTimeout(r));
    TestBed.tick();
  };
  const pane = () => document.querySelector('.cdk-overlay-container') as HTMLElement;

  async function open(data: StageActionDialogData) {
    announced = [];
    TestBed.configureTestingModule({
      providers: [
        { provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' },
        { provide: LiveAnnouncer, useValue: { announce: async (m: string) => void announced.push(m) } },
      ],
    });
    const ref = TestBed.inject(MatDialog).open<StageActionDialog, StageActionDialogData, string>(StageActionDialog, {
      data,
    });
    await settle();
    return ref;
  }

  afterEach(() => TestBed.inject(MatDialog).closeAll());

  it('after a return with no comment, focus moves from the button to the comment and the count is shown and announced', async () => {
    const ref = await open({ action: 'return', stageTitle: 'Column layout' });
    const confirm = pane().querySelector<HTMLButtonElement>('[data-testid="action-confirm"]')!;
    confirm.focus();
    confirm.click();
    await settle();
    expect(document.activeElement).toBe(pane().querySelector('[data-testid="action-text"]'));
    expect(pane().querySelector('[data-testid="action-error-count"]')?.textContent?.trim()).toBe(
      '1 field needs attention.',
    );
    expect(announced).toEqual(['1 field needs attention.']);
    expect(pane().querySelector('mat-error')?.textContent).toContain('Say what needs changing.');
    expect(ref.getState()).toBe(0); // still open
  });

  it('closes with the trimmed comment once there is one, and the count goes away', async () => {
    const ref = await open({ action: 'reopen', stageTitle: 'Foundations' });
    const confirm = pane().querySelector<HTMLButtonElement>('[data-testid="action-confirm"]')!;
    confirm.click();
    await settle();
    expect(pane().querySelector('mat-error')?.textContent).toContain('Give a reason for reopening.');
    const text = pane().querySelector<HTMLTextAreaElement>('[data-testid="action-text"]')!;
    text.value = '  Client changed the plant room level.  ';
    text.dispatchEvent(new Event('input'));
    const closed = firstValueFrom(ref.afterClosed());
    confirm.click();
    expect(await closed).toBe('Client changed the plant room level.');
  });
});
