import { ANIMATION_MODULE_TYPE } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Notice } from './notice';

describe('Notice', () => {
  afterEach(() => document.querySelectorAll('.cdk-overlay-container').forEach((n) => n.remove()));

  it('shows its message at the top right, away from the errors and buttons low on a page', async () => {
    TestBed.configureTestingModule({ providers: [{ provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' }] });
    TestBed.inject(Notice).show('Project saved.', 2000);
    for (let i = 0; i < 40 && !document.querySelector('.mat-mdc-snack-bar-container'); i++) {
      await new Promise((r) => setTimeout(r, 25));
      TestBed.tick();
    }
    const bar = document.querySelector('.mat-mdc-snack-bar-container');
    expect(bar?.textContent).toContain('Project saved.');
    const wrapper = bar!.closest('.cdk-global-overlay-wrapper') as HTMLElement;
    expect(wrapper.style.alignItems).toBe('flex-start');
    expect(wrapper.style.justifyContent).toBe('flex-end');
  });
});
